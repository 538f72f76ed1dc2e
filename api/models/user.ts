import objection from 'objection';

export class User extends objection.Model {
  static override tableName = 'users';

  declare id: string;
  declare provider: string;
  declare providerUserId: string;
  declare login: string;
  declare displayName: string | null;
  declare email: string | null;
  declare avatarUrl: string | null;
  declare createdAt: Date;
  declare updatedAt: Date;

  override $beforeUpdate() {
    this.updatedAt = new Date();
  }
}
