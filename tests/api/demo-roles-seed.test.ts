import { afterAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../api/db/seed';
import { DEMO_PROJECTS } from '../../api/db/demo';
import { closeTestKnex, testKnex } from '../support/db';

afterAll(closeTestKnex);

describe('demo seed: people and roles', () => {
  it('when seeded twice, then each invented person holds the intended role and nothing is duplicated', async () => {
    const knex = testKnex();
    await seedDemo(knex);
    await seedDemo(knex);
    const [hydrogenation, aldol] = DEMO_PROJECTS;
    const roles = async (projectId: string) =>
      Object.fromEntries(
        (
          await knex('project_members as m')
            .join('users as u', 'u.id', 'm.userId')
            .where('m.projectId', projectId)
            .where('u.provider', 'local-demo')
            .select('u.login', 'm.role')
        ).map((r) => [r.login, r.role]),
      );
    expect(await roles(hydrogenation.id)).toEqual({ 'ada-pemberton': 'owner', 'tomas-reyes': 'editor', 'mina-okafor': 'viewer' });
    expect(await roles(aldol.id)).toEqual({ 'jun-whitlock': 'owner', 'ada-pemberton': 'viewer' });
    const created = await knex('audit_events').where({ projectId: hydrogenation.id, entityType: 'project', action: 'create' });
    expect(created).toHaveLength(1);
  });
});
