import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { acceptInvitation as acceptOnServer, InvitationDetails } from '../../../../api/features/invitations/service';

export const getInvitation = (token: string) =>
  api<{ invitation: InvitationDetails }>(`/api/v1/invitations/${encodeURIComponent(token)}`).then((r) => r.invitation);
export const invitationQueryOptions = (token: string) =>
  queryOptions({ queryKey: ['invitation', token], queryFn: () => getInvitation(token), retry: false });
export const useInvitation = (token: string, enabled: boolean) => useQuery({ ...invitationQueryOptions(token), enabled });

export const acceptInvitation = (token: string) =>
  api<Awaited<ReturnType<typeof acceptOnServer>>>(`/api/v1/invitations/${encodeURIComponent(token)}/accept`, { method: 'POST' });
export function useAcceptInvitation(token: string) {
  const client = useQueryClient();
  return useMutation({ mutationFn: () => acceptInvitation(token), onSuccess: () => client.invalidateQueries({ queryKey: ['projects'] }) });
}
