import {
  distributionResponseSchema,
  type DistributionRequest,
  type DistributionResponse,
} from '../../../../api/features/calculators/kinetics-schemas';
import { useCalculator } from './calculator-query';

/** POST /api/v1/distribution: product shares over several competing pathways. */
export function useDistribution(request: DistributionRequest | null) {
  return useCalculator<DistributionRequest, DistributionResponse>('distribution', distributionResponseSchema, request);
}
