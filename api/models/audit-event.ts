import objection from 'objection';

export class AuditEvent extends objection.Model {
  static override tableName = 'audit_events';

  /** bigint, returned as a number by the pg type parser in db/pg-types. */
  declare id: number;
  declare projectId: string;
  declare actorUserId: string | null;
  declare action: 'create' | 'update' | 'delete';
  declare entityType: string;
  declare entityId: string;
  declare before: unknown;
  declare after: unknown;
  declare createdAt: Date;
}
