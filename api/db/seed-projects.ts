import type { Knex } from 'knex';
import { recordAudit } from '../lib/audit';
import { DEMO_PROJECTS } from './demo';

/**
 * The invented demo projects and who holds which role in them, so a newcomer
 * can sign in as each demo person and see the difference. A project that
 * already exists is left as it is (people may have changed it since).
 */
export async function seedDemoProjects(trx: Knex.Transaction): Promise<void> {
  for (const project of DEMO_PROJECTS) {
    const exists = await trx('projects').where({ id: project.id }).first('id');
    if (exists) continue;
    const people = await trx('users')
      .where({ provider: 'local-demo' })
      .whereIn(
        'login',
        project.members.map((m) => m.login),
      )
      .select('id', 'login');
    const idOf = new Map(people.map((p) => [p.login as string, p.id as string]));
    const owner = idOf.get(project.members.find((m) => m.role === 'owner')!.login)!;
    const fields = { id: project.id, name: project.name, description: project.description };
    await trx('projects').insert({ ...fields, createdBy: owner });
    await recordAudit(trx, {
      projectId: project.id,
      actorUserId: owner,
      action: 'create',
      entityType: 'project',
      entityId: project.id,
      before: null,
      after: fields,
    });
    for (const m of project.members) {
      const member = { projectId: project.id, userId: idOf.get(m.login)!, role: m.role };
      await trx('project_members').insert(member);
      await recordAudit(trx, {
        projectId: project.id,
        actorUserId: owner,
        action: 'create',
        entityType: 'project_member',
        entityId: member.userId,
        before: null,
        after: member,
      });
    }
  }
}
