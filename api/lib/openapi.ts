import { OpenAPIRegistry, OpenApiGeneratorV31 } from '@asteasolutions/zod-to-openapi';
import { z } from 'zod';

/**
 * The API description is generated from the same zod schemas that validate
 * requests; features add their paths through `register` functions.
 */
export type OpenApiRegistrar = (registry: OpenAPIRegistry) => void;

export const problemSchema = z
  .object({
    type: z.string(),
    title: z.string(),
    status: z.number().int(),
    detail: z.string(),
    instance: z.string().optional(),
    errors: z.array(z.object({ path: z.string(), message: z.string() })).optional(),
  })
  .meta({ id: 'Problem', description: 'RFC 9457 problem details; errors[] names each offending field by its path.' });

export function problemResponses(...statuses: number[]) {
  const text: Record<number, string> = {
    400: 'The body failed validation (errors[] names each field).',
    401: 'Not signed in.',
    403: 'Your role does not allow this.',
    404: 'Not found (or not visible to you).',
    409: 'Conflict with the current state.',
    413: 'The body is larger than the server accepts.',
    422: 'Valid shape, but the values cannot be computed (e.g. 100 % ee has no finite energy gap).',
    429: 'Rate limit reached.',
  };
  return Object.fromEntries(
    statuses.map((s) => [s, { description: text[s] ?? 'Error', content: { 'application/problem+json': { schema: problemSchema } } }]),
  );
}

export function buildOpenApiDocument(registrars: OpenApiRegistrar[], version: string) {
  const registry = new OpenAPIRegistry();
  for (const register of registrars) register(registry);
  return new OpenApiGeneratorV31(registry.definitions).generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Eyrie API',
      version,
      description:
        'Temperature, selectivity and rate computations for stereoselective reactions. Sign convention: ΔΔX‡ = X‡(TS→B) − X‡(TS→A); r = [A]/[B]; positive values favour A. Quantities travel as { value, unit }.',
    },
    servers: [{ url: '/' }],
  });
}
