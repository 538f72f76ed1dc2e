import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { fitResponseSchema, type FitRequestInput, type FitResponse } from '../../../../api/features/calculators/schemas';
import { api } from '../../../lib/api-client';

/** POST /api/v1/fit: differential Eyring fit of a temperature screen, with predictions. */
export async function postFit(request: FitRequestInput): Promise<FitResponse> {
  const data = await api<unknown>('/api/v1/fit', { method: 'POST', body: request });
  return fitResponseSchema.parse(data);
}

export const fitKeys = {
  all: ['calculators', 'fit'] as const,
  one: (request: FitRequestInput) => [...fitKeys.all, request] as const,
};

export function fitQueryOptions(request: FitRequestInput | null) {
  return queryOptions({
    queryKey: request ? fitKeys.one(request) : fitKeys.all,
    queryFn: () => postFit(request!),
    enabled: request !== null,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });
}

export function useFit(request: FitRequestInput | null) {
  return useQuery(fitQueryOptions(request));
}
