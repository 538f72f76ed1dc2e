import { erosionResponseSchema, type ErosionRequest, type ErosionResponse } from '../../../../api/features/calculators/kinetics-schemas';
import { useCalculator } from './calculator-query';

/** POST /api/v1/erosion: loss of ee while the product is held. */
export function useErosion(request: ErosionRequest | null) {
  return useCalculator<ErosionRequest, ErosionResponse>('erosion', erosionResponseSchema, request);
}
