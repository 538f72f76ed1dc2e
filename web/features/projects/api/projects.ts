import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { projectKeys } from '../../../lib/query-keys';
import type { ProjectView } from '../../../../api/features/projects/service';

/** A project as the API returns it (GET /projects, /projects/:id). */
export type Project = ProjectView;

export const listProjects = () => api<{ projects: Project[] }>('/api/v1/projects').then((r) => r.projects);
export const projectsQueryOptions = () => queryOptions({ queryKey: projectKeys.list(), queryFn: listProjects });
export const useProjects = (enabled = true) => useQuery({ ...projectsQueryOptions(), enabled });

export const getProject = (id: string) => api<{ project: Project }>(`/api/v1/projects/${id}`).then((r) => r.project);
export const projectQueryOptions = (id: string) => queryOptions({ queryKey: projectKeys.one(id), queryFn: () => getProject(id) });
export const useProject = (id: string) => useQuery(projectQueryOptions(id));

export const createProject = (body: { name: string; description: string }) =>
  api<{ project: Project }>('/api/v1/projects', { method: 'POST', body }).then((r) => r.project);
export function useCreateProject() {
  const client = useQueryClient();
  return useMutation({ mutationFn: createProject, onSuccess: () => client.invalidateQueries({ queryKey: projectKeys.all }) });
}

export const updateProject = (id: string, body: { name?: string; description?: string; version: number }) =>
  api<{ project: Project }>(`/api/v1/projects/${id}`, { method: 'PATCH', body }).then((r) => r.project);
export function useUpdateProject(id: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: { name?: string; description?: string; version: number }) => updateProject(id, body),
    onSuccess: () => client.invalidateQueries({ queryKey: projectKeys.all }),
  });
}

export const deleteProject = (id: string) => api<void>(`/api/v1/projects/${id}`, { method: 'DELETE' });
export function useDeleteProject(id: string) {
  const client = useQueryClient();
  return useMutation({ mutationFn: () => deleteProject(id), onSuccess: () => client.invalidateQueries({ queryKey: projectKeys.list() }) });
}
