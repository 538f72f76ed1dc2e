import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { MeasurementBatchUpdate, MeasurementCreate, MeasurementExclusion } from '../../../../api/features/campaigns/schemas';
import { api } from '../../../lib/api-client';
import { campaignKeys } from './keys';
import type { Measurement } from './types';

export const listMeasurements = (campaignId: string) =>
  api<{ measurements: Measurement[] }>(`/api/v1/campaigns/${campaignId}/measurements`).then((r) => r.measurements);
export const measurementsQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: campaignKeys.measurements(campaignId), queryFn: () => listMeasurements(campaignId) });
export const useMeasurements = (campaignId: string) => useQuery(measurementsQueryOptions(campaignId));

/** All-or-nothing; a 400 names fields as `measurements.<i>.<field>`. */
export const createMeasurements = (campaignId: string, measurements: MeasurementCreate[]) =>
  api<{ created: number }>(`/api/v1/campaigns/${campaignId}/measurements/batch`, { method: 'POST', body: { measurements } });

/** Several stored runs at once, all or nothing; a stale row is a 409 listing `staleRows[].path` ("measurements.<i>"). */
export const updateMeasurements = (campaignId: string, measurements: MeasurementBatchUpdate['measurements']) =>
  api<{ measurements: Measurement[] }>(`/api/v1/campaigns/${campaignId}/measurements`, { method: 'PATCH', body: { measurements } });

export const setExclusion = (measurementId: string, body: MeasurementExclusion) =>
  api<Measurement>(`/api/v1/measurements/${measurementId}/exclusion`, { method: 'PUT', body });

export const deleteMeasurement = (measurementId: string, version: number, reason: string) =>
  api<void>(`/api/v1/measurements/${measurementId}?version=${version}&reason=${encodeURIComponent(reason)}`, { method: 'DELETE' });

/** Everything that depends on a campaign's data: its own queries and its project's list and comparison. */
export function useRefreshCampaign(campaignId: string, projectId: string) {
  const client = useQueryClient();
  return () =>
    Promise.all([
      client.invalidateQueries({ queryKey: campaignKeys.one(campaignId) }),
      client.invalidateQueries({ queryKey: campaignKeys.project(projectId) }),
    ]);
}

/**
 * The grid's save: new rows in one batch, changed rows in one batched change, then one refresh of
 * the campaign's data (whatever happened), never one request and one refetch per row.
 */
export function useSaveGridRows(campaignId: string, projectId: string) {
  const refresh = useRefreshCampaign(campaignId, projectId);
  return {
    create: (rows: MeasurementCreate[]) => createMeasurements(campaignId, rows),
    update: (rows: MeasurementBatchUpdate['measurements']) => updateMeasurements(campaignId, rows),
    refresh,
  };
}

export function useSetExclusion(campaignId: string, projectId: string) {
  const refresh = useRefreshCampaign(campaignId, projectId);
  return useMutation({ mutationFn: (v: { id: string; body: MeasurementExclusion }) => setExclusion(v.id, v.body), onSettled: refresh });
}

export function useDeleteMeasurement(campaignId: string, projectId: string) {
  const refresh = useRefreshCampaign(campaignId, projectId);
  return useMutation({
    mutationFn: (v: { id: string; version: number; reason: string }) => deleteMeasurement(v.id, v.version, v.reason),
    onSettled: refresh,
  });
}
