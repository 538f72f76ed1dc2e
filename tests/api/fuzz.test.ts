import { afterAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { closeReadPool } from '../../api/features/imports/parse-pool';
import { testKnex } from '../support/db';
import { fuzzProperty, makeWorld, nulExamples } from '../support/fuzz';

afterAll(() => closeReadPool());

// `npm run fuzz` sets EYRIE_FUZZ_RUNS (10 000 by default) and EYRIE_FUZZ_SEED; `npm test` runs 200 cases, seed 20261202.
const runs = Number(process.env.EYRIE_FUZZ_RUNS || 200);
const seed = Number(process.env.EYRIE_FUZZ_SEED || 20261202);

describe('fuzz of every write and compute route', () => {
  it(
    `when ${runs} random or mutated requests are sent (seed ${seed}), then none is a 5xx and no refused write changes a row`,
    async () => {
      const world = await makeWorld(testKnex());
      // Every non-GET route of the API is in play, uploads included.
      expect(world.routes.length).toBeGreaterThan(20);
      const tally = new Map<number, number>();
      const started = Date.now();
      await fc.assert(fuzzProperty(world, tally), { numRuns: runs, seed, endOnFailure: true, examples: nulExamples(world) });
      if (process.env.EYRIE_FUZZ_RUNS) {
        const byStatus = Object.fromEntries([...tally.entries()].sort(([a], [b]) => a - b));
        console.log(
          `FUZZ ${JSON.stringify({ runs, seed, routes: world.routes.length, seconds: Math.round((Date.now() - started) / 1000), byStatus })}`,
        );
      }
      // The fuzz reached both sides: accepted writes and refusals.
      const statuses = [...tally.keys()];
      expect(statuses.some((s) => s < 300)).toBe(true);
      expect(statuses.some((s) => s >= 400)).toBe(true);
    },
    Math.max(30_000, runs * 200),
  );
});
