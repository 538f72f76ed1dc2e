import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { fitResponseSchema } from '../../api/features/calculators/schemas';
import { testApp } from '../support/app';
import { closeTestKnex } from '../support/db';

afterAll(closeTestKnex);

const C = (value: number) => ({ value, unit: 'C' as const });
const K = (value: number) => ({ value, unit: 'K' as const });
/** ee (%) on ln r = 2200/T − 3.5 with a small invented zig-zag, as an assay would report it. */
const eeAt = (c: number, i: number) => Math.round(10_000 * Math.tanh((2200 / (c + 273.15) - 3.5 + (i % 2 ? 0.02 : -0.02)) / 2)) / 100;
const runs = (celsius: number[], extra: Record<string, unknown> = {}) =>
  celsius.map((c, i) => ({ temperature: C(c), selectivity: { measure: 'ee', value: eeAt(c, i) }, ...extra }));

const fit = async (body: Record<string, unknown>, status = 200) => {
  const { app } = testApp();
  const res = await request(app).post('/api/v1/fit').send(body);
  expect(res.status, JSON.stringify(res.body).slice(0, 400)).toBe(status);
  return res.body;
};
const forecast = async (body: Record<string, unknown>, status: number) => {
  const { app } = testApp();
  const res = await request(app).post('/api/v1/forecast').send(body);
  expect(res.status, JSON.stringify(res.body).slice(0, 400)).toBe(status);
  return res.body;
};
const paths = (body: { errors?: { path: string }[] }) => (body.errors ?? []).map((e) => e.path);

describe('POST /api/v1/fit: new-run interval, censored runs, flags', () => {
  it('when newRunUncertainty is given, then the prediction interval carries the assay error at the predicted ee and says where it came from', async () => {
    const base = { measurements: runs([-40, -20, 0, 20, 40]), predict: [C(-40)] };
    const plain = fitResponseSchema.parse(await fit(base));
    const withAssay = fitResponseSchema.parse(await fit({ ...base, newRunUncertainty: 0.2 }));
    expect(plain.newRun!.source).toBe('screen-scatter');
    expect(withAssay.newRun).toMatchObject({ source: 'assay', measure: 'ee', uncertainty: 0.2 });
    const p = withAssay.predictions[0]!;
    const ee = p.eePercent;
    // [C] σ_lnr = σ_ee·200/((100 − ee)(100 + ee)) at the predicted ee
    expect(p.newRunSigmaLnR!).toBeCloseTo((0.2 * 200) / ((100 - ee) * (100 + ee)), 8);
    const width = (q: typeof p) => q.predictionInterval!.lnRatio![1] - q.predictionInterval!.lnRatio![0];
    expect(width(p)).toBeGreaterThan(width(plain.predictions[0]!));
    expect(p.confidenceInterval).toEqual(plain.predictions[0]!.confidenceInterval);
  });

  it('when runs carry uncertainties and none is given for a new run, then their median is used', async () => {
    const ms = runs([-40, -20, 0, 20, 40]).map((m, i) => ({ ...m, uncertainty: [0.1, 0.3, 0.2, 0.5, 0.4][i] }));
    const body = fitResponseSchema.parse(await fit({ measurements: ms, predict: [C(0)] }));
    expect(body.newRun).toMatchObject({ source: 'assay', measure: 'ee', uncertainty: 0.3 });
    expect(body.newRun!.note).toMatch(/median/);
  });

  it('when a weighted fit is asked for, then χ²/dof and a plain verdict on the stated precision come back', async () => {
    const ms = runs([-40, -20, 0, 20, 40]).map((m) => ({ ...m, uncertainty: 0.01 }));
    const body = fitResponseSchema.parse(await fit({ measurements: ms, weighting: 'uncertainty', uncertaintyScale: 'absolute' }));
    expect(body.precisionCheck!.verdict).toBe('scatter-larger');
    expect(body.precisionCheck!.message).toMatch(/too narrow/);
    expect(body.precisionCheck!.pLarger).toBeGreaterThan(0); // from the upper tail itself, not 1 − cdf
    expect(fitResponseSchema.parse(await fit({ measurements: runs([-40, -20, 0, 20, 40]) })).precisionCheck).toBeNull();
  });

  it('when runs are bounds, then the estimator is censored ML with the least-squares fit without them labelled beside it', async () => {
    const ms = [
      ...runs([-20, 0, 20, 40]),
      { temperature: C(-60), selectivity: { measure: 'ee', value: 99.9, atLeast: true } },
      { temperature: C(-40), selectivity: { measure: 'ee', value: 99.85 } },
    ];
    const body = fitResponseSchema.parse(await fit({ measurements: ms }));
    expect(body.estimator).toBe('censored-ml');
    expect(body.quantitationLimit).toMatchObject({ measure: 'ee', value: 99.8 });
    expect(body.leastSquaresWithoutBounds!.n).toBe(4);
    expect(body.leastSquaresWithoutBounds!.label).toMatch(/bounds dropped/);
    // Both bounds are checked at the limit ln 999, not at the reported 99.9 / 99.85 % [C].
    const bounds = body.residuals.filter((r) => r.status === 'censored');
    expect(bounds).toHaveLength(2);
    for (const b of bounds) expect(b.censorLnRatio!).toBeCloseTo(Math.log(999), 9);
  });

  it('when the quantitation limit is given for dr, then it is read as r and bounds beyond it are censored there', async () => {
    const ms = [
      ...[-20, 0, 20, 40].map((c, i) => ({
        temperature: C(c),
        selectivity: { measure: 'dr', value: Math.exp(1500 / (c + 273.15) - 1.5 + (i % 2 ? 0.03 : -0.03)) },
      })),
      { temperature: C(-60), selectivity: { measure: 'dr', value: '250:1', atLeast: true } },
    ];
    const body = fitResponseSchema.parse(await fit({ measurements: ms, quantitationLimit: { measure: 'dr', value: 200 } }));
    expect(body.quantitationLimit!.lnRatio).toBeCloseTo(Math.log(200), 12);
    expect(body.residuals.find((r) => r.status === 'censored')!.censorLnRatio!).toBeCloseTo(Math.log(200), 12);
  });

  it('when the quantitation limit is outside (0, 100) % ee or a bound lies inside it, then 400 names the field', async () => {
    for (const value of [0, 100, 120, -5]) {
      const body = await fit({ measurements: runs([-40, -20, 0]), quantitationLimit: { measure: 'ee', value } }, 400);
      expect(paths(body)).toContain('quantitationLimit.value');
    }
    const inside = await fit(
      {
        measurements: [...runs([-20, 0, 20]), { temperature: C(-40), selectivity: { measure: 'ee', value: 95, atLeast: true } }],
        quantitationLimit: { measure: 'ee', value: 99.5 },
      },
      400,
    );
    expect(paths(inside)).toEqual(['measurements.3.selectivity.value']);
    expect((await fit({ measurements: runs([-40, -20, 0]), newRunUncertainty: 0 }, 400)).errors[0].path).toBe('newRunUncertainty');
  });

  it('when a screen has 4 runs, then no run is flagged, the reason is given and the internal studentized residual is shown', async () => {
    const ms = runs([-40, -20, 0, 20]);
    ms[2]!.selectivity.value = 60;
    const body = fitResponseSchema.parse(await fit({ measurements: ms }));
    expect(body.residuals.every((r) => r.flags.length === 0)).toBe(true);
    expect(body.warnings.map((w) => w.code)).toContain('too-few-runs-to-flag');
    expect(body.residuals[2]!.studentizedInternal).toEqual(expect.any(Number));
  });

  it('when T₀ is computed from a fit, then it carries a Fieller interval and says whether it is a far extrapolation', async () => {
    const body = fitResponseSchema.parse(await fit({ measurements: runs([-60, -40, -20, 0, 20, 40]) }));
    const z = body.zeroSelectivity!;
    expect(z.interval).not.toBeNull();
    expect(z.interval!.note).toMatch(/Fieller|no limit/);
    expect(z.farExtrapolation).toBe(true); // [C] T₀ = 2200/3.5 ≈ 629 K, far above the screen
  });

  it('when one prediction lies far below the data, then it is flagged and the rest of the fit stands', async () => {
    const body = fitResponseSchema.parse(await fit({ measurements: runs([-40, -20, 0, 20, 40]), predict: [K(2), C(0)] }));
    const [far, near] = body.predictions;
    expect(far!.outOfRange).toBe(true);
    expect(far!.ratio).toBeNull();
    expect(far!.eePercent).toBe(100);
    expect(Number.isFinite(far!.lnRatio!)).toBe(true);
    expect(far!.ddGSe).not.toBeNull();
    expect(near!.outOfRange).toBe(false);
    expect(body.warnings.map((w) => w.code)).toContain('prediction-out-of-range');
  });

  it('when temperatures labelled °C look like kelvin, then the calculator warns as the importer does', async () => {
    const ms = runs([-40, -20, 0, 20, 40]).map((m) => ({ ...m, temperature: C(m.temperature.value + 273.15) }));
    const body = await fit({ measurements: ms });
    expect(body.warnings.find((w: { code: string }) => w.code === 'temperature-looks-like-kelvin').message).toMatch(/look like kelvin/);
  });

  it('when a screen spans −40 to 0 °C, then it is not called narrow', async () => {
    const body = await fit({ measurements: runs([-40, -30, -20, -10, 0]) });
    expect(body.warnings.map((w: { code: string }) => w.code)).not.toContain('narrow-temperature-span');
  });

  it('when an uncertainty converts to an infinite σ(ln r), then 400 names measurements.i.uncertainty', async () => {
    const ms = runs([-40, -20, 0, 20]);
    const bad = await fit(
      { measurements: [...ms, { temperature: C(10), selectivity: { measure: 'ee', value: 99.9999999999999 }, uncertainty: 1e308 }] },
      400,
    );
    expect(paths(bad)).toEqual(['measurements.4.uncertainty']);
  });
});

describe('POST /api/v1/forecast: request paths in errors', () => {
  const gap = (value: number) => ({ kind: 'gap', ddG: { value, unit: 'kcal/mol' }, temperature: C(25) });

  it('when count is 1 but from and to differ, then 400 names temperatures.count', async () => {
    const body = await forecast({ basis: gap(1), temperatures: { from: C(-20), to: C(20), count: 1 } }, 400);
    expect(paths(body)).toEqual(['temperatures.count']);
    await forecast({ basis: gap(1), temperatures: { from: C(-20), to: C(-20), count: 1 } }, 200);
  });

  it('when ΔΔG‡ overflows on conversion, then 400 names basis.ddG.value', async () => {
    const body = await forecast({ basis: gap(1e306), temperatures: { values: [C(0)] } }, 400);
    expect(paths(body)).toEqual(['basis.ddG.value']);
  });

  it('when r overflows at one listed temperature, then the error names that request field', async () => {
    const body = await forecast({ basis: gap(100), temperatures: { values: [C(25), C(-250)] } }, 422);
    expect(paths(body)).toEqual(['temperatures.values.1.value']);
  });
});

describe('POST /api/v1/fit: the lack-of-fit F test p-value', () => {
  it('when a straight line misses duplicated runs by far, then p comes from the upper tail and is not rounded to 0', async () => {
    // Two sharply different branches, each temperature in duplicate with tiny scatter (invented): the lack-of-fit F is huge.
    const temps = [-70, -60, -50, -40, -30, 10, 20, 30, 40, 50];
    const ms = temps.flatMap((c) =>
      [1e-4, -1e-4].map((e) => {
        const t = c + 273.15;
        const y = c < -10 ? 3000 / t - 10 : -1000 / t + 6.2;
        return { temperature: C(c), selectivity: { measure: 'ratio', value: Math.exp(y + e) } };
      }),
    );
    const body = await fit({ measurements: ms });
    expect(body.twoBranch.lackOfFit).not.toBeNull();
    const p = body.twoBranch.lackOfFit.p;
    expect(p).toBeGreaterThan(0);
    expect(p).toBeLessThan(1e-10);
  });
});
