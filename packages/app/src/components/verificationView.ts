/**
 * What the verification panel shows of a release's verification record: the sentence and its tone,
 * one row per simulator, and the yosys estimate per part of the loop (or why there is none).
 * Logic lives here so the template only lays it out.
 */
import type { ReleaseVerificationRecord, ResourceEstimate, SimulatorRun } from '../api/types.ts';

export type VerificationTone = 'pass' | 'fail' | 'pending' | 'warn';

export interface VerificationSummary {
  readonly tone: VerificationTone;
  readonly text: string;
  /** Still queued or running: the page keeps asking. */
  readonly pending: boolean;
}

export function verificationSummary(v: ReleaseVerificationRecord): VerificationSummary {
  const pending = v.state !== 'done';
  if (v.verdict === 'passed') return { tone: 'pass', text: v.summary, pending };
  if (v.verdict === 'failed') return { tone: 'fail', text: v.summary, pending };
  if (v.verdict === 'partial' || v.verdict === 'not-run') return { tone: 'warn', text: v.summary, pending };
  return { tone: 'pending', text: v.summary, pending };
}

const VERDICT_TEXT: Readonly<Record<SimulatorRun['verdict'], string>> = { pass: 'PASS', fail: 'FAIL', error: 'no verdict', 'not-run': 'not run' };

export interface SimulatorRow {
  readonly simulator: string;
  readonly version: string;
  readonly verdict: string;
  readonly tone: 'success' | 'danger' | 'info';
  readonly samples: string;
  readonly duration: string;
  readonly detail: string;
}

/** Samples a simulator replayed, "4,096 of 65,536" when that was a prefix of the release's golden vectors. */
function replayedText(samples: number | null, recordSamples: number | undefined): string {
  if (samples === null) return '—';
  const count = (n: number) => n.toLocaleString('en');
  return recordSamples !== undefined && samples < recordSamples ? `${count(samples)} of ${count(recordSamples)}` : count(samples);
}

export function simulatorRows(v: ReleaseVerificationRecord): SimulatorRow[] {
  const recordSamples = v.verification?.recordSamples;
  return (v.verification?.runs ?? []).map((r) => ({
    simulator: r.label,
    version: r.version ?? 'not installed',
    verdict: VERDICT_TEXT[r.verdict],
    tone: r.verdict === 'pass' ? 'success' : r.verdict === 'not-run' ? 'info' : 'danger',
    samples: replayedText(r.samples, recordSamples),
    duration: r.verdict === 'not-run' ? '—' : `${(r.durationMs / 1000).toFixed(1)} s`,
    detail: r.detail.split('\n')[0] ?? '',
  }));
}

export interface EstimateRow {
  readonly part: string;
  readonly luts: number;
  readonly flipFlops: number;
  readonly multipliers: number;
  readonly romBits: number;
  readonly ice40Luts: number;
  readonly ice40Dsp: number;
  readonly ice40Ram: number;
}

export type EstimateView =
  | { readonly state: 'pending'; readonly text: string }
  | { readonly state: 'not-estimated'; readonly text: string }
  | { readonly state: 'estimated'; readonly label: string; readonly tool: string; readonly rows: EstimateRow[] };

export function estimateView(estimate: ResourceEstimate | null, pending: boolean): EstimateView {
  if (estimate === null) return { state: pending ? 'pending' : 'not-estimated', text: pending ? 'estimating with yosys…' : 'not estimated' };
  if (estimate.state === 'not-estimated') return { state: 'not-estimated', text: `not estimated: ${estimate.reason}` };
  const row = (part: string, g: typeof estimate.total.generic, i: typeof estimate.total.ice40): EstimateRow => ({
    part,
    luts: g.luts,
    flipFlops: g.flipFlops,
    multipliers: g.multipliers,
    romBits: g.romBits,
    ice40Luts: i.luts,
    ice40Dsp: i.dspBlocks,
    ice40Ram: i.ramBlocks,
  });
  return {
    state: 'estimated',
    label: estimate.label,
    tool: estimate.tool,
    rows: [...estimate.parts.map((p) => row(p.part, p.generic, p.ice40)), row('whole loop', estimate.total.generic, estimate.total.ice40)],
  };
}
