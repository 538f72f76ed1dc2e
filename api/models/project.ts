import objection from 'objection';

export class Project extends objection.Model {
  static override tableName = 'projects';

  declare id: string;
  declare name: string;
  declare description: string;
  declare createdBy: string | null;
  declare version: number;
  declare createdAt: Date;
  declare updatedAt: Date;

  override $beforeUpdate() {
    this.updatedAt = new Date();
  }
}
