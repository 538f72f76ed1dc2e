import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { comparisonResponseSchema } from '../../../../api/features/campaigns/analysis-schemas';
import { api } from '../../../lib/api-client';
import { campaignKeys } from './keys';
import type { ComparisonResponse } from './types';

export const getComparison = (projectId: string, atCelsius: number) =>
  api<unknown>(`/api/v1/projects/${projectId}/comparison?at=${encodeURIComponent(String(atCelsius))}`).then((d): ComparisonResponse =>
    comparisonResponseSchema.parse(d),
  );

/** The temperature a project's comparison opens at (°C). */
export const OPENING_COMPARISON_CELSIUS = -20;

export const comparisonQueryOptions = (projectId: string, atCelsius: number) =>
  queryOptions({
    queryKey: campaignKeys.comparison(projectId, atCelsius),
    queryFn: () => getComparison(projectId, atCelsius),
    placeholderData: keepPreviousData,
  });

export const useComparison = (projectId: string, atCelsius: number) => useQuery(comparisonQueryOptions(projectId, atCelsius));
