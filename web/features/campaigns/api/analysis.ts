import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { analysisResponseSchema } from '../../../../api/features/campaigns/analysis-schemas';
import { api } from '../../../lib/api-client';
import { campaignKeys, type AnalysisParams } from './keys';
import type { AnalysisResponse } from './types';

export function getAnalysis(campaignId: string, params: AnalysisParams) {
  const search = new URLSearchParams({ weighting: params.weighting, confidence: '0.95' });
  if (params.atCelsius !== null) search.set('at', String(params.atCelsius));
  return api<unknown>(`/api/v1/campaigns/${campaignId}/analysis?${search}`).then((d): AnalysisResponse => analysisResponseSchema.parse(d));
}

export const analysisQueryOptions = (campaignId: string, params: AnalysisParams) =>
  queryOptions({
    queryKey: campaignKeys.analysis(campaignId, params),
    queryFn: () => getAnalysis(campaignId, params),
    // A new temperature keeps the last answer on screen until the next one arrives.
    placeholderData: keepPreviousData,
  });

export const useAnalysis = (campaignId: string, params: AnalysisParams) => useQuery(analysisQueryOptions(campaignId, params));
