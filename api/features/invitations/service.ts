import type { Knex } from 'knex';
import { AppError, ConflictError, MailNotSentError, NotFoundError } from '../../lib/errors';
import { hashSecret, newSecret } from '../../lib/secrets';
import { Invitation } from '../../models/invitation';
import { Project } from '../../models/project';
import { ProjectMember } from '../../models/project-member';
import type { User } from '../../models/user';
import { recordAudit } from '../../lib/audit';
import type { Mailer } from '../mail/mailer';
import type { ProjectRole } from '../projects/schemas';

export const INVITATION_TTL_DAYS = 7;

export interface InvitationView {
  id: string;
  email: string;
  role: ProjectRole;
  createdAt: string;
  expiresAt: string;
  status: 'pending' | 'expired';
  invitedBy: { login: string; displayName: string | null } | null;
}

const snapshot = (i: Invitation) => ({
  id: i.id,
  email: i.email,
  role: i.role,
  expiresAt: new Date(i.expiresAt).toISOString(),
  acceptedAt: i.acceptedAt ? new Date(i.acceptedAt).toISOString() : null,
  acceptedBy: i.acceptedBy,
  revokedAt: i.revokedAt ? new Date(i.revokedAt).toISOString() : null,
});

/** 410 Gone with a machine-readable code, so the web page can say exactly what happened. */
class InvitationGoneError extends AppError {
  constructor(detail: string, code: 'invitation-expired' | 'invitation-used' | 'invitation-revoked') {
    super('invitation-no-longer-valid', detail, [], { code });
  }
}

class WrongAccountError extends AppError {
  constructor(detail: string) {
    super('invitation-is-for-someone-else', detail, [], { code: 'invitation-wrong-account' });
  }
}

/** "ada.pemberton@example.org" → "a•••@example.org": enough to recognise, not enough to harvest. */
export function maskEmail(email: string): string {
  const [local, domain] = email.split('@');
  return `${local.slice(0, 1)}•••@${domain ?? ''}`;
}

export async function listPendingInvitations(db: Knex, projectId: string): Promise<InvitationView[]> {
  const rows = await db('invitations as i')
    .leftJoin('users as u', 'u.id', 'i.invitedBy')
    .where('i.projectId', projectId)
    .whereNull('i.acceptedAt')
    .whereNull('i.revokedAt')
    .orderBy('i.createdAt', 'desc')
    .select('i.id', 'i.email', 'i.role', 'i.createdAt', 'i.expiresAt', 'u.login', 'u.displayName');
  const now = Date.now();
  return rows.map((r) => ({
    id: r.id,
    email: r.email,
    role: r.role,
    createdAt: new Date(r.createdAt).toISOString(),
    expiresAt: new Date(r.expiresAt).toISOString(),
    status: new Date(r.expiresAt).getTime() > now ? 'pending' : 'expired',
    invitedBy: r.login ? { login: r.login, displayName: r.displayName } : null,
  }));
}

/**
 * Invite an address into a project and e-mail a single-use link. A newer
 * invitation to the same address replaces any still pending. The mail is sent
 * inside the transaction: if it cannot be sent, no invitation is left behind.
 */
export async function inviteToProject(
  db: Knex,
  deps: { mailer: Mailer; publicUrl: string },
  actor: User,
  projectId: string,
  input: { email: string; role: ProjectRole },
): Promise<InvitationView> {
  const email = input.email.toLowerCase();
  const id = await db.transaction(async (trx) => {
    const project = await Project.query(trx).findById(projectId).forUpdate();
    if (!project) throw new NotFoundError('No project of yours was found at this address.');
    const existing = await trx('project_members as m')
      .join('users as u', 'u.id', 'm.userId')
      .where('m.projectId', projectId)
      .whereRaw('lower(u.email) = ?', [email])
      .first('u.login');
    if (existing)
      throw new ConflictError(`${email} already belongs to a member of this project (${existing.login}).`, { code: 'already-member' });

    const pending = await Invitation.query(trx).where({ projectId, email }).whereNull('acceptedAt').whereNull('revokedAt');
    for (const old of pending) {
      const revoked = await Invitation.query(trx).patchAndFetchById(old.id, { revokedAt: new Date() });
      await recordAudit(trx, {
        projectId,
        actorUserId: actor.id,
        action: 'update',
        entityType: 'invitation',
        entityId: old.id,
        before: snapshot(old),
        after: snapshot(revoked),
      });
    }

    const secret = newSecret('');
    const invitation = await Invitation.query(trx).insertAndFetch({
      projectId,
      email,
      role: input.role,
      tokenHash: hashSecret(secret),
      invitedBy: actor.id,
      expiresAt: new Date(Date.now() + INVITATION_TTL_DAYS * 86_400_000),
    });
    await recordAudit(trx, {
      projectId,
      actorUserId: actor.id,
      action: 'create',
      entityType: 'invitation',
      entityId: invitation.id,
      before: null,
      after: snapshot(invitation),
    });

    const link = `${deps.publicUrl}/invitations/${secret}`;
    const inviter = actor.displayName ?? actor.login;
    try {
      await deps.mailer.send({
        to: email,
        projectId,
        subject: `${inviter} invited you to “${project.name}” on Eyrie`,
        text: [
          `${inviter} invited you to join the project “${project.name}” on Eyrie as ${input.role}.`,
          '',
          `Accept the invitation (sign in with the account for ${email}):`,
          link,
          '',
          `The link works once and expires on ${invitation.expiresAt.toUTCString()}.`,
          'If you did not expect this message, ignore it.',
        ].join('\n'),
      });
    } catch (err) {
      // The mail server's reply may name hosts or accounts: it goes to the log (as the cause), not to the caller.
      throw new MailNotSentError('The invitation e-mail could not be sent; no invitation was created. Try again in a few minutes.', err);
    }
    return invitation.id;
  });
  const view = (await listPendingInvitations(db, projectId)).find((i) => i.id === id);
  if (!view) throw new NotFoundError('The invitation disappeared while it was being created.');
  return view;
}

export async function revokeInvitation(db: Knex, actorId: string, projectId: string, invitationId: string): Promise<void> {
  await db.transaction(async (trx) => {
    const inv = await Invitation.query(trx)
      .findOne({ id: invitationId, projectId })
      .whereNull('acceptedAt')
      .whereNull('revokedAt')
      .forUpdate();
    if (!inv) throw new NotFoundError('This project has no pending invitation with this id.');
    const after = await Invitation.query(trx).patchAndFetchById(inv.id, { revokedAt: new Date() });
    await recordAudit(trx, {
      projectId,
      actorUserId: actorId,
      action: 'update',
      entityType: 'invitation',
      entityId: inv.id,
      before: snapshot(inv),
      after: snapshot(after),
    });
  });
}

export interface InvitationDetails {
  projectId: string;
  projectName: string;
  role: ProjectRole;
  email: string;
  expiresAt: string;
  invitedBy: { login: string; displayName: string | null } | null;
}

/** Find a usable invitation for this user by the secret in the link, or say precisely why not. */
async function usableInvitation(db: Knex | Knex.Transaction, user: User, secret: string, lock: boolean): Promise<Invitation> {
  const query = Invitation.query(db).findOne({ tokenHash: hashSecret(secret) });
  const inv = await (lock ? query.forUpdate() : query);
  if (!inv)
    throw new NotFoundError('This invitation link is not valid. Check that the whole link was copied, or ask for a new invitation.');
  if (inv.acceptedAt)
    throw new InvitationGoneError(
      'This invitation has already been used. Each link works once; ask a project owner for a new one if you still need access.',
      'invitation-used',
    );
  if (inv.revokedAt) throw new InvitationGoneError('This invitation was withdrawn by a project owner.', 'invitation-revoked');
  if (new Date(inv.expiresAt).getTime() <= Date.now()) {
    throw new InvitationGoneError(
      `This invitation expired on ${new Date(inv.expiresAt).toUTCString()}. Ask a project owner to invite you again.`,
      'invitation-expired',
    );
  }
  if (!user.email || user.email.toLowerCase() !== inv.email) {
    throw new WrongAccountError(
      `This invitation was sent to ${maskEmail(inv.email)}, but you are signed in as ${user.login}${user.email ? ` (${user.email})` : ' with no e-mail address'}. Sign out and sign in with the invited account.`,
    );
  }
  return inv;
}

export async function describeInvitation(db: Knex, user: User, secret: string): Promise<InvitationDetails> {
  const inv = await usableInvitation(db, user, secret, false);
  const project = await Project.query(db).findById(inv.projectId).throwIfNotFound();
  const inviter = inv.invitedBy ? await db('users').where({ id: inv.invitedBy }).first('login', 'displayName') : null;
  return {
    projectId: inv.projectId,
    projectName: project.name,
    role: inv.role,
    email: inv.email,
    expiresAt: new Date(inv.expiresAt).toISOString(),
    invitedBy: inviter ? { login: inviter.login, displayName: inviter.displayName } : null,
  };
}

/** Accept: the user joins with the invited role, and the link is spent, in one transaction. */
export async function acceptInvitation(db: Knex, user: User, secret: string): Promise<{ projectId: string; role: ProjectRole }> {
  return db.transaction(async (trx) => {
    const inv = await usableInvitation(trx, user, secret, true);
    const already = await ProjectMember.query(trx).findById([inv.projectId, user.id]);
    if (already) throw new ConflictError(`You are already a member of this project (as ${already.role}).`, { code: 'already-member' });
    const member = { projectId: inv.projectId, userId: user.id, role: inv.role };
    await ProjectMember.query(trx).insert(member);
    const after = await Invitation.query(trx).patchAndFetchById(inv.id, { acceptedAt: new Date(), acceptedBy: user.id });
    await recordAudit(trx, {
      projectId: inv.projectId,
      actorUserId: user.id,
      action: 'create',
      entityType: 'project_member',
      entityId: user.id,
      before: null,
      after: member,
    });
    await recordAudit(trx, {
      projectId: inv.projectId,
      actorUserId: user.id,
      action: 'update',
      entityType: 'invitation',
      entityId: inv.id,
      before: snapshot(inv),
      after: snapshot(after),
    });
    return { projectId: inv.projectId, role: inv.role };
  });
}
