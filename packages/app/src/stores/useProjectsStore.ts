import { defineStore } from 'pinia';
import { ref } from 'vue';
import { projectsApi, type CreateDesignRequest, type CreateProjectRequest } from '../api/projectsApi.ts';
import type { DesignSummary, Project } from '../api/types.ts';

export const useProjectsStore = defineStore('projects', () => {
  const projects = ref<Project[]>([]);
  const designsByProject = ref<Record<number, DesignSummary[]>>({});
  const loading = ref(false);
  const error = ref<unknown>(null);

  async function load(): Promise<void> {
    loading.value = true;
    error.value = null;
    try {
      projects.value = await projectsApi.list();
      const lists = await Promise.all(projects.value.map((p) => projectsApi.designs(p.id)));
      const byProject: Record<number, DesignSummary[]> = {};
      projects.value.forEach((p, i) => (byProject[p.id] = lists[i] ?? []));
      designsByProject.value = byProject;
    } catch (cause) {
      error.value = cause;
    } finally {
      loading.value = false;
    }
  }

  async function createProject(request: CreateProjectRequest): Promise<Project> {
    const project = await projectsApi.create(request);
    projects.value = [...projects.value, project];
    designsByProject.value = { ...designsByProject.value, [project.id]: [] };
    return project;
  }

  async function createDesign(projectId: number, request: CreateDesignRequest): Promise<DesignSummary> {
    const design = await projectsApi.createDesign(projectId, request);
    const list = designsByProject.value[projectId] ?? [];
    designsByProject.value = { ...designsByProject.value, [projectId]: [...list, design] };
    return design;
  }

  return { projects, designsByProject, loading, error, load, createProject, createDesign };
});
