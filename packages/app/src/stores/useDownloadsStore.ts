import { defineStore } from 'pinia';
import { ref } from 'vue';
import { releasesApi } from '../api/releasesApi.ts';
import { projectsApi } from '../api/projectsApi.ts';
import type { ConformanceRecord, ReleaseRecord } from '../api/types.ts';
import { useLoadState } from './loadState.ts';

/** Approved releases across projects (the firmware engineer's shelf) and conformance runs. */
export const useDownloadsStore = defineStore('downloads', () => {
  const releases = ref<ReleaseRecord[]>([]);
  const projectNames = ref<Record<number, string>>({});
  const { loading, error, track } = useLoadState();
  const runs = ref<Record<number, ConformanceRecord[]>>({});
  const uploading = ref(false);

  async function load(): Promise<void> {
    await track(async () => {
      const [list, projects] = await Promise.all([releasesApi.approved(), projectsApi.list().catch(() => [])]);
      projectNames.value = Object.fromEntries(projects.map((p) => [p.id, p.name]));
      const full = await Promise.all(list.map((r) => releasesApi.get(r.id)));
      releases.value = full.sort((a, b) => b.stateChangedAt.localeCompare(a.stateChangedAt));
    });
  }

  async function loadRuns(releaseId: number): Promise<void> {
    runs.value = { ...runs.value, [releaseId]: await releasesApi.conformance(releaseId) };
  }

  async function upload(releaseId: number, file: File): Promise<ConformanceRecord> {
    uploading.value = true;
    try {
      const run = await releasesApi.uploadCapture(releaseId, file);
      runs.value = { ...runs.value, [releaseId]: [run, ...(runs.value[releaseId] ?? []).filter((r) => r.id !== run.id)] };
      return run;
    } finally {
      uploading.value = false;
    }
  }

  return { releases, projectNames, loading, error, runs, uploading, load, loadRuns, upload };
});
