import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ProjectRole } from '../../../../api/features/projects/schemas';
import type { InvitationView } from '../../../../api/features/invitations/service';
import { projectKeys } from '../../../lib/query-keys';

export type PendingInvitation = InvitationView;

export const listInvitations = (projectId: string) =>
  api<{ invitations: PendingInvitation[] }>(`/api/v1/projects/${projectId}/invitations`).then((r) => r.invitations);
export const invitationsQueryOptions = (projectId: string) =>
  queryOptions({ queryKey: projectKeys.invitations(projectId), queryFn: () => listInvitations(projectId) });
export const useInvitations = (projectId: string, enabled: boolean) => useQuery({ ...invitationsQueryOptions(projectId), enabled });

export const createInvitation = (projectId: string, body: { email: string; role: ProjectRole }) =>
  api<{ invitation: PendingInvitation }>(`/api/v1/projects/${projectId}/invitations`, { method: 'POST', body });
export function useCreateInvitation(projectId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: { email: string; role: ProjectRole }) => createInvitation(projectId, body),
    onSuccess: () => client.invalidateQueries({ queryKey: projectKeys.one(projectId) }),
  });
}

export const revokeInvitation = (projectId: string, id: string) =>
  api<void>(`/api/v1/projects/${projectId}/invitations/${id}`, { method: 'DELETE' });
export function useRevokeInvitation(projectId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => revokeInvitation(projectId, id),
    onSuccess: () => client.invalidateQueries({ queryKey: projectKeys.one(projectId) }),
  });
}
