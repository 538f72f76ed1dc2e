import { z } from 'zod';
import { problemResponses, security, type OpenApiRegistrar } from '../../lib/openapi';

const health = z.object({
  status: z.enum(['ok', 'degraded']),
  database: z.enum(['ok', 'down']),
  version: z.string(),
});

/** The liveness and readiness check. */
export const registerHealth: OpenApiRegistrar = (registry) => {
  registry.registerPath({
    method: 'get',
    path: '/api/health',
    tags: ['Service'],
    summary: 'Whether the server and its database answer (the database is given 2 s)',
    security: security.open,
    responses: {
      200: { description: 'Up', content: { 'application/json': { schema: health } } },
      503: { description: 'The database does not answer (Retry-After is set)', content: { 'application/json': { schema: health } } },
      ...problemResponses(400),
    },
  });
};
