import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { erosionResponseSchema, type ErosionRequest, type ErosionResponse } from '../../../../api/features/calculators/kinetics-schemas';
import { api } from '../../../lib/api-client';

/** POST /api/v1/erosion: loss of ee while the product is held. */
export async function postErosion(request: ErosionRequest): Promise<ErosionResponse> {
  const data = await api<unknown>('/api/v1/erosion', { method: 'POST', body: request });
  return erosionResponseSchema.parse(data);
}

export const erosionKeys = {
  all: ['calculators', 'erosion'] as const,
  one: (request: ErosionRequest) => [...erosionKeys.all, request] as const,
};

/** The answer is a pure function of the (validated) request, so it is cached as a query keyed on it. */
export function erosionQueryOptions(request: ErosionRequest | null) {
  return queryOptions({
    queryKey: request ? erosionKeys.one(request) : erosionKeys.all,
    queryFn: () => postErosion(request!),
    enabled: request !== null,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });
}

export function useErosion(request: ErosionRequest | null) {
  return useQuery(erosionQueryOptions(request));
}
