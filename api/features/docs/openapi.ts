import { z } from 'zod';
import { problemResponses, security, type OpenApiRegistrar } from '../../lib/openapi';

/** The description itself. */
export const registerDocs: OpenApiRegistrar = (registry) => {
  registry.registerPath({
    method: 'get',
    path: '/api/v1/openapi.json',
    tags: ['Service'],
    summary: 'This API description (OpenAPI 3.1), with the problem types every error may carry in x-problem-types',
    security: security.open,
    responses: {
      200: {
        description: 'The OpenAPI document',
        content: { 'application/json': { schema: z.record(z.string(), z.unknown()).meta({ description: 'An OpenAPI 3.1 document' }) } },
      },
      ...problemResponses(400),
    },
  });
};
