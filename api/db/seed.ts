import type { Knex } from 'knex';
import { DEMO_IDENTITIES, DEMO_PROJECTS } from './demo';
import { seedDemoProjects } from './seed-projects';
import { seedDemoCampaigns } from './seed-campaigns';
import { DEMO_CAMPAIGNS } from './demo-campaigns';
import { seedDemoPlans } from './seed-plans';

/**
 * Seed the invented demo scenario. Idempotent: running it twice changes
 * nothing the first run made, and never touches rows users created.
 */
export async function seedDemo(knex: Knex): Promise<{ users: number; projects: number; campaigns: number }> {
  return knex.transaction(async (trx) => {
    for (const who of DEMO_IDENTITIES) {
      await trx('users')
        .insert({ provider: 'local-demo', providerUserId: who.id, login: who.login, displayName: who.name, email: who.email })
        .onConflict(['provider', 'provider_user_id'])
        .ignore();
    }
    await seedDemoProjects(trx);
    await seedDemoCampaigns(trx);
    await seedDemoPlans(trx);
    return { users: DEMO_IDENTITIES.length, projects: DEMO_PROJECTS.length, campaigns: DEMO_CAMPAIGNS.length };
  });
}
