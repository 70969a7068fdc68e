import type { ConformanceRecord, ReleaseRecord } from '../api/types.ts';
import { fileRows, type FileRow } from '../components/releaseView.ts';
import { formatDate } from './projectsView.ts';

export interface DownloadRow {
  readonly id: number;
  readonly project: string;
  readonly design: string;
  readonly label: string;
  readonly approved: string;
  readonly sha256: string;
  readonly files: readonly FileRow[];
}

export function downloadRows(releases: readonly ReleaseRecord[], projectNames: Readonly<Record<number, string>>): DownloadRow[] {
  return releases.map((r) => ({
    id: r.id,
    project: projectNames[r.projectId] ?? `project ${r.projectId}`,
    design: r.designName,
    label: r.label,
    approved: formatDate(r.stateChangedAt),
    sha256: r.manifestSha256,
    files: fileRows(r.files),
  }));
}

/** What the page says when the linked release is not on the shelf (withdrawn since, or never approved). */
export function missingLinkedRelease(id: number | null, rows: readonly DownloadRow[]): string | null {
  if (id === null || rows.some((r) => r.id === id)) return null;
  return 'The release this link names is not among the approved releases: it may have been withdrawn since. Ask its designer, or pick an approved release below.';
}

export interface RunView {
  readonly id: number;
  readonly fileName: string;
  readonly when: string;
  readonly who: string;
  readonly verdict: string;
  readonly bitExact: boolean;
  readonly summary: string;
  readonly mismatches: ConformanceRecord['firstMismatches'];
}

export function runViews(runs: readonly ConformanceRecord[]): RunView[] {
  return runs.map((r) => ({
    id: r.id,
    fileName: r.fileName,
    when: formatDate(r.createdAt),
    who: r.uploadedByName,
    verdict: r.verdict,
    bitExact: r.verdict === 'bit-exact',
    summary:
      r.verdict === 'bit-exact'
        ? `bit-exact over ${r.samplesCompared.toLocaleString('en')} samples`
        : r.samplesCompared === 0
          ? 'no samples compared: the file held no sample rows (such files are now refused as having the wrong length)'
          : `${r.mismatchCount.toLocaleString('en')} mismatching value(s) in ${r.samplesCompared.toLocaleString('en')} samples`,
    mismatches: r.firstMismatches,
  }));
}
