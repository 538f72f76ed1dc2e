import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CampaignCreate, CampaignUpdate } from '../../../../api/features/campaigns/schemas';
import { api } from '../../../lib/api-client';
import { campaignKeys } from './keys';
import type { Campaign, CampaignListItem, CampaignWithRole } from './types';

export const listCampaigns = (projectId: string) =>
  api<{ campaigns: CampaignListItem[] }>(`/api/v1/projects/${projectId}/campaigns`).then((r) => r.campaigns);
export const campaignsQueryOptions = (projectId: string) =>
  queryOptions({ queryKey: campaignKeys.list(projectId), queryFn: () => listCampaigns(projectId) });
export const useCampaigns = (projectId: string) => useQuery(campaignsQueryOptions(projectId));

/**
 * The ETag names the campaign's version only, but the body carries the caller's role: a browser
 * revalidating with If-None-Match would get a 304 and reuse another account's role. Never cached.
 */
export const getCampaign = (campaignId: string) => api<CampaignWithRole>(`/api/v1/campaigns/${campaignId}`, { cache: 'no-store' });
export const campaignQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: campaignKeys.detail(campaignId), queryFn: () => getCampaign(campaignId) });
export const useCampaign = (campaignId: string) => useQuery(campaignQueryOptions(campaignId));

export const createCampaign = (projectId: string, body: CampaignCreate) =>
  api<Campaign>(`/api/v1/projects/${projectId}/campaigns`, { method: 'POST', body });
export function useCreateCampaign(projectId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: CampaignCreate) => createCampaign(projectId, body),
    onSuccess: () => client.invalidateQueries({ queryKey: campaignKeys.project(projectId) }),
  });
}

/** PATCH with the version last read; a 409 carries `currentVersion`. */
export const updateCampaign = (campaignId: string, body: CampaignUpdate) =>
  api<Campaign>(`/api/v1/campaigns/${campaignId}`, { method: 'PATCH', body, headers: { 'if-match': `W/"${body.version}"` } });
export function useUpdateCampaign(campaignId: string, projectId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: CampaignUpdate) => updateCampaign(campaignId, body),
    onSettled: () =>
      Promise.all([
        client.invalidateQueries({ queryKey: campaignKeys.one(campaignId) }),
        client.invalidateQueries({ queryKey: campaignKeys.project(projectId) }),
      ]),
  });
}
