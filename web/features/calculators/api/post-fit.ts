import { fitResponseSchema, type FitRequestInput, type FitResponse } from '../../../../api/features/calculators/schemas';
import { useCalculator } from './calculator-query';

/** POST /api/v1/fit: differential Eyring fit of a temperature screen, with predictions. */
export function useFit(request: FitRequestInput | null) {
  return useCalculator<FitRequestInput, FitResponse>('fit', fitResponseSchema, request);
}
