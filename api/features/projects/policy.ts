import type { Request, RequestHandler } from 'express';
import type { Knex } from 'knex';
import { ForbiddenError, NotFoundError, UnauthenticatedError } from '../../lib/errors';
import { roleRank, uuidSchema, type ProjectRole } from './schemas';
import { ProjectMember } from '../../models/project-member';

export type { ProjectRole } from './schemas';

const roleWords: Record<ProjectRole, string> = { viewer: 'a viewer', editor: 'an editor', owner: 'an owner' };

/** The caller's role in a project, or null when they are not a member (or the project does not exist). */
export async function roleInProject(db: Knex, projectId: string, userId: string): Promise<ProjectRole | null> {
  if (!uuidSchema.safeParse(projectId).success) return null;
  const member = await ProjectMember.query(db).findById([projectId, userId]);
  return member?.role ?? null;
}

/**
 * The one place a project route decides who may pass. Anonymous: 401. Not a
 * member, unknown project, or a resolver that finds nothing: 404, so project
 * ids do not leak. A member below `minRole`: 403. Otherwise req.project is set.
 */
export function authorizeProject(
  db: Knex,
  minRole: ProjectRole,
  resolveProjectId: (req: Request) => Promise<string | null> | string | null,
): RequestHandler {
  return async (req, _res, next) => {
    if (!req.user) throw new UnauthenticatedError();
    const projectId = await resolveProjectId(req);
    const role = projectId ? await roleInProject(db, projectId, req.user.id) : null;
    if (!projectId || !role) throw new NotFoundError('No project of yours was found at this address.');
    if (roleRank[role] < roleRank[minRole]) {
      throw new ForbiddenError(`This needs ${roleWords[minRole]} of the project; you are ${roleWords[role]}.`);
    }
    req.project = { id: projectId, role };
    next();
  };
}

/** Resolver for routes of the shape /projects/:projectId/… */
export const projectIdParam = (req: Request): string | null => {
  const id = req.params.projectId;
  return typeof id === 'string' ? id : null;
};
