import { z } from 'zod';
import { problemResponses, security, type OpenApiRegistrar } from '../../lib/openapi';
import { projectRoleSchema } from '../projects/schemas';

const tokenParams = z.object({ token: z.string().meta({ description: 'The secret from the invitation link' }) });

/** The invitee's side of an invitation: read it from its link, accept it. */
export const registerInvitations: OpenApiRegistrar = (registry) => {
  const tags = ['Invitations'];
  registry.registerPath({
    method: 'get',
    path: '/api/v1/invitations/{token}',
    tags,
    summary: 'What an invitation link offers (project, role, who invited), for the signed-in invitee',
    security: security.signedIn,
    request: { params: tokenParams },
    responses: {
      200: {
        description: 'The invitation',
        content: {
          'application/json': {
            schema: z.object({
              invitation: z.object({
                projectId: z.string().uuid(),
                projectName: z.string(),
                role: projectRoleSchema,
                email: z.string().meta({ description: 'Masked, e.g. a•••@example.org' }),
                expiresAt: z.string(),
                invitedBy: z.object({ login: z.string(), displayName: z.string().nullable() }).nullable(),
              }),
            }),
          },
        },
      },
      ...problemResponses(401, 403, 404, 410),
    },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/invitations/{token}/accept',
    tags,
    summary: 'Accept an invitation: the caller joins the project in the role offered',
    security: security.signedIn,
    request: { params: tokenParams },
    responses: {
      200: {
        description: 'Joined',
        content: { 'application/json': { schema: z.object({ projectId: z.string().uuid(), role: projectRoleSchema }) } },
      },
      ...problemResponses(401, 403, 404, 409, 410),
    },
  });
};
