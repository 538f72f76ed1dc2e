import type { Knex } from 'knex';
import { ConflictError, NotFoundError } from '../../lib/errors';
import { Project } from '../../models/project';
import { ProjectMember } from '../../models/project-member';
import { recordAudit } from '../../lib/audit';
import type { ProjectRole } from './schemas';

export interface ProjectView {
  id: string;
  name: string;
  description: string;
  role: ProjectRole;
  memberCount: number;
  /** Goes up by one with every change of name or description; send it back with the next change. */
  version: number;
  createdAt: string;
  updatedAt: string;
}

export interface MemberView {
  userId: string;
  login: string;
  displayName: string | null;
  email: string | null;
  avatarUrl: string | null;
  role: ProjectRole;
  joinedAt: string;
}

const projectSnapshot = (p: Project) => ({ id: p.id, name: p.name, description: p.description });
const memberSnapshot = (m: Pick<ProjectMember, 'projectId' | 'userId' | 'role'>) => ({
  projectId: m.projectId,
  userId: m.userId,
  role: m.role,
});

export async function listProjectsFor(db: Knex, userId: string): Promise<ProjectView[]> {
  const rows = await db('projects as p')
    .join('project_members as m', 'm.projectId', 'p.id')
    .where('m.userId', userId)
    .select('p.id', 'p.name', 'p.description', 'p.version', 'p.createdAt', 'p.updatedAt', 'm.role')
    .select(db.raw('(select count(*) from project_members c where c.project_id = p.id) as member_count'))
    .orderBy('p.name');
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    description: r.description,
    role: r.role,
    memberCount: Number(r.memberCount),
    version: r.version,
    createdAt: new Date(r.createdAt).toISOString(),
    updatedAt: new Date(r.updatedAt).toISOString(),
  }));
}

export async function getProject(db: Knex, projectId: string, role: ProjectRole): Promise<ProjectView> {
  const p = await Project.query(db).findById(projectId);
  if (!p) throw new NotFoundError('No project of yours was found at this address.');
  const count = await ProjectMember.query(db).where({ projectId }).resultSize();
  return {
    id: p.id,
    name: p.name,
    description: p.description,
    role,
    memberCount: count,
    version: p.version,
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
  };
}

/** The creator becomes the first owner; both rows and their history commit together. */
export async function createProject(db: Knex, actorId: string, fields: { name: string; description: string }): Promise<ProjectView> {
  const id = await db.transaction(async (trx) => {
    const project = await Project.query(trx).insertAndFetch({ ...fields, createdBy: actorId });
    const member = { projectId: project.id, userId: actorId, role: 'owner' as const };
    await ProjectMember.query(trx).insert(member);
    await recordAudit(trx, {
      projectId: project.id,
      actorUserId: actorId,
      action: 'create',
      entityType: 'project',
      entityId: project.id,
      before: null,
      after: projectSnapshot(project),
    });
    await recordAudit(trx, {
      projectId: project.id,
      actorUserId: actorId,
      action: 'create',
      entityType: 'project_member',
      entityId: actorId,
      before: null,
      after: memberSnapshot(member),
    });
    return project.id;
  });
  return getProject(db, id, 'owner');
}

export async function updateProject(
  db: Knex,
  actorId: string,
  projectId: string,
  input: { name?: string; description?: string; version: number },
  role: ProjectRole,
): Promise<ProjectView> {
  const { version, ...patch } = input;
  await db.transaction(async (trx) => {
    const before = await Project.query(trx).findById(projectId).forUpdate();
    if (!before) throw new NotFoundError('No project of yours was found at this address.');
    if (before.version !== version) {
      throw new ConflictError(
        `The project was changed by someone else (you sent version ${version}; it is now at version ${before.version}). Reload it and apply your change again.`,
        { currentVersion: before.version },
      );
    }
    const after = await Project.query(trx).patchAndFetchById(projectId, { ...patch, version: version + 1 });
    await recordAudit(trx, {
      projectId,
      actorUserId: actorId,
      action: 'update',
      entityType: 'project',
      entityId: projectId,
      before: projectSnapshot(before),
      after: projectSnapshot(after),
    });
  });
  return getProject(db, projectId, role);
}

export async function deleteProject(db: Knex, actorId: string, projectId: string): Promise<void> {
  await db.transaction(async (trx) => {
    const before = await Project.query(trx).findById(projectId).forUpdate();
    if (!before) throw new NotFoundError('No project of yours was found at this address.');
    const members = await ProjectMember.query(trx).where({ projectId });
    await Project.query(trx).deleteById(projectId);
    await recordAudit(trx, {
      projectId,
      actorUserId: actorId,
      action: 'delete',
      entityType: 'project',
      entityId: projectId,
      before: { ...projectSnapshot(before), members: members.map(memberSnapshot) },
      after: null,
    });
  });
}

export async function listMembers(db: Knex, projectId: string): Promise<MemberView[]> {
  const rows = await db('project_members as m')
    .join('users as u', 'u.id', 'm.userId')
    .where('m.projectId', projectId)
    .select('m.userId', 'm.role', 'm.createdAt', 'u.login', 'u.displayName', 'u.email', 'u.avatarUrl')
    .orderByRaw(`case m.role when 'owner' then 0 when 'editor' then 1 else 2 end, lower(u.login)`);
  return rows.map((r) => ({
    userId: r.userId,
    login: r.login,
    displayName: r.displayName,
    email: r.email,
    avatarUrl: r.avatarUrl,
    role: r.role,
    joinedAt: new Date(r.createdAt).toISOString(),
  }));
}

/**
 * Lock the project's member rows, then check that a change leaves at least one
 * owner. Locking makes two owners demoting each other at once safe.
 */
async function lockMembers(trx: Knex.Transaction, projectId: string, userId: string) {
  const all = await ProjectMember.query(trx).where({ projectId }).forUpdate();
  const target = all.find((m) => m.userId === userId);
  if (!target) throw new NotFoundError('This person is not a member of the project.');
  const owners = all.filter((m) => m.role === 'owner').length;
  return { target, owners };
}

export async function changeMemberRole(
  db: Knex,
  actorId: string,
  projectId: string,
  userId: string,
  role: ProjectRole,
): Promise<MemberView> {
  await db.transaction(async (trx) => {
    const { target, owners } = await lockMembers(trx, projectId, userId);
    if (target.role === role) return;
    if (target.role === 'owner' && owners === 1) {
      throw new ConflictError('The last owner cannot be demoted. Make another member an owner first.', { code: 'last-owner' });
    }
    await ProjectMember.query(trx).findById([projectId, userId]).patch({ role });
    await recordAudit(trx, {
      projectId,
      actorUserId: actorId,
      action: 'update',
      entityType: 'project_member',
      entityId: userId,
      before: memberSnapshot(target),
      after: memberSnapshot({ projectId, userId, role }),
    });
  });
  const member = (await listMembers(db, projectId)).find((m) => m.userId === userId);
  if (!member) throw new NotFoundError('This person is not a member of the project.');
  return member;
}

/** Remove a member (an owner removing someone, or a member leaving). The last owner stays. */
export async function removeMember(db: Knex, actorId: string, projectId: string, userId: string): Promise<void> {
  await db.transaction(async (trx) => {
    const { target, owners } = await lockMembers(trx, projectId, userId);
    if (target.role === 'owner' && owners === 1) {
      throw new ConflictError(
        actorId === userId
          ? 'You are the last owner and cannot leave. Make another member an owner first, or delete the project.'
          : 'The last owner cannot be removed. Make another member an owner first.',
        { code: 'last-owner' },
      );
    }
    await ProjectMember.query(trx).deleteById([projectId, userId]);
    await recordAudit(trx, {
      projectId,
      actorUserId: actorId,
      action: 'delete',
      entityType: 'project_member',
      entityId: userId,
      before: memberSnapshot(target),
      after: null,
    });
  });
}
