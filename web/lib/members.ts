import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from './api-client';
import type { ProjectRole } from '../../api/features/projects/schemas';
import type { MemberView } from '../../api/features/projects/service';
import { projectKeys } from './query-keys';

export type Member = MemberView;

export const listMembers = (projectId: string) =>
  api<{ members: Member[]; you: { userId: string; role: ProjectRole } }>(`/api/v1/projects/${projectId}/members`);
export const membersQueryOptions = (projectId: string) =>
  queryOptions({ queryKey: projectKeys.members(projectId), queryFn: () => listMembers(projectId) });
export const useMembers = (projectId: string) => useQuery(membersQueryOptions(projectId));

export const changeMemberRole = (projectId: string, userId: string, role: ProjectRole) =>
  api<{ member: Member }>(`/api/v1/projects/${projectId}/members/${userId}`, { method: 'PATCH', body: { role } });
export const removeMember = (projectId: string, userId: string) =>
  api<void>(`/api/v1/projects/${projectId}/members/${userId}`, { method: 'DELETE' });
export const leaveProject = (projectId: string) => api<void>(`/api/v1/projects/${projectId}/membership`, { method: 'DELETE' });

function useProjectMutation<V>(projectId: string, fn: (v: V) => Promise<unknown>) {
  const client = useQueryClient();
  return useMutation({ mutationFn: fn, onSuccess: () => client.invalidateQueries({ queryKey: projectKeys.one(projectId) }) });
}
export const useChangeMemberRole = (projectId: string) =>
  useProjectMutation(projectId, (v: { userId: string; role: ProjectRole }) => changeMemberRole(projectId, v.userId, v.role));
export const useRemoveMember = (projectId: string) => useProjectMutation(projectId, (userId: string) => removeMember(projectId, userId));
export function useLeaveProject(projectId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: () => leaveProject(projectId),
    onSuccess: () => client.invalidateQueries({ queryKey: projectKeys.all }),
  });
}
