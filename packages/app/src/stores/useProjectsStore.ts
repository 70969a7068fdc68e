import { defineStore } from 'pinia';
import { ref } from 'vue';
import { projectsApi, type CreateDesignRequest, type CreateProjectRequest } from '../api/projectsApi.ts';
import { designsApi } from '../api/designsApi.ts';
import type { DesignListItem, DesignSummary, Project } from '../api/types.ts';
import { useLoadState } from './loadState.ts';

export const useProjectsStore = defineStore('projects', () => {
  const projects = ref<Project[]>([]);
  const designsByProject = ref<Record<number, DesignListItem[]>>({});
  /** Archived designs are listed too (marked) when this is on. */
  const showArchived = ref(false);
  const { loading, error, track } = useLoadState();

  async function load(): Promise<void> {
    await track(async () => {
      projects.value = await projectsApi.list();
      const archived = showArchived.value ? 'all' : 'false';
      const lists = await Promise.all(projects.value.map((p) => projectsApi.designs(p.id, archived)));
      const byProject: Record<number, DesignListItem[]> = {};
      projects.value.forEach((p, i) => (byProject[p.id] = lists[i] ?? []));
      designsByProject.value = byProject;
    });
  }

  async function setShowArchived(on: boolean): Promise<void> {
    showArchived.value = on;
    await load();
  }

  function put(projectId: number, design: DesignSummary, releaseCount: number): void {
    const list = (designsByProject.value[projectId] ?? []).filter((d) => d.id !== design.id);
    const next = showArchived.value || !design.archived ? [...list, { ...design, releaseCount }] : list;
    designsByProject.value = { ...designsByProject.value, [projectId]: next };
  }

  function find(designId: number): DesignListItem | undefined {
    for (const list of Object.values(designsByProject.value)) {
      const found = list.find((d) => d.id === designId);
      if (found) return found;
    }
    return undefined;
  }

  async function createProject(request: CreateProjectRequest): Promise<Project> {
    const project = await projectsApi.create(request);
    projects.value = [...projects.value, project];
    designsByProject.value = { ...designsByProject.value, [project.id]: [] };
    return project;
  }

  async function createDesign(projectId: number, request: CreateDesignRequest): Promise<DesignSummary> {
    const design = await projectsApi.createDesign(projectId, request);
    put(projectId, design, 0);
    return design;
  }

  async function importSpec(projectId: number, file: File, name?: string): Promise<DesignSummary> {
    const design = await designsApi.importSpec(projectId, file, name);
    put(projectId, design, 0);
    return design;
  }

  async function duplicate(designId: number, request: { name?: string; projectId?: number }): Promise<DesignSummary> {
    const copy = await designsApi.duplicate(designId, request);
    put(copy.projectId, copy, 0);
    return copy;
  }

  async function setArchived(designId: number, archived: boolean): Promise<DesignSummary> {
    const releaseCount = find(designId)?.releaseCount ?? 0;
    const design = await designsApi.setArchived(designId, archived);
    put(design.projectId, design, releaseCount);
    return design;
  }

  async function remove(designId: number): Promise<void> {
    const design = find(designId);
    await designsApi.remove(designId);
    if (!design) return;
    const list = (designsByProject.value[design.projectId] ?? []).filter((d) => d.id !== designId);
    designsByProject.value = { ...designsByProject.value, [design.projectId]: list };
  }

  return { projects, designsByProject, showArchived, loading, error, load, setShowArchived, createProject, createDesign, importSpec, duplicate, setArchived, remove };
});
