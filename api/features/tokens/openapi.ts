import { z } from 'zod';
import { idParams, problemResponses, security, type OpenApiRegistrar } from '../../lib/openapi';
import { createTokenSchema } from './schemas';

const tokenView = z
  .object({
    id: z.string().uuid(),
    name: z.string(),
    prefix: z.string().meta({ description: 'The first characters of the secret, to recognise it' }),
    createdAt: z.string(),
    expiresAt: z.string(),
    lastUsedAt: z.string().nullable(),
    revokedAt: z.string().nullable(),
    status: z.enum(['active', 'expired', 'revoked']),
  })
  .meta({ id: 'ApiToken' });

/** Personal API tokens: managed from a signed-in browser session only. */
export const registerTokens: OpenApiRegistrar = (registry) => {
  const tags = ['API tokens'];
  registry.registerPath({
    method: 'get',
    path: '/api/v1/tokens',
    tags,
    summary: "The caller's API tokens (never their secrets)",
    security: security.sessionOnly,
    responses: {
      200: { description: 'Tokens', content: { 'application/json': { schema: z.object({ tokens: z.array(tokenView) }) } } },
      ...problemResponses(401, 429),
    },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/tokens',
    tags,
    summary: 'Create an API token; the secret is shown in this answer only',
    security: security.sessionOnly,
    request: { body: { content: { 'application/json': { schema: createTokenSchema } } } },
    responses: {
      201: {
        description: 'The token and its secret',
        content: { 'application/json': { schema: z.object({ token: tokenView, secret: z.string() }) } },
      },
      ...problemResponses(400, 401, 429),
    },
  });
  registry.registerPath({
    method: 'delete',
    path: '/api/v1/tokens/{tokenId}',
    tags,
    summary: 'Revoke an API token at once',
    security: security.sessionOnly,
    request: { params: idParams('tokenId') },
    responses: { 204: { description: 'Revoked' }, ...problemResponses(401, 404, 429) },
  });
};
