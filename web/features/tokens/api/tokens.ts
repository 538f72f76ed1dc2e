import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { TokenView } from '../../../../api/features/tokens/service';

export type ApiTokenInfo = TokenView;

export const tokenKeys = { all: ['tokens'] as const };

export const listTokens = () => api<{ tokens: ApiTokenInfo[] }>('/api/v1/tokens').then((r) => r.tokens);
export const tokensQueryOptions = () => queryOptions({ queryKey: tokenKeys.all, queryFn: listTokens });
export const useTokens = () => useQuery(tokensQueryOptions());

export const createToken = (body: { name: string; expiresInDays: number }) =>
  api<{ token: ApiTokenInfo; secret: string }>('/api/v1/tokens', { method: 'POST', body });
export function useCreateToken() {
  const client = useQueryClient();
  return useMutation({ mutationFn: createToken, onSuccess: () => client.invalidateQueries({ queryKey: tokenKeys.all }) });
}

export const revokeToken = (id: string) => api<void>(`/api/v1/tokens/${id}`, { method: 'DELETE' });
export function useRevokeToken() {
  const client = useQueryClient();
  return useMutation({ mutationFn: revokeToken, onSuccess: () => client.invalidateQueries({ queryKey: tokenKeys.all }) });
}
