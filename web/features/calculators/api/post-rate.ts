import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { rateResponseSchema, type RateRequest, type RateResponse } from '../../../../api/features/calculators/kinetics-schemas';
import { api } from '../../../lib/api-client';

/** POST /api/v1/rate: time to a target conversion, k and t½ across a temperature range. */
export async function postRate(request: RateRequest): Promise<RateResponse> {
  const data = await api<unknown>('/api/v1/rate', { method: 'POST', body: request });
  return rateResponseSchema.parse(data);
}

export const rateKeys = {
  all: ['calculators', 'rate'] as const,
  one: (request: RateRequest) => [...rateKeys.all, request] as const,
};

/** The answer is a pure function of the (validated) request, so it is cached as a query keyed on it. */
export function rateQueryOptions(request: RateRequest | null) {
  return queryOptions({
    queryKey: request ? rateKeys.one(request) : rateKeys.all,
    queryFn: () => postRate(request!),
    enabled: request !== null,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });
}

export function useRate(request: RateRequest | null) {
  return useQuery(rateQueryOptions(request));
}
