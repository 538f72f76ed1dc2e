import { useInfiniteQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { projectKeys } from './projects';

export interface AuditEvent {
  id: number;
  at: string;
  action: 'create' | 'update' | 'delete';
  entityType: string;
  entityId: string;
  actor: { id: string; login: string; displayName: string | null } | null;
  before: unknown;
  after: unknown;
}

export const getHistory = (projectId: string, before?: number) =>
  api<{ events: AuditEvent[]; nextBefore: number | null }>(`/api/v1/projects/${projectId}/audit-events?limit=50${before ? `&before=${before}` : ''}`);

export const useHistory = (projectId: string) =>
  useInfiniteQuery({
    queryKey: projectKeys.history(projectId),
    queryFn: ({ pageParam }) => getHistory(projectId, pageParam),
    initialPageParam: undefined as number | undefined,
    getNextPageParam: (last) => last.nextBefore ?? undefined,
  });
