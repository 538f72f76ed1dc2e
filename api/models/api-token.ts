import objection from 'objection';

export class ApiToken extends objection.Model {
  static override tableName = 'api_tokens';

  declare id: string;
  declare userId: string;
  declare name: string;
  declare tokenHash: string;
  declare prefix: string;
  declare expiresAt: Date;
  declare lastUsedAt: Date | null;
  declare revokedAt: Date | null;
  declare createdAt: Date;
}
