import { z } from 'zod';
import { problemResponses, security, type OpenApiRegistrar } from '../../lib/openapi';

const userView = z
  .object({
    id: z.string().uuid(),
    login: z.string(),
    displayName: z.string().nullable(),
    email: z.string().nullable(),
    avatarUrl: z.string().nullable(),
  })
  .meta({ id: 'User' });

/** Who is calling, and signing out. Signing in itself is the OAuth redirect at /auth/github (outside /api). */
export const registerSession: OpenApiRegistrar = (registry) => {
  const tags = ['Session'];
  registry.registerPath({
    method: 'get',
    path: '/api/v1/session',
    tags,
    summary: 'The signed-in user (or null), and the CSRF token a browser session sends with every write',
    security: security.open,
    responses: {
      200: {
        description: 'The session',
        content: {
          'application/json': {
            schema: z.object({
              user: userView.nullable(),
              csrfToken: z.string().nullable().meta({ description: 'For x-csrf-token; null unless signed in with a browser session' }),
              devTools: z.boolean().meta({ description: 'Development tools (local sign-in, mailbox) are on' }),
            }),
          },
        },
      },
      ...problemResponses(400, 503),
    },
  });
  registry.registerPath({
    method: 'delete',
    path: '/api/v1/session',
    tags,
    summary: 'Sign out: the session is destroyed and its cookie cleared (a no-op without one)',
    security: security.open,
    responses: { 204: { description: 'Signed out' }, ...problemResponses(403) },
  });
};
