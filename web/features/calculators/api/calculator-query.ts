import { keepPreviousData, useQuery } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';

/**
 * A calculator's answer as a query: POST /api/v1/`name` with the request, the response checked
 * against `schema`. The answer is a pure function of the (validated) request, so it is cached
 * keyed on it and never goes stale; the last answer stays on screen while the next one loads.
 * A null request sends nothing.
 */
export function useCalculator<Request, Response>(name: string, schema: z.ZodType<Response>, request: Request | null) {
  return useQuery({
    queryKey: request ? ['calculators', name, request] : ['calculators', name],
    queryFn: async () => schema.parse(await api<unknown>(`/api/v1/${name}`, { method: 'POST', body: request })),
    enabled: request !== null,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });
}
