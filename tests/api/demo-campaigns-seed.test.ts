import { afterAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../api/db/seed';
import { scratchDatabase } from '../support/db';
import { DEMO_CAMPAIGNS, DEMO_CAMPAIGN_PROJECT_ID } from '../../api/db/demo-campaigns';
import { DEMO_ALDOL_CAMPAIGN_ID } from '../../api/db/seed-plans';

// A database of its own, so the demo rows never meet other test files' rows.
const scratch = scratchDatabase('eyrie_seed_campaigns');

afterAll(scratch.drop);

describe('demo campaigns seed', () => {
  it('when seeded twice, then the four invented screens exist once, with their break and censored points, and a user edit survives', async () => {
    const knex = await scratch.create();
    try {
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
