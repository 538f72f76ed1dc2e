import type { Knex } from 'knex';

export interface AuditEventView {
  id: number;
  at: string;
  action: 'create' | 'update' | 'delete';
  entityType: string;
  entityId: string;
  actor: { id: string; login: string; displayName: string | null } | null;
  before: unknown;
  after: unknown;
}

/** An audit row with its actor's names. */
export interface AuditRow {
  id: number;
  createdAt: Date;
  action: AuditEventView['action'];
  entityType: string;
  entityId: string;
  before: unknown;
  after: unknown;
  reason: string | null;
  campaignId: string | null;
  actorUserId: string | null;
  /** Present whenever actorUserId is (an account's removal clears actorUserId too). */
  login: string;
  displayName: string | null;
}

/**
 * The audit rows of a project, or of one of its campaigns, newest first: `limit + 1` of them before the event id `before`,
 * so the caller can tell whether another page follows.
 */
export function auditRowsPage(
  db: Knex,
  scope: { projectId: string; campaignId?: string },
  page: { limit: number; before?: number },
): Promise<AuditRow[]> {
  return db('audit_events as e')
    .leftJoin('users as u', 'u.id', 'e.actorUserId')
    .where('e.projectId', scope.projectId)
    .modify((q) => {
      if (scope.campaignId) q.where('e.campaignId', scope.campaignId);
      if (page.before !== undefined) q.where('e.id', '<', page.before);
    })
    .orderBy('e.id', 'desc')
    .limit(page.limit + 1)
    .select(
      'e.id',
      'e.createdAt',
      'e.action',
      'e.entityType',
      'e.entityId',
      'e.before',
      'e.after',
      'e.reason',
      'e.campaignId',
      'e.actorUserId',
      'u.login',
      'u.displayName',
    );
}

/** A project's history, newest first, in pages of `limit` before the event id `before`. */
export async function listAuditEvents(
  db: Knex,
  projectId: string,
  page: { limit: number; before?: number },
): Promise<{ events: AuditEventView[]; nextBefore: number | null }> {
  const rows = await auditRowsPage(db, { projectId }, page);
  const more = rows.length > page.limit;
  const events = rows.slice(0, page.limit).map((r: AuditRow): AuditEventView => ({
    id: r.id,
    at: new Date(r.createdAt).toISOString(),
    action: r.action,
    entityType: r.entityType,
    entityId: r.entityId,
    actor: r.actorUserId ? { id: r.actorUserId, login: r.login, displayName: r.displayName } : null,
    before: r.before,
    after: r.after,
  }));
  return { events, nextBefore: more ? events[events.length - 1].id : null };
}
