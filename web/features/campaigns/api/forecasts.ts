import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { SavedForecastCreate } from '../../../../api/features/campaigns/schemas';
import { savedForecastListSchema } from '../../../../api/features/campaigns/analysis-schemas';
import { api } from '../../../lib/api-client';
import { campaignKeys } from './keys';
import type { SavedForecastView } from './types';

export const listForecasts = (campaignId: string) =>
  api<unknown>(`/api/v1/campaigns/${campaignId}/forecasts`).then((d): SavedForecastView[] => savedForecastListSchema.parse(d).forecasts);
export const forecastsQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: campaignKeys.forecasts(campaignId), queryFn: () => listForecasts(campaignId) });
export const useForecasts = (campaignId: string) => useQuery(forecastsQueryOptions(campaignId));

/** The server computes the forecast from the stored data with the weighting named here and keeps a snapshot. */
export const saveForecast = (campaignId: string, body: SavedForecastCreate, weighting: 'none' | 'uncertainty') =>
  api<SavedForecastView>(`/api/v1/campaigns/${campaignId}/forecasts?weighting=${weighting}`, { method: 'POST', body });
export function useSaveForecast(campaignId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (v: { body: SavedForecastCreate; weighting: 'none' | 'uncertainty' }) => saveForecast(campaignId, v.body, v.weighting),
    onSuccess: () => client.invalidateQueries({ queryKey: campaignKeys.forecasts(campaignId) }),
  });
}

export const deleteForecast = (forecastId: string) => api<void>(`/api/v1/forecasts/${forecastId}`, { method: 'DELETE' });
export function useDeleteForecast(campaignId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: deleteForecast,
    onSettled: () => client.invalidateQueries({ queryKey: campaignKeys.forecasts(campaignId) }),
  });
}
