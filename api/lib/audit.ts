import type { Knex } from 'knex';

export interface AuditEventInput {
  projectId: string;
  actorUserId: string;
  action: 'create' | 'update' | 'delete';
  entityType: string;
  entityId: string;
  before: unknown;
  after: unknown;
  /** Why the person made the change, when they were asked (edits and deletes of measurements, reopening). */
  reason?: string | null;
  /** The campaign the change concerns, so a campaign's history is one query. */
  campaignId?: string | null;
}

/** Dates and other non-JSON values become their JSON form before they reach jsonb. */
function toJson(value: unknown): string | null {
  if (value === undefined || value === null) return null;
  return JSON.stringify(value);
}

/**
 * Record one change to project data. Pass the transaction that makes the change,
 * so the change and its history commit or roll back together.
 */
export async function recordAudit(db: Knex | Knex.Transaction, event: AuditEventInput): Promise<void> {
  await db('audit_events').insert({
    projectId: event.projectId,
    actorUserId: event.actorUserId,
    action: event.action,
    entityType: event.entityType,
    entityId: event.entityId,
    before: toJson(event.before),
    after: toJson(event.after),
    reason: event.reason ?? null,
    campaignId: event.campaignId ?? null,
  });
}
