import { afterAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../api/db/seed';
import { scratchDatabase } from '../support/db';
import { DEMO_ALDOL_CAMPAIGN_ID, DEMO_FEASIBLE_PLAN_CAMPAIGN_ID } from '../../api/db/seed-plans';

// A database of its own, so the demo rows never meet other test files' rows.
const scratch = scratchDatabase('eyrie_seed_plans');

afterAll(scratch.drop);

describe('demo plans seed', () => {
  it('when seeded twice, then one project has a feasible window and the other an infeasible one, each stored once', async () => {
    const knex = await scratch.create();
    try {
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
