import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { campaignKeys, type AnalysisParams } from './keys';
import type { AnalysisResponse } from './types';

/**
 * The request leaves at once; the module that checks the answer (zod and the schemas) loads beside
 * it rather than before it. This module stays free of zod so the route loader can import it with the
 * first page's code and start the largest request of the campaign page at navigation.
 */
export function getAnalysis(campaignId: string, params: AnalysisParams): Promise<AnalysisResponse> {
  const search = new URLSearchParams({ weighting: params.weighting, confidence: '0.95' });
  if (params.atCelsius !== null) search.set('at', String(params.atCelsius));
  return Promise.all([api<unknown>(`/api/v1/campaigns/${campaignId}/analysis?${search}`), import('./analysis-check')]).then(
    ([answer, { checkAnalysis }]) => checkAnalysis(answer),
  );
}

export const analysisQueryOptions = (campaignId: string, params: AnalysisParams) =>
  queryOptions({
    queryKey: campaignKeys.analysis(campaignId, params),
    queryFn: () => getAnalysis(campaignId, params),
    // A new temperature keeps the last answer on screen until the next one arrives.
    placeholderData: keepPreviousData,
  });

export const useAnalysis = (campaignId: string, params: AnalysisParams) => useQuery(analysisQueryOptions(campaignId, params));
