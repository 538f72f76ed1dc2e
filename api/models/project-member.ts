import objection from 'objection';
import type { ProjectRole } from './enums';

export class ProjectMember extends objection.Model {
  static override tableName = 'project_members';
  static override idColumn = ['projectId', 'userId'];

  declare projectId: string;
  declare userId: string;
  declare role: ProjectRole;
  declare createdAt: Date;
  declare updatedAt: Date;

  override $beforeUpdate() {
    this.updatedAt = new Date();
  }
}
