import { rateResponseSchema, type RateRequest, type RateResponse } from '../../../../api/features/calculators/kinetics-schemas';
import { useCalculator } from './calculator-query';

/** POST /api/v1/rate: time to a target conversion, k and t½ across a temperature range. */
export function useRate(request: RateRequest | null) {
  return useCalculator<RateRequest, RateResponse>('rate', rateResponseSchema, request);
}
