import { forecastResponseSchema, type ForecastRequest, type ForecastResponse } from '../../../../api/features/calculators/schemas';
import { useCalculator } from './calculator-query';

/** POST /api/v1/forecast: selectivity across a temperature range. */
export function useForecast(request: ForecastRequest | null) {
  return useCalculator<ForecastRequest, ForecastResponse>('forecast', forecastResponseSchema, request);
}
