import { parseBody } from '../../lib/validation';
import { Router } from 'express';
import type { Knex } from 'knex';
import { z } from 'zod';
import type { AppConfig } from '../../config';
import { BadRequestError, NotFoundError } from '../../lib/errors';
import { requireUser } from '../auth/middleware';
import { listAuditEvents } from '../audit/service';
import { inviteToProject, listPendingInvitations, revokeInvitation } from '../invitations/service';
import type { Mailer } from '../mail/mailer';
import { authorizeProject, projectIdParam } from './policy';
import { invitationSchema, memberRoleSchema, projectFieldsSchema, projectPatchSchema, uuidSchema } from './schemas';
import {
  changeMemberRole,
  createProject,
  deleteProject,
  getProject,
  listMembers,
  listProjectsFor,
  removeMember,
  updateProject,
} from './service';

export const historyQuery = z.object({
  limit: z.coerce
    .number({ error: 'limit must be a number.' })
    .int('limit must be a whole number.')
    .min(1, 'limit must be at least 1.')
    .max(200, 'limit may be at most 200.')
    .default(50),
  before: z.coerce
    .number({ error: 'before must be an event id.' })
    .int('before must be an event id.')
    .positive('before must be an event id.')
    .optional(),
});

/** `version` from the body, or from `If-Match: W/"<n>"` when the body has none (as for campaigns). */
function withIfMatchVersion(body: unknown, ifMatch: string | undefined): unknown {
  if (ifMatch === undefined || body === null || typeof body !== 'object' || Array.isArray(body) || 'version' in body) return body ?? {};
  const m = /^\s*(?:W\/)?"(\d+)"\s*$/.exec(ifMatch);
  if (!m)
    throw new BadRequestError('If-Match must name one version, e.g. W/"3".', [{ path: 'If-Match', message: 'expected W/"<version>"' }]);
  return { ...body, version: Number(m[1]) };
}

const memberId = (value: unknown) => {
  const raw = String(value);
  if (!uuidSchema.safeParse(raw).success) throw new NotFoundError('This person is not a member of the project.');
  return raw;
};

/**
 * Projects, members, invitations and history, mounted at /api/v1/projects. Each route names its
 * minimum role once, through authorizeProject; handlers never check roles themselves.
 */
export function projectsRouter(deps: { knex: Knex; config: AppConfig; mailer: Mailer }): Router {
  const { knex } = deps;
  const router = Router();
  const viewer = authorizeProject(knex, 'viewer', projectIdParam);
  const owner = authorizeProject(knex, 'owner', projectIdParam);

  router.get('/', requireUser, async (req, res) => {
    res.json({ projects: await listProjectsFor(knex, req.user!.id) });
  });

  router.post('/', requireUser, async (req, res) => {
    const fields = parseBody(projectFieldsSchema, req.body);
    const project = await createProject(knex, req.user!.id, fields);
    res.status(201).location(`/api/v1/projects/${project.id}`).json({ project });
  });

  router.get('/:projectId', viewer, async (req, res) => {
    res.json({ project: await getProject(knex, req.project!.id, req.project!.role) });
  });

  router.patch('/:projectId', owner, async (req, res) => {
    const patch = parseBody(projectPatchSchema, withIfMatchVersion(req.body, req.get('If-Match')));
    res.json({ project: await updateProject(knex, req.user!.id, req.project!.id, patch, req.project!.role) });
  });

  router.delete('/:projectId', owner, async (req, res) => {
    await deleteProject(knex, req.user!.id, req.project!.id);
    res.status(204).end();
  });

  router.get('/:projectId/members', viewer, async (req, res) => {
    res.json({ members: await listMembers(knex, req.project!.id), you: { userId: req.user!.id, role: req.project!.role } });
  });

  router.patch('/:projectId/members/:userId', owner, async (req, res) => {
    const { role } = parseBody(memberRoleSchema, req.body ?? {});
    res.json({ member: await changeMemberRole(knex, req.user!.id, req.project!.id, memberId(req.params.userId), role) });
  });

  router.delete('/:projectId/members/:userId', owner, async (req, res) => {
    await removeMember(knex, req.user!.id, req.project!.id, memberId(req.params.userId));
    res.status(204).end();
  });

  // Leaving needs only membership: any member may remove themselves (except the last owner).
  router.delete('/:projectId/membership', viewer, async (req, res) => {
    await removeMember(knex, req.user!.id, req.project!.id, req.user!.id);
    res.status(204).end();
  });

  router.get('/:projectId/invitations', owner, async (req, res) => {
    res.json({ invitations: await listPendingInvitations(knex, req.project!.id) });
  });

  router.post('/:projectId/invitations', owner, async (req, res) => {
    const input = parseBody(invitationSchema, req.body ?? {});
    const invitation = await inviteToProject(
      knex,
      { mailer: deps.mailer, publicUrl: deps.config.publicUrl },
      req.user!,
      req.project!.id,
      input,
    );
    res.status(201).json({ invitation });
  });

  router.delete('/:projectId/invitations/:invitationId', owner, async (req, res) => {
    if (!uuidSchema.safeParse(req.params.invitationId).success)
      throw new NotFoundError('This project has no pending invitation with this id.');
    await revokeInvitation(knex, req.user!.id, req.project!.id, String(req.params.invitationId));
    res.status(204).end();
  });

  router.get('/:projectId/audit-events', owner, async (req, res) => {
    const page = parseBody(historyQuery, req.query);
    res.json(await listAuditEvents(knex, req.project!.id, page));
  });

  return router;
}
