import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import jStat from 'jstat';
import { testApp } from '../support/app';
import { closeTestKnex } from '../support/db';

afterAll(closeTestKnex);

// Invented screen [C]: ΔΔH‡ = 12 kJ/mol, ΔΔS‡ = 10 J/(mol·K), five temperatures in duplicate, fixed scatter.
const R = 6.02214076e23 * 1.380649e-23; // CODATA 2018 [S]
const lnR = (t: number) => 12_000 / (R * t) - 10 / R;
const NOISE = [0.04, -0.03, 0.02, -0.05, 0.03, -0.01, 0.05, -0.02, 0.01, -0.04];
const TEMPS_C = [-60, -60, -40, -40, -20, -20, 0, 0, 20, 20];
const eeOf = (y: number) => 100 * Math.tanh(y / 2);
const measurements = TEMPS_C.map((c, i) => ({
  temperature: { value: c, unit: 'C' as const },
  selectivity: { measure: 'ee' as const, value: eeOf(lnR(c + 273.15) + NOISE[i]!) },
}));
// Invented main reaction [C]: ΔH‡ = 55 kJ/mol, ΔS‡ = −100 J/(mol·K), first order.
const kTrue = (t: number) => 2.083661912e10 * t * Math.exp(-100 / R) * Math.exp(-55_000 / (R * t));
const rateRuns = [-40, -20, 0, 20].map((c, i) => {
  const hours = [20, 6, 1, 0.25][i]!;
  return {
    temperature: { value: c, unit: 'C' as const },
    time: { value: hours, unit: 'h' as const },
    conversionPercent: 100 * (1 - Math.exp(-kTrue(c + 273.15) * hours * 3600)),
  };
});
const body = (over: Record<string, unknown> = {}) => ({
  measurements,
  specification: { measure: 'ee', minimum: 98, probability: 0.95 },
  temperatures: { from: { value: -70, unit: 'C' }, to: { value: 40, unit: 'C' } },
  curvePoints: 23,
  ...over,
});
const post = (b: unknown) =>
  request(testApp().app)
    .post('/api/v1/plan')
    .send(b as object);

describe('POST /api/v1/plan', () => {
  it('when the specification can be met, then the warmest feasible temperature is recommended with its probability, rule and caution', async () => {
    const res = await post(
      body({
        at: [
          { value: -30, unit: 'C' },
          { value: 0, unit: 'C' },
        ],
      }),
    ).expect(200);
    const r = res.body;
    expect(r.recommended.rule).toBe('warmest');
    expect(r.rule.text).toMatch(/warmest/i);
    expect(r.recommended.probabilityMeetsSpec).toBeGreaterThanOrEqual(0.95);
    expect(r.recommended.probabilityMeetsSpec).toBeLessThan(0.9501);
    expect(r.recommended.celsius).toBeCloseTo(r.recommended.kelvin - 273.15, 9);
    expect(r.window.to.kelvin).toBeCloseTo(r.recommended.kelvin, 9);
    expect(r.window.from.celsius).toBeCloseTo(-70, 9);
    expect(r.binding.sort()).toEqual(['jacket', 'specification']);
    expect(r.curve).toHaveLength(23);
    expect(r.evaluations.map((e: { celsius: number }) => Math.round(e.celsius))).toEqual([-30, 0]);
    expect(r.evaluations[0].feasible).toBe(true);
    expect(r.evaluations[1].feasible).toBe(false);
    expect(r.evaluations[1].failing).toEqual(['specification']);
    expect(r.caution).toMatch(/calorimetry/);
    expect(r.convention).toMatch(/TS→B/);
    expect(r.model).toMatchObject({ kind: 'straight-line', n: 10, dof: 8 });
  });

  it('when evaluated at 0 °C, then the probability is the jstat Student t of the unweighted prediction (n − 2 dof)', async () => {
    const res = await post(body({ at: [{ value: 0, unit: 'C' }] })).expect(200);
    const fit = await request(testApp().app)
      .post('/api/v1/fit')
      .send({ measurements, predict: [{ value: 0, unit: 'C' }] })
      .expect(200);
    const p = fit.body.predictions[0];
    const [lo, hi] = p.predictionInterval.ratio.map(Math.log);
    const yHat = Math.log(p.ratio);
    const scale = (hi - lo) / 2 / jStat.studentt.inv(0.975, 8);
    // [C] P(ln r_new ≥ ln 99) with scale from the /fit prediction interval; jstat 1.9.6 is the independent t
    const expected = 1 - jStat.studentt.cdf((Math.log(99) - yHat) / scale, 8);
    expect(res.body.evaluations[0].probabilityMeetsSpec).toBeCloseTo(expected, 6);
  });

  it('when a rate, a time limit and a hold are given and conflict, then there is no recommendation and the answer says by how much', async () => {
    const res = await post(
      body({
        rate: { runs: rateRuns, targetConversionPercent: 95, maxTime: { value: 24, unit: 'h' } },
        hold: {
          barrier: { kind: 'activation', dH: { value: 85, unit: 'kJ/mol' }, dS: { value: -10, unit: 'J/(mol*K)' } },
          time: { value: 8, unit: 'h' },
          floorEePercent: 98.5,
        },
      }),
    ).expect(200);
    const r = res.body;
    expect(r.recommended).toBeNull();
    expect(r.window).toBeNull();
    expect(r.binding.sort()).toEqual(['hold', 'time']);
    expect(r.conflict.message).toMatch(/hold needs ≤ .*reaction time limit needs ≥/);
    expect(r.conflict.gapKelvin).toBeGreaterThan(0);
    expect(r.resolutions.join(' ')).toMatch(/More time/);
    expect(r.rate.dH['kJ/mol']).toBeCloseTo(55, 3); // [C] runs made exactly on the line
    expect(r.curve[0].timeToTarget.s).toBeGreaterThan(r.curve[22].timeToTarget.s);
    expect(r.curve.every((c: { eeAfterHold: number }) => c.eeAfterHold >= 0 && c.eeAfterHold < 100)).toBe(true);
    expect(r.curve[0].eeAfterHold).toBeGreaterThan(r.curve[22].eeAfterHold); // [C] warmer holds erode faster
  });

  it('when the coldest rule and next runs are asked for, then the time edge is recommended and the runs lie in the range', async () => {
    const res = await post(
      body({
        rule: 'coldest',
        rate: { runs: rateRuns, targetConversionPercent: 95, maxTime: { value: 24, unit: 'h' } },
        nextRuns: { count: 3 },
      }),
    ).expect(200);
    const r = res.body;
    expect(r.binding.sort()).toEqual(['specification', 'time']);
    expect(r.recommended.kelvin).toBeCloseTo(r.window.from.kelvin, 9);
    // [C] the time edge solves −ln(0.05)/k(T) = 24 h on the exact rate line
    expect(kTrue(r.recommended.kelvin) * 86_400).toBeCloseTo(-Math.log(0.05), 1);
    expect(r.nextRuns.temperatures).toHaveLength(3);
    expect(r.nextRuns.at.kelvin).toBeCloseTo(r.recommended.kelvin, 9);
    for (const t of r.nextRuns.temperatures) expect(t.celsius).toBeGreaterThanOrEqual(-70 - 1e-9);
    expect(r.nextRuns.halfWidthAfter).toBeLessThan(r.nextRuns.halfWidthBefore);
  });

  it('when a run stopped below the settable conversion, then it is flagged and a warning says why', async () => {
    const runs = [...rateRuns, { temperature: { value: -50, unit: 'C' }, time: { value: 1, unit: 'h' }, conversionPercent: 4 }];
    const res = await post(body({ rate: { runs, targetConversionPercent: 95, lowConversionPercent: 5 } })).expect(200);
    expect(res.body.rate.runs.map((x: { lowConversion: boolean }) => x.lowConversion)).toEqual([false, false, false, false, true]);
    expect(res.body.warnings.map((w: { code: string }) => w.code)).toContain('low-conversion-runs');
  });

  it.each([
    [
      'an ee specification above 100',
      body({ specification: { measure: 'ee', minimum: 100.5, probability: 0.95 } }),
      'specification.minimum',
    ],
    ['a dr specification below 1:1', body({ specification: { measure: 'dr', minimum: 0.8, probability: 0.95 } }), 'specification.minimum'],
    ['a probability of 0.5', body({ specification: { measure: 'ee', minimum: 98, probability: 0.5 } }), 'specification.probability'],
    ['a probability of 1', body({ specification: { measure: 'ee', minimum: 98, probability: 1 } }), 'specification.probability'],
    [
      'a range with from warmer than to',
      body({ temperatures: { from: { value: 20, unit: 'C' }, to: { value: 250, unit: 'K' } } }),
      'temperatures.to',
    ],
    [
      'a run at 0 % conversion',
      body({ rate: { runs: [{ ...rateRuns[0], conversionPercent: 0 }, rateRuns[1]], targetConversionPercent: 95 } }),
      'rate.runs.0.conversionPercent',
    ],
    [
      'a run at 100 % conversion',
      body({ rate: { runs: [rateRuns[0], { ...rateRuns[1], conversionPercent: 100 }], targetConversionPercent: 95 } }),
      'rate.runs.1.conversionPercent',
    ],
    ['a hold with no barrier', body({ hold: { time: { value: 2, unit: 'h' }, floorEePercent: 97 } }), 'hold.barrier'],
    [
      'second order without a concentration',
      body({ rate: { runs: rateRuns, order: 'second', targetConversionPercent: 95 } }),
      'rate.initial',
    ],
    ['no specification', { ...body(), specification: undefined }, 'specification'],
  ])('when the body has %s, then 400 names %s and nothing is computed', async (_label, b, path) => {
    const res = await post(b).expect(400);
    expect(res.headers['content-type']).toMatch(/problem\+json/);
    expect(res.body.errors.map((e: { path: string }) => e.path)).toContain(path);
  });

  it('when the screen has only two temperatures, then 422 says a probability needs three', async () => {
    const res = await post(body({ measurements: measurements.slice(0, 4) })).expect(422);
    expect(res.body.errors[0].path).toBe('measurements');
    expect(res.body.detail).toMatch(/three or more distinct temperatures/);
  });

  it('when a temperature in at is below absolute zero, then the error names that entry', async () => {
    const res = await post(
      body({
        at: [
          { value: 0, unit: 'C' },
          { value: -300, unit: 'C' },
        ],
      }),
    );
    expect(res.status).toBeGreaterThanOrEqual(400);
    expect(res.status).toBeLessThan(500);
    expect(res.body.errors[0].path).toBe('at.1.value');
  });

  it('when the API description is read, then the planner and its stored routes are described', async () => {
    const res = await request(testApp().app).get('/api/v1/openapi.json').expect(200);
    for (const p of [
      '/api/v1/plan',
      '/api/v1/campaigns/{campaignId}/plan',
      '/api/v1/campaigns/{campaignId}/specification',
      '/api/v1/projects/{projectId}/specification',
      '/api/v1/comparisons',
      '/api/v1/comparisons/{comparisonId}',
    ]) {
      expect(Object.keys(res.body.paths)).toContain(p);
    }
    expect(res.body.components.schemas.PlanRequest).toBeDefined();
  });
});
