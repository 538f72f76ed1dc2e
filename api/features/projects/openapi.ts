import { z } from 'zod';
import { idParams, problemResponses, security, type OpenApiRegistrar } from '../../lib/openapi';
import { historyQuery } from './routes';
import { invitationSchema, memberRoleSchema, projectFieldsSchema, projectPatchSchema, projectRoleSchema } from './schemas';

const projectView = z
  .object({
    id: z.string().uuid(),
    name: z.string(),
    description: z.string(),
    role: projectRoleSchema.meta({ description: "The caller's role in the project" }),
    memberCount: z.number().int(),
    version: z.number().int().meta({ description: 'Goes up by one with every change; send it back with the next change' }),
    createdAt: z.string(),
    updatedAt: z.string(),
  })
  .meta({ id: 'Project' });

const memberView = z
  .object({
    userId: z.string().uuid(),
    login: z.string(),
    displayName: z.string().nullable(),
    email: z.string().nullable(),
    avatarUrl: z.string().nullable(),
    role: projectRoleSchema,
    joinedAt: z.string(),
  })
  .meta({ id: 'Member' });

const inviter = z.object({ login: z.string(), displayName: z.string().nullable() }).nullable();

export const invitationView = z
  .object({
    id: z.string().uuid(),
    email: z.string(),
    role: projectRoleSchema,
    createdAt: z.string(),
    expiresAt: z.string(),
    status: z.enum(['pending', 'expired']),
    invitedBy: inviter,
  })
  .meta({ id: 'Invitation' });

const auditEventView = z.object({
  id: z.number().int(),
  at: z.string(),
  action: z.enum(['create', 'update', 'delete']),
  entityType: z.string(),
  entityId: z.string(),
  actor: z.object({ id: z.string().uuid(), login: z.string(), displayName: z.string().nullable() }).nullable(),
  before: z.unknown().meta({ description: 'The record before the change (null on create)' }),
  after: z.unknown().meta({ description: 'The record after the change (null on delete)' }),
});

const json = <T extends z.ZodType>(schema: T) => ({ 'application/json': { schema } });
const projectParams = idParams('projectId');

/** Projects, their members, the owner's side of invitations and the raw audit trail. */
export const registerProjects: OpenApiRegistrar = (registry) => {
  const tags = ['Projects'];
  registry.registerPath({
    method: 'get',
    path: '/api/v1/projects',
    tags,
    summary: 'Projects the caller is a member of, with their role in each',
    security: security.signedIn,
    responses: {
      200: { description: 'Newest first', content: json(z.object({ projects: z.array(projectView) })) },
      ...problemResponses(401),
    },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/projects',
    tags,
    summary: 'Create a project; the caller becomes its owner',
    security: security.signedIn,
    request: { body: { content: json(projectFieldsSchema) } },
    responses: {
      201: { description: 'The project (Location: its URL)', content: json(z.object({ project: projectView })) },
      ...problemResponses(400, 401),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/projects/{projectId}',
    tags,
    summary: 'One project',
    security: security.signedIn,
    request: { params: projectParams },
    responses: { 200: { description: 'The project', content: json(z.object({ project: projectView })) }, ...problemResponses(401, 404) },
  });
  registry.registerPath({
    method: 'patch',
    path: '/api/v1/projects/{projectId}',
    tags,
    summary: 'Rename or describe a project (version in the body or If-Match: W/"<version>"); owners only',
    security: security.signedIn,
    request: { params: projectParams, body: { content: json(projectPatchSchema) } },
    responses: {
      200: { description: 'The project', content: json(z.object({ project: projectView })) },
      ...problemResponses(400, 401, 403, 404, 409),
    },
  });
  registry.registerPath({
    method: 'delete',
    path: '/api/v1/projects/{projectId}',
    tags,
    summary: 'Delete a project with its campaigns, runs and invitations; owners only',
    security: security.signedIn,
    request: { params: projectParams },
    responses: { 204: { description: 'Deleted' }, ...problemResponses(401, 403, 404) },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/projects/{projectId}/members',
    tags,
    summary: 'Members with their roles, and the caller',
    security: security.signedIn,
    request: { params: projectParams },
    responses: {
      200: {
        description: 'Members',
        content: json(z.object({ members: z.array(memberView), you: z.object({ userId: z.string().uuid(), role: projectRoleSchema }) })),
      },
      ...problemResponses(401, 404),
    },
  });
  registry.registerPath({
    method: 'patch',
    path: '/api/v1/projects/{projectId}/members/{userId}',
    tags,
    summary: "Change a member's role; owners only (the last owner cannot step down)",
    security: security.signedIn,
    request: { params: idParams('projectId', 'userId'), body: { content: json(memberRoleSchema) } },
    responses: {
      200: { description: 'The member', content: json(z.object({ member: memberView })) },
      ...problemResponses(400, 401, 403, 404, 409),
    },
  });
  registry.registerPath({
    method: 'delete',
    path: '/api/v1/projects/{projectId}/members/{userId}',
    tags,
    summary: 'Remove a member; owners only (never the last owner)',
    security: security.signedIn,
    request: { params: idParams('projectId', 'userId') },
    responses: { 204: { description: 'Removed' }, ...problemResponses(401, 403, 404, 409) },
  });
  registry.registerPath({
    method: 'delete',
    path: '/api/v1/projects/{projectId}/membership',
    tags,
    summary: 'Leave a project (any member, except its last owner)',
    security: security.signedIn,
    request: { params: projectParams },
    responses: { 204: { description: 'Left' }, ...problemResponses(401, 404, 409) },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/projects/{projectId}/invitations',
    tags,
    summary: 'Pending and expired invitations not yet accepted or revoked; owners only',
    security: security.signedIn,
    request: { params: projectParams },
    responses: {
      200: { description: 'Invitations', content: json(z.object({ invitations: z.array(invitationView) })) },
      ...problemResponses(401, 403, 404),
    },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/projects/{projectId}/invitations',
    tags,
    summary: 'Invite someone by e-mail to a role; owners only',
    description: 'The link is e-mailed; when the mail server does not take it, nothing is created (502 mail-not-sent).',
    security: security.signedIn,
    request: { params: projectParams, body: { content: json(invitationSchema) } },
    responses: {
      201: { description: 'The invitation', content: json(z.object({ invitation: invitationView })) },
      ...problemResponses(400, 401, 403, 404, 409, 502),
    },
  });
  registry.registerPath({
    method: 'delete',
    path: '/api/v1/projects/{projectId}/invitations/{invitationId}',
    tags,
    summary: 'Revoke a pending invitation; owners only',
    security: security.signedIn,
    request: { params: idParams('projectId', 'invitationId') },
    responses: { 204: { description: 'Revoked' }, ...problemResponses(401, 403, 404) },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/projects/{projectId}/audit-events',
    tags,
    summary: 'Every recorded change in the project as stored (before/after snapshots), newest first; owners only',
    description: 'Pages of `limit` events before the event id `before`; `nextBefore` is the cursor of the next page.',
    security: security.signedIn,
    request: { params: projectParams, query: historyQuery },
    responses: {
      200: {
        description: 'A page of events',
        content: json(z.object({ events: z.array(auditEventView), nextBefore: z.number().int().nullable() })),
      },
      ...problemResponses(400, 401, 403, 404),
    },
  });
};
