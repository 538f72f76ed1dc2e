import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import {
  distributionResponseSchema,
  type DistributionRequest,
  type DistributionResponse,
} from '../../../../api/features/calculators/kinetics-schemas';
import { api } from '../../../lib/api-client';

/** POST /api/v1/distribution: product shares over several competing pathways. */
export async function postDistribution(request: DistributionRequest): Promise<DistributionResponse> {
  const data = await api<unknown>('/api/v1/distribution', { method: 'POST', body: request });
  return distributionResponseSchema.parse(data);
}

export const distributionKeys = {
  all: ['calculators', 'distribution'] as const,
  one: (request: DistributionRequest) => [...distributionKeys.all, request] as const,
};

/** The answer is a pure function of the (validated) request, so it is cached as a query keyed on it. */
export function distributionQueryOptions(request: DistributionRequest | null) {
  return queryOptions({
    queryKey: request ? distributionKeys.one(request) : distributionKeys.all,
    queryFn: () => postDistribution(request!),
    enabled: request !== null,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });
}

export function useDistribution(request: DistributionRequest | null) {
  return useQuery(distributionQueryOptions(request));
}
