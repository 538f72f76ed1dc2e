import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ProjectRole } from '../../../../api/features/projects/schemas';

export interface InvitationDetails {
  projectId: string;
  projectName: string;
  role: ProjectRole;
  email: string;
  expiresAt: string;
  invitedBy: { login: string; displayName: string | null } | null;
}

export const getInvitation = (token: string) =>
  api<{ invitation: InvitationDetails }>(`/api/v1/invitations/${encodeURIComponent(token)}`).then((r) => r.invitation);
export const invitationQueryOptions = (token: string) =>
  queryOptions({ queryKey: ['invitation', token], queryFn: () => getInvitation(token), retry: false });
export const useInvitation = (token: string, enabled: boolean) => useQuery({ ...invitationQueryOptions(token), enabled });

export const acceptInvitation = (token: string) =>
  api<{ projectId: string; role: ProjectRole }>(`/api/v1/invitations/${encodeURIComponent(token)}/accept`, { method: 'POST' });
export function useAcceptInvitation(token: string) {
  const client = useQueryClient();
  return useMutation({ mutationFn: () => acceptInvitation(token), onSuccess: () => client.invalidateQueries({ queryKey: ['projects'] }) });
}
