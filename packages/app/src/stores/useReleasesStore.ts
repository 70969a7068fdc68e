import { defineStore } from 'pinia';
import { ref } from 'vue';
import { releasesApi } from '../api/releasesApi.ts';
import { designsApi } from '../api/designsApi.ts';
import { diffDocuments } from '../lib/specDiff.ts';
import type { Design, ReleaseDiff, ReleaseRecord, ReleaseSummary, ReviewerChoice, ReviewRequest } from '../api/types.ts';
import { useLoadState } from './loadState.ts';

/** The releases of one design: list, full records, cutting, review requests and diffs. */
export const useReleasesStore = defineStore('releases', () => {
  const designId = ref<number | null>(null);
  const design = ref<Design | null>(null);
  const releases = ref<ReleaseSummary[]>([]);
  const records = ref<Record<number, ReleaseRecord>>({});
  const { loading, error, track } = useLoadState();
  const cutting = ref(false);
  const reviewers = ref<ReviewerChoice[]>([]);
  const diff = ref<ReleaseDiff | null>(null);
  const diffError = ref<unknown>(null);

  async function load(id: number): Promise<void> {
    designId.value = id;
    diff.value = null;
    await track(async () => {
      const [d, list] = await Promise.all([designsApi.get(id), releasesApi.forDesign(id)]);
      design.value = d;
      releases.value = [...list].sort((a, b) => b.number - a.number);
      const full = await Promise.all(releases.value.map((r) => releasesApi.get(r.id)));
      records.value = Object.fromEntries(full.map((r) => [r.id, r]));
    });
  }

  async function refresh(releaseId: number): Promise<ReleaseRecord> {
    const record = await releasesApi.get(releaseId);
    records.value = { ...records.value, [releaseId]: record };
    releases.value = releases.value.map((r) => (r.id === releaseId ? { ...r, state: record.state, stateChangedAt: record.stateChangedAt } : r));
    return record;
  }

  /**
   * The label of the design's newest release when the design's stored spec is the same as that
   * release's (a cut now would repeat it), else null. Reads the design again: it may have been saved
   * in another tab since the page loaded.
   */
  async function unchangedSince(): Promise<string | null> {
    const id = designId.value;
    const latest = releases.value[0];
    if (id === null || !latest) return null;
    const [d, record] = await Promise.all([designsApi.get(id), records.value[latest.id] ?? releasesApi.get(latest.id)]);
    design.value = d;
    return diffDocuments(record.spec, d.spec).length === 0 ? latest.label : null;
  }

  async function cut(): Promise<ReleaseRecord> {
    const id = designId.value;
    if (id === null) throw new Error('no design loaded');
    cutting.value = true;
    try {
      const record = await releasesApi.cut(id);
      records.value = { ...records.value, [record.id]: record };
      const { designName: _n, projectId: _p, spec: _s, results: _r, files: _f, approvalsRequired: _a, approvals: _c, reviews: _v, allowedEvents: _e, caution: _k, verification: _w, withdrawnReason: _x, ...summary } = record;
      releases.value = [summary, ...releases.value.filter((r) => r.id !== record.id)];
      return record;
    } finally {
      cutting.value = false;
    }
  }

  const polling = new Set<number>();

  /**
   * Ask for a release's verification every `intervalMs` until the server is done with it (or another
   * design is loaded), so the page shows its progress and then its verdict.
   */
  async function pollVerification(releaseId: number, intervalMs = 2000): Promise<void> {
    if (polling.has(releaseId)) return;
    polling.add(releaseId);
    const forDesign = designId.value;
    try {
      while (designId.value === forDesign && records.value[releaseId]?.verification.state !== 'done') {
        await new Promise((resolve) => setTimeout(resolve, intervalMs));
        const record = records.value[releaseId];
        if (!record || designId.value !== forDesign) break;
        const verification = await releasesApi.verification(releaseId);
        records.value = { ...records.value, [releaseId]: { ...record, verification } };
      }
    } finally {
      polling.delete(releaseId);
    }
  }

  async function loadReviewers(): Promise<void> {
    reviewers.value = await releasesApi.reviewers();
  }

  async function requestReview(releaseId: number, request: ReviewRequest): Promise<ReleaseRecord> {
    await releasesApi.requestReview(releaseId, request);
    return refresh(releaseId);
  }

  async function withdraw(releaseId: number, reason: string): Promise<ReleaseRecord> {
    await releasesApi.withdraw(releaseId, reason);
    return refresh(releaseId);
  }

  async function compare(fromId: number, toId: number): Promise<void> {
    diffError.value = null;
    try {
      diff.value = await releasesApi.diff(toId, fromId);
    } catch (cause) {
      diff.value = null;
      diffError.value = cause;
    }
  }

  return { designId, design, releases, records, loading, error, cutting, reviewers, diff, diffError, load, refresh, unchangedSince, cut, pollVerification, loadReviewers, requestReview, withdraw, compare };
});
