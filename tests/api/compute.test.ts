import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import fc from 'fast-check';
import jStat from 'jstat';
import { SimpleLinearRegression } from 'ml-regression-simple-linear';
import { testApp } from '../support/app';
import { closeTestKnex } from '../support/db';

afterAll(closeTestKnex);

// Exact SI: R = N_A·k_B (CODATA 2018 [S]); thermochemical calorie 4.184 J (NIST SP 811 [S]).
const R = 6.02214076e23 * 1.380649e-23;
const C = (value: number) => ({ value, unit: 'C' as const });

const relClose = (actual: number, expected: number, rel: number) =>
  expect(Math.abs(actual - expected) / Math.abs(expected)).toBeLessThan(rel);

describe('POST /api/v1/forecast', () => {
  it('when ΔΔG‡ = 1.000 kcal/mol at 298.15 K, then r = 5.408 and ee = 68.79 % there', async () => {
    const { app } = testApp();
    const res = await request(app)
      .post('/api/v1/forecast')
      .send({
        basis: { kind: 'gap', ddG: { value: 1, unit: 'kcal/mol' }, temperature: { value: 298.15, unit: 'K' } },
        temperatures: { values: [{ value: 25, unit: 'C' }] },
      })
      .expect(200);
    const [p] = res.body.points;
    // [C] api/science/README.md §10: 1.000 kcal/mol → r = 5.408, ee = 68.79 % at 298.15 K.
    expect(p.ratio).toBeCloseTo(5.408, 3);
    expect(p.eePercent).toBeCloseTo(68.79, 2);
    expect(p.ddG['kJ/mol']).toBeCloseTo(4.184, 9);
    expect(res.body.assumptions.join(' ')).toMatch(/ΔΔS‡ assumed 0/);
    expect(res.body.convention).toMatch(/TS→B/);
    // Every answer that suggests a temperature carries the safety caution (product safety brief).
    expect(res.body.caution).toMatch(/calorimetry/);
  });

  it('when an observed 90 % ee at 25 °C is the basis, then ΔΔG‡ = 1.745 kcal/mol and cooling raises ee', async () => {
    const { app } = testApp();
    const res = await request(app)
      .post('/api/v1/forecast')
      .send({
        basis: { kind: 'observed', selectivity: { measure: 'ee', value: 90 }, temperature: C(25) },
        temperatures: { from: C(-40), to: C(25), count: 14 },
      })
      .expect(200);
    const pts = res.body.points;
    expect(pts).toHaveLength(14);
    // [C] api/science/README.md §10: ee 90 % needs 1.745 kcal/mol at 298.15 K.
    expect(pts[13].ddG['kcal/mol']).toBeCloseTo(1.745, 3);
    expect(pts[13].eePercent).toBeCloseTo(90, 9);
    for (let i = 1; i < pts.length; i++) expect(pts[i].eePercent).toBeLessThan(pts[i - 1].eePercent);
  });

  it('when ΔΔH‡ and ΔΔS‡ have the same sign, then the zero-selectivity temperature is ΔΔH‡/ΔΔS‡', async () => {
    const { app } = testApp();
    const res = await request(app)
      .post('/api/v1/forecast')
      .send({
        basis: { kind: 'activation', ddH: { value: 12, unit: 'kJ/mol' }, ddS: { value: 30, unit: 'J/(mol*K)' } },
        temperatures: { values: [{ value: 400, unit: 'K' }] },
      })
      .expect(200);
    // [C] T₀ = 12000 / 30 = 400 K, where r = 1 (api/science/README.md §4).
    expect(res.body.zeroSelectivity.kelvin).toBeCloseTo(400, 9);
    expect(res.body.points[0].ratio).toBeCloseTo(1, 12);
  });

  it('when er is given as "a:b" or as a number, then both mean r = a/b', async () => {
    const { app } = testApp();
    const body = (value: string | number) => ({
      basis: { kind: 'observed', selectivity: { measure: 'er', value }, temperature: C(0) },
      temperatures: { values: [C(0)] },
    });
    const a = await request(app).post('/api/v1/forecast').send(body('95:5')).expect(200);
    const b = await request(app).post('/api/v1/forecast').send(body(19)).expect(200);
    expect(a.body.points[0].ratio).toBeCloseTo(19, 10);
    expect(b.body.points[0].ratio).toBeCloseTo(19, 10);
  });

  it.each([
    ['a missing basis', { temperatures: { values: [C(0)] } }, 400, 'basis'],
    [
      'an unknown energy unit',
      { basis: { kind: 'gap', ddG: { value: 1, unit: 'eV' }, temperature: C(0) }, temperatures: { values: [C(0)] } },
      400,
      'basis.ddG.unit',
    ],
    [
      'a temperature below absolute zero',
      { basis: { kind: 'gap', ddG: { value: 1, unit: 'kJ/mol' }, temperature: C(-300) }, temperatures: { values: [C(0)] } },
      422,
      'basis.temperature.value',
    ],
    [
      '0 K in the list',
      {
        basis: { kind: 'gap', ddG: { value: 1, unit: 'kJ/mol' }, temperature: C(0) },
        temperatures: { values: [C(0), { value: 0, unit: 'K' }] },
      },
      422,
      'temperatures.values.1.value',
    ],
    [
      'ee above 100',
      { basis: { kind: 'observed', selectivity: { measure: 'ee', value: 101 }, temperature: C(0) }, temperatures: { values: [C(0)] } },
      400,
      'basis.selectivity.value',
    ],
    [
      'a ratio of zero',
      { basis: { kind: 'observed', selectivity: { measure: 'ratio', value: 0 }, temperature: C(0) }, temperatures: { values: [C(0)] } },
      400,
      'basis.selectivity.value',
    ],
    [
      '"NaN" as a number',
      { basis: { kind: 'gap', ddG: { value: 'NaN', unit: 'kJ/mol' }, temperature: C(0) }, temperatures: { values: [C(0)] } },
      400,
      'basis.ddG.value',
    ],
    [
      'over 5000 temperatures',
      {
        basis: { kind: 'gap', ddG: { value: 1, unit: 'kJ/mol' }, temperature: C(0) },
        temperatures: { from: C(0), to: C(10), count: 5001 },
      },
      400,
      'temperatures',
    ],
  ])('when the body has %s, then the answer is %i naming %s', async (_what, body, status, path) => {
    const { app } = testApp();
    const res = await request(app).post('/api/v1/forecast').send(body).expect(status);
    expect(res.headers['content-type']).toMatch(/problem\+json/);
    expect(res.body.errors.map((e: { path: string }) => e.path).some((p: string) => p.startsWith(path))).toBe(true);
  });
});

// An invented screen for the tests (not measured data): ee at five temperatures.
const screen = [
  [-40, 97.9],
  [-20, 96.1],
  [0, 93.4],
  [20, 89.8],
  [40, 84.9],
];
const screenBody = (extra: object = {}) => ({
  measurements: screen.map(([t, ee]) => ({ temperature: C(t), selectivity: { measure: 'ee', value: ee } })),
  ...extra,
});

describe('POST /api/v1/fit', () => {
  it('when a five-point screen is fitted, then slope, ΔΔH‡, ΔΔS‡ and their CIs agree with independent libraries', async () => {
    const { app } = testApp();
    const res = await request(app)
      .post('/api/v1/fit')
      .send(screenBody({ predict: [C(-30)] }))
      .expect(200);
    const x = screen.map(([t]) => 1 / (t + 273.15));
    const y = screen.map(([, ee]) => Math.log((100 + ee) / (100 - ee)));
    // Independent regression: ml-regression-simple-linear (npm).
    const ref = new SimpleLinearRegression(x, y);
    relClose(res.body.slope, ref.slope, 1e-9);
    relClose(res.body.intercept, ref.intercept, 1e-9);
    relClose(res.body.ddH['kJ/mol'], (R * ref.slope) / 1000, 1e-9);
    relClose(res.body.ddS['J/(mol*K)'], -R * ref.intercept, 1e-9);
    // Textbook OLS standard error of the slope, with jstat's Student-t quantile (independent library).
    const n = x.length;
    const xm = x.reduce((a, b) => a + b) / n;
    const sxx = x.reduce((a, v) => a + (v - xm) ** 2, 0);
    const ss = y.reduce((a, v, i) => a + (v - ref.predict(x[i]!)) ** 2, 0);
    const s2 = ss / (n - 2);
    const seSlope = Math.sqrt(s2 / sxx);
    relClose(res.body.ddH.se['kJ/mol'], (R * seSlope) / 1000, 1e-8);
    const t = jStat.studentt.inv(0.975, n - 2);
    relClose(res.body.ddH.ci['kJ/mol'][1], (R * (ref.slope + t * seSlope)) / 1000, 1e-6);
    // Prediction interval for a new run at −30 °C: ŷ ± t·s·√(1 + 1/n + (x₀ − x̄)²/Sxx) (api/science/README.md §3 [S]).
    const x0 = 1 / 243.15;
    const y0 = ref.predict(x0);
    const half = t * Math.sqrt(s2 * (1 + 1 / n + (x0 - xm) ** 2 / sxx));
    const [pred] = res.body.predictions;
    const eeOf = (v: number) => 100 * Math.tanh(v / 2);
    relClose(pred.predictionInterval.eePercent[0], eeOf(y0 - half), 1e-6);
    relClose(pred.predictionInterval.eePercent[1], eeOf(y0 + half), 1e-6);
    expect(pred.confidenceInterval.eePercent[0]).toBeGreaterThan(pred.predictionInterval.eePercent[0]);
    expect(res.body.correlation).toBeGreaterThan(0.95);
    expect(res.body.caution).toMatch(/process-safety review/);
    expect(res.body.twoBranch).toMatchObject({ checked: false, preferred: 'one-line', claim: null });
  });

  it('when only two runs are given, then the line is exact, intervals are absent and a warning says so', async () => {
    const { app } = testApp();
    const res = await request(app)
      .post('/api/v1/fit')
      .send({
        measurements: screen.slice(0, 2).map(([t, ee]) => ({ temperature: C(t), selectivity: { measure: 'ee', value: ee } })),
        predict: [C(0)],
      })
      .expect(200);
    expect(res.body.ddH.se).toBeNull();
    expect(res.body.predictions[0].predictionInterval).toBeNull();
    expect(res.body.warnings.map((w: { code: string }) => w.code)).toContain('two-points-exact');
  });

  it('when a run is at 99.9 % ee, then it is kept out of the fit as a lower bound and reported', async () => {
    const { app } = testApp();
    const body = screenBody();
    body.measurements.push({ temperature: C(-78), selectivity: { measure: 'ee', value: 99.9 } });
    const res = await request(app).post('/api/v1/fit').send(body).expect(200);
    const censored = res.body.residuals.find((r: { status: string }) => r.status === 'censored');
    expect(censored.flags.join(' ')).toMatch(/lower-bound/);
    expect(res.body.n).toBe(5);
    expect(res.body.warnings.map((w: { code: string }) => w.code)).toContain('censored-points');
  });

  it('when all runs share one temperature, then 422 explains that two temperatures are needed', async () => {
    const { app } = testApp();
    const res = await request(app)
      .post('/api/v1/fit')
      .send({ measurements: [90, 91, 92].map((ee) => ({ temperature: C(0), selectivity: { measure: 'ee', value: ee } })) })
      .expect(422);
    expect(res.body.detail).toMatch(/two or more distinct temperatures/);
  });

  it('when weighting by uncertainty, then the weights come from the assay SD propagated to ln r', async () => {
    const { app } = testApp();
    const res = await request(app)
      .post('/api/v1/fit')
      .send({
        measurements: screen.map(([t, ee], i) => ({
          temperature: C(t),
          selectivity: { measure: 'ee', value: ee },
          uncertainty: i === 0 ? 2 : 0.3,
        })),
        weighting: 'uncertainty',
      })
      .expect(200);
    // Reference WLS by hand: w = 1/σ(ln r)², σ(ln r) = 2σ_ee/(1 − ee²) (api/science/README.md §3 [S]).
    const pts = screen.map(([t, ee], i) => {
      const e = ee / 100;
      const s = (2 * ((i === 0 ? 2 : 0.3) / 100)) / (1 - e * e);
      return { x: 1 / (t + 273.15), y: Math.log((1 + e) / (1 - e)), w: 1 / (s * s) };
    });
    const sw = pts.reduce((a, p) => a + p.w, 0);
    const xw = pts.reduce((a, p) => a + p.w * p.x, 0) / sw;
    const yw = pts.reduce((a, p) => a + p.w * p.y, 0) / sw;
    const slope = pts.reduce((a, p) => a + p.w * (p.x - xw) * (p.y - yw), 0) / pts.reduce((a, p) => a + p.w * (p.x - xw) ** 2, 0);
    relClose(res.body.slope, slope, 1e-9);
    expect(res.body.weighting).toBe('uncertainty');
  });

  it('when a measurement has a bad selectivity, then the error names that row', async () => {
    const { app } = testApp();
    const body = screenBody();
    body.measurements[3]!.selectivity = { measure: 'ee', value: 100 };
    const res = await request(app).post('/api/v1/fit').send(body).expect(400); // the same status as a campaign run with ee = 100 (one check in api/science/quantities.ts)
    expect(res.body.errors[0].path).toBe('measurements.3.selectivity.value');
  });

  it('when over 5000 measurements are sent, then 400 names the field', async () => {
    const { app } = testApp();
    const m = { temperature: C(0), selectivity: { measure: 'ee', value: 90 } };
    const res = await request(app)
      .post('/api/v1/fit')
      .send({ measurements: Array(5001).fill(m) })
      .expect(400);
    expect(res.body.errors[0].path).toBe('measurements');
  });
});

describe('the computation API never answers 500', () => {
  it('when arbitrary JSON is posted to forecast and fit, then every answer is 2xx or 4xx', async () => {
    const { app } = testApp();
    // Property test (fast-check): random JSON values and near-valid bodies with random numbers.
    const nearValid = fc.record({
      basis: fc.record({
        kind: fc.constantFrom('activation', 'gap', 'observed', 'x'),
        ddH: fc.record({ value: fc.double(), unit: fc.constantFrom('kJ/mol', 'kcal/mol') }),
        ddS: fc.record({ value: fc.double(), unit: fc.constantFrom('J/(mol*K)', 'cal/(mol*K)') }),
        ddG: fc.record({ value: fc.double(), unit: fc.constantFrom('kJ/mol', 'J/mol') }),
        selectivity: fc.record({
          measure: fc.constantFrom('ee', 'er', 'dr', 'percentA', 'ratio'),
          value: fc.oneof(fc.double(), fc.string()),
        }),
        temperature: fc.record({ value: fc.double(), unit: fc.constantFrom('K', 'C', 'F') }),
      }),
      temperatures: fc.record({
        values: fc.array(fc.record({ value: fc.double(), unit: fc.constantFrom('K', 'C', 'F') }), { maxLength: 4 }),
      }),
    });
    await fc.assert(
      fc.asyncProperty(fc.oneof(fc.jsonValue(), nearValid), fc.constantFrom('/api/v1/forecast', '/api/v1/fit'), async (body, path) => {
        const res = await request(app)
          .post(path)
          .set('content-type', 'application/json')
          .send(JSON.stringify(body ?? null));
        expect(res.status).toBeLessThan(500);
      }),
      { numRuns: 150 },
    );
  });
});

describe('GET /api/v1/openapi.json', () => {
  it('when fetched, then it is OpenAPI 3.1 generated from the schemas and lists the computation endpoints', async () => {
    const { app } = testApp();
    const res = await request(app).get('/api/v1/openapi.json').expect(200);
    expect(res.body.openapi).toBe('3.1.0');
    expect(Object.keys(res.body.paths)).toEqual(expect.arrayContaining(['/api/v1/forecast', '/api/v1/fit']));
    expect(res.body.components.schemas.ForecastRequest).toBeDefined();
    expect(res.body.components.schemas.Temperature.properties.unit).toBeDefined();
  });
});
