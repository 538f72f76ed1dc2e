import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { forecastResponseSchema, type ForecastRequest, type ForecastResponse } from '../../../../api/features/calculators/schemas';
import { api } from '../../../lib/api-client';

/** POST /api/v1/forecast: selectivity across a temperature range. */
export async function postForecast(request: ForecastRequest): Promise<ForecastResponse> {
  const data = await api<unknown>('/api/v1/forecast', { method: 'POST', body: request });
  return forecastResponseSchema.parse(data);
}

export const forecastKeys = {
  all: ['calculators', 'forecast'] as const,
  one: (request: ForecastRequest) => [...forecastKeys.all, request] as const,
};

/** A forecast is a pure function of its (validated) request, so it is cached as a query keyed on it. */
export function forecastQueryOptions(request: ForecastRequest | null) {
  return queryOptions({
    queryKey: request ? forecastKeys.one(request) : forecastKeys.all,
    queryFn: () => postForecast(request!),
    enabled: request !== null,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });
}

export function useForecast(request: ForecastRequest | null) {
  return useQuery(forecastQueryOptions(request));
}
