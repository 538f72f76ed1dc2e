import objection from 'objection';
import type { ProjectRole } from './enums';

export class Invitation extends objection.Model {
  static override tableName = 'invitations';

  declare id: string;
  declare projectId: string;
  declare email: string;
  declare role: ProjectRole;
  declare tokenHash: string;
  declare invitedBy: string | null;
  declare expiresAt: Date;
  declare acceptedAt: Date | null;
  declare acceptedBy: string | null;
  declare revokedAt: Date | null;
  declare createdAt: Date;
}
