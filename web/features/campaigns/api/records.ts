/**
 * Records of a campaign: its history as sentences, its sign-off, and the files uploaded into it.
 * Downloads (CSV history, kept files, the import template) are plain links served by the API.
 */
import { useInfiniteQuery, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { projectKeys } from '../../../lib/query-keys';
import { campaignKeys } from './keys';
import type { Campaign } from './types';
import type { HistoryEntry } from '../../../../api/features/audit/history';
import type { ImportFileView as KeptFile } from '../../../../api/features/imports/files';

export const recordLinks = {
  campaignHistoryCsv: (campaignId: string) => `/api/v1/campaigns/${campaignId}/history.csv`,
  projectHistoryCsv: (projectId: string) => `/api/v1/projects/${projectId}/history.csv`,
  keptFile: (fileId: string) => `/api/v1/import-files/${fileId}`,
  importTemplate: (campaignId: string) => `/api/v1/campaigns/${campaignId}/imports/template.csv`,
};

type HistoryPage = { entries: HistoryEntry[]; nextBefore: number | null };

/** History pages of 50, newest first; `scope` is a campaign or (owners only) a whole project. */
export function useHistoryEntries(scope: { campaignId: string } | { projectId: string }) {
  const base = 'campaignId' in scope ? `/api/v1/campaigns/${scope.campaignId}/history` : `/api/v1/projects/${scope.projectId}/history`;
  const key = 'campaignId' in scope ? [...campaignKeys.one(scope.campaignId), 'history'] : projectKeys.history(scope.projectId);
  return useInfiniteQuery({
    queryKey: key,
    queryFn: ({ pageParam }) => api<HistoryPage>(`${base}?limit=50${pageParam ? `&before=${pageParam}` : ''}`),
    initialPageParam: undefined as number | undefined,
    getNextPageParam: (last) => last.nextBefore ?? undefined,
  });
}

export const useKeptFiles = (campaignId: string) =>
  useQuery({
    queryKey: [...campaignKeys.one(campaignId), 'files'],
    queryFn: () => api<{ files: KeptFile[] }>(`/api/v1/campaigns/${campaignId}/files`).then((r) => r.files),
  });

function useRefreshAll(campaignId: string) {
  const client = useQueryClient();
  return () => client.invalidateQueries({ queryKey: campaignKeys.one(campaignId) });
}

export function useSignOff(campaignId: string) {
  const refresh = useRefreshAll(campaignId);
  return useMutation({
    mutationFn: (note: string) =>
      api<Campaign>(`/api/v1/campaigns/${campaignId}/sign-off`, { method: 'POST', body: { note: note.trim() || null } }),
    onSettled: refresh,
  });
}

export function useReopen(campaignId: string) {
  const refresh = useRefreshAll(campaignId);
  return useMutation({
    mutationFn: (reason: string) => api<Campaign>(`/api/v1/campaigns/${campaignId}/reopen`, { method: 'POST', body: { reason } }),
    onSettled: refresh,
  });
}
