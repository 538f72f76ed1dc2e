import { afterAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import '../../api/db/pg-types';
import { createKnex, migrateLatest } from '../../api/db/knex';
import { seedDemo } from '../../api/db/seed';
import { DEMO_CAMPAIGNS, DEMO_CAMPAIGN_PROJECT_ID } from '../../api/db/demo-campaigns';
import { DEMO_ALDOL_CAMPAIGN_ID } from '../../api/db/seed-plans';

// A database of its own, so the demo rows never meet other test files' rows.
const baseUrl = process.env.DATABASE_URL ?? '';
const dbName = `eyrie_seed_campaigns_${process.pid}`;

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

describe('demo campaigns seed', () => {
  it('when seeded twice, then the four invented screens exist once, with their break and censored points, and a user edit survives', async () => {
    await admin(`drop database if exists "${dbName}"`);
    await admin(`create database "${dbName}"`);
    const url = new URL(baseUrl);
    url.pathname = `/${dbName}`;
    const knex = createKnex(url.toString(), { min: 0, max: 2 });
    try {
      await migrateLatest(knex);
      await seedDemo(knex);
      const campaigns = await knex('campaigns').where({ projectId: DEMO_CAMPAIGN_PROJECT_ID }).orderBy('title').select('id', 'title');
      expect(campaigns.map((c) => c.title).sort()).toEqual(DEMO_CAMPAIGNS.map((c) => c.title).sort());
      const counts = async () =>
        Object.fromEntries(
          (await knex('measurements').groupBy('campaignId').select('campaignId', knex.raw('count(*)::int as n'))).map((r) => [
            r.campaignId,
            r.n,
          ]),
        );
      expect(await counts()).toEqual({
        [DEMO_CAMPAIGNS[0].id]: 12,
        [DEMO_CAMPAIGNS[1].id]: 9,
        [DEMO_CAMPAIGNS[2].id]: 10,
        [DEMO_CAMPAIGNS[3].id]: 5,
        [DEMO_ALDOL_CAMPAIGN_ID]: 12,
      });

      // The low-temperature screen carries ≥ 99.8 % ee lower bounds at −60 °C only.
      const bounds = await knex('measurements')
        .where({ campaignId: DEMO_CAMPAIGNS[2].id, isLowerBound: true })
        .select('temperatureK', 'value');
      expect(bounds).toEqual([
        { temperatureK: 213.15, value: 99.8 },
        { temperatureK: 213.15, value: 99.8 },
      ]);
      // The Merlin screen peaks inside the range (a break), not at an end.
      const merlin = await knex('measurements')
        .where({ campaignId: DEMO_CAMPAIGNS[1].id })
        .orderBy('temperatureK')
        .select('temperatureK', 'value');
      const best = merlin.reduce((a, b) => (b.value > a.value ? b : a));
      expect(best.temperatureK).toBeGreaterThan(merlin[0].temperatureK);
      expect(best.temperatureK).toBeLessThan(merlin[merlin.length - 1].temperatureK);

      // The dr screen is stored as dr (r:1), rising on cooling.
      const dr = await knex('campaigns').where({ id: DEMO_CAMPAIGNS[3].id }).first('measure');
      expect(dr.measure).toBe('dr');
      const drRuns = await knex('measurements')
        .where({ campaignId: DEMO_CAMPAIGNS[3].id })
        .orderBy('temperatureK')
        .select('measure', 'value');
      expect(drRuns.every((r) => r.measure === 'dr')).toBe(true);
      expect(drRuns[0].value).toBeGreaterThan(drRuns[drRuns.length - 1].value);

      // Someone removes a point; seeding again neither restores it nor duplicates anything.
      const victim = await knex('measurements').where({ campaignId: DEMO_CAMPAIGNS[0].id }).first('id');
      await knex('measurements').where({ id: victim.id }).delete();
      await seedDemo(knex);
      expect(await counts()).toEqual({
        [DEMO_CAMPAIGNS[0].id]: 11,
        [DEMO_CAMPAIGNS[1].id]: 9,
        [DEMO_CAMPAIGNS[2].id]: 10,
        [DEMO_CAMPAIGNS[3].id]: 5,
        [DEMO_ALDOL_CAMPAIGN_ID]: 12,
      });
      expect(await knex('audit_events').where({ entityType: 'campaign' }).count({ n: '*' }).first()).toEqual({ n: 4 });
    } finally {
      await knex.destroy();
    }
  });
});
