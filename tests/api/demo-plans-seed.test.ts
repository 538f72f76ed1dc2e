import { afterAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import '../../api/db/pg-types';
import { createKnex, migrateLatest } from '../../api/db/knex';
import { seedDemo } from '../../api/db/seed';
import { DEMO_ALDOL_CAMPAIGN_ID, DEMO_FEASIBLE_PLAN_CAMPAIGN_ID } from '../../api/db/seed-plans';

// A database of its own, so the demo rows never meet other test files' rows.
const baseUrl = process.env.DATABASE_URL ?? '';
const dbName = `eyrie_seed_plans_${process.pid}`;

async function admin(sql: string) {
  const client = new pg.Client({ connectionString: baseUrl });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

afterAll(() => admin(`drop database if exists "${dbName}"`));

describe('demo plans seed', () => {
  it('when seeded twice, then one project has a feasible window and the other an infeasible one, each stored once', async () => {
    await admin(`drop database if exists "${dbName}"`);
    await admin(`create database "${dbName}"`);
    const url = new URL(baseUrl);
    url.pathname = `/${dbName}`;
    const knex = createKnex(url.toString(), { min: 0, max: 2 });
    try {
      await migrateLatest(knex);
      await seedDemo(knex);
      await seedDemo(knex);
      expect(await knex('plan_specifications').count({ n: '*' }).first()).toEqual({ n: 2 });
      const plans = await knex('campaign_plans').select('campaignId', 'result');
      expect(plans).toHaveLength(2);
      const feasible = plans.find((p) => p.campaignId === DEMO_FEASIBLE_PLAN_CAMPAIGN_ID)!.result;
      expect(feasible.recommended).not.toBeNull();
      expect(feasible.window.from.celsius).toBeLessThan(feasible.window.to.celsius);
      expect(feasible.specification).toMatchObject({ measure: 'ee', minimum: 99 });
      const infeasible = plans.find((p) => p.campaignId === DEMO_ALDOL_CAMPAIGN_ID)!.result;
      expect(infeasible.recommended).toBeNull();
      expect(infeasible.binding).toEqual(expect.arrayContaining(['jacket', 'specification']));
      expect(infeasible.conflict.message).toMatch(/specification needs ≤ .*jacket allows ≥ 243.15 K \(−30\.0 °C\)/);
      expect(infeasible.specification).toMatchObject({ measure: 'dr', minimum: 20 });
    } finally {
      await knex.destroy();
    }
  });
});
