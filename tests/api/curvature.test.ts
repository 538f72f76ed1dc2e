import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import ExcelJS from 'exceljs';
import { testApp } from '../support/app';
import { closeTestKnex, testKnex } from '../support/db';
import { createProject } from '../factories/projects';
import { createUser } from '../factories/users';
import { createCampaign } from '../factories/campaigns';
import { Measurement as MeasurementModel } from '../../api/models/measurement';
import { fitResponseSchema } from '../../api/features/calculators/schemas';
import { computeAnalysis } from '../../api/features/campaigns/analysis';
import { compareCampaigns } from '../../api/features/campaigns/analysis-comparison';
import { buildCampaignReport } from '../../api/features/campaigns/report';
import type { Campaign } from '../../api/models/campaign';
import type { Measurement } from '../../api/models/measurement';

afterAll(closeTestKnex);

const C = (value: number) => ({ value, unit: 'C' as const });
const K = 273.15;
// Invented screens [C]: ln r on 1/T. Isoinversion: slopes +1,600 K (warm side) and −900 K (cold side)
// meeting at −15 °C; straight: ln r = 1200/T − 2. A fixed scatter of a few hundredths is added.
const SCATTER = [0.012, -0.018, 0.009, 0.021, -0.011, -0.016, 0.014, 0.004, -0.02, 0.008];
const TEMPS_C = [40, 30, 20, 10, 0, -10, -20, -30, -40, -50];
const X_BREAK = 1 / (K - 15);
const isoLnR = (tK: number) => 3 + 1600 * (1 / tK - X_BREAK) - 2500 * Math.max(0, 1 / tK - X_BREAK);
const iso = TEMPS_C.map((c, i) => ({
  temperature: C(c),
  selectivity: { measure: 'ratio' as const, value: Math.exp(isoLnR(c + K) + SCATTER[i]!) },
}));
const straight = TEMPS_C.map((c, i) => ({
  temperature: C(c),
  selectivity: { measure: 'ratio' as const, value: Math.exp(1200 / (c + K) - 2 + SCATTER[i]!) },
}));

describe('POST /api/v1/fit curvature check', () => {
  it('when the branch slopes have opposite signs, then an isoinversion with its CI is claimed and forecasts come from the branches', async () => {
    const { app } = testApp();
    const res = await request(app)
      .post('/api/v1/fit')
      .send({ measurements: iso, predict: [C(30), C(-40), C(-70)] })
      .expect(200);
    const body = fitResponseSchema.parse(res.body);
    const tb = body.twoBranch;
    expect(tb.checked).toBe(true);
    if (!tb.checked) return;
    expect(tb.preferred).toBe('two-branch');
    expect(tb.claim).toBe('isoinversion');
    expect(tb.extremum).toBe('maximum'); // [C] ln r rises on cooling above −15 °C and falls below it
    expect(tb.break!.celsius).toBeGreaterThan(-20);
    expect(tb.break!.celsius).toBeLessThan(-10);
    expect(tb.break!.ci!.level).toBe(0.95);
    expect(tb.break!.ci!.celsius[0]).toBeLessThan(tb.break!.celsius);
    expect(tb.break!.ci!.celsius[1]!).toBeGreaterThan(tb.break!.celsius);
    expect(tb.break!.label).toMatch(/^Isoinversion temperature, where r passes through a maximum/);
    expect(tb.breakTest.method).toBe('sup-F, parametric bootstrap');
    expect(tb.breakTest.p).toBeLessThan(0.01);
    expect(tb.low!.ddH['kJ/mol']).toBeLessThan(0);
    expect(tb.high!.ddH['kJ/mol']).toBeGreaterThan(0);
    expect(tb.note).toMatch(/selectivity-determining step/);
    const [warm, cold, far] = body.predictions;
    expect(warm!.model).toBe('segmented');
    expect(warm!.branch).toBe('high');
    expect(cold!.branch).toBe('low');
    // [C] on the cold branch: ln r = 3 − 900·(1/T − 1/T_b)
    expect(Math.log(cold!.ratio!)).toBeCloseTo(isoLnR(-40 + K), 1);
    expect(cold!.lnRatio).toBeCloseTo(Math.log(cold!.ratio!), 12);
    expect(cold!.extrapolated).toBe(false);
    expect(far!.extrapolated).toBe(true);
    expect(far!.predictionInterval!.ratio[0]).toBeLessThan(far!.ratio!);
  });

  it('when the screen is one straight line, then no break, branch or isoinversion is reported and forecasts use the line', async () => {
    const { app } = testApp();
    const res = await request(app)
      .post('/api/v1/fit')
      .send({ measurements: straight, predict: [C(-20)] })
      .expect(200);
    const body = fitResponseSchema.parse(res.body);
    const tb = body.twoBranch;
    expect(tb.preferred).toBe('one-line');
    expect(tb.claim).toBeNull();
    if (!tb.checked) throw new Error('expected a checked curvature');
    expect(tb.break).toBeNull();
    expect(tb.low).toBeNull();
    expect(tb.extremum).toBeNull();
    expect(JSON.stringify(tb)).not.toMatch(/isoinversion temperature/i);
    expect(body.predictions[0]!.model).toBe('one-line');
    expect(body.predictions[0]!.branch).toBeNull();
  });

  it('when replicates are given, then the lack-of-fit F test is reported', async () => {
    const { app } = testApp();
    const dup = straight
      .slice(0, 6)
      .flatMap((m, i) => [m, { ...m, selectivity: { measure: 'ratio' as const, value: m.selectivity.value * Math.exp(SCATTER[i]!) } }]);
    const res = await request(app).post('/api/v1/fit').send({ measurements: dup }).expect(200);
    const tb = fitResponseSchema.parse(res.body).twoBranch;
    expect(tb.lackOfFit!.dof1).toBe(4); // [C] m − 2 with m = 6 temperatures
    expect(tb.lackOfFit!.dof2).toBe(6); // [C] n − m = 12 − 6
    expect(tb.lackOfFit!.p).toBeGreaterThan(0);
  });

  it('when there are too few runs for a break, then the answer is 200 with an explained "not enough data" note', async () => {
    const { app } = testApp();
    const res = await request(app)
      .post('/api/v1/fit')
      .send({ measurements: iso.slice(0, 5) })
      .expect(200);
    const tb = fitResponseSchema.parse(res.body).twoBranch;
    expect(tb.checked).toBe(false);
    expect(tb.note).toMatch(/^Not enough data for a break check: each side of a break needs 3 or more fitted runs/);
  });
});

const campaign = {
  id: '00000000-0000-4000-8000-000000000001',
  version: 1,
  measure: 'ratio',
  defaultUncertainty: null,
} as unknown as Campaign;
const stored = (rows: typeof iso) =>
  rows.map(
    (m, i) =>
      ({
        id: `m${i}`,
        temperatureK: m.temperature.value + K,
        measure: 'ratio',
        value: m.selectivity.value,
        valueB: null,
        uncertainty: null,
        excluded: false,
        excludedReason: null,
        isLowerBound: false,
        sampleId: null,
        replicateLabel: null,
      }) as unknown as Measurement,
  );

/** The campaign's workbook under `title`, read back, with the labels in column A of its Summary sheet. */
async function reportOf(title: string, measurements: Measurement[], analysis: ReturnType<typeof computeAnalysis>) {
  const buf = await buildCampaignReport(
    {
      campaign: { ...campaign, title, productNameA: 'A', productNameB: 'B', assayMethod: 'chiral-hplc' } as unknown as Campaign,
      measurements,
      analysis,
      forecasts: [],
    },
    { appVersion: 'test', generatedAt: new Date(0) },
  );
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(buf as unknown as ArrayBuffer);
  const names: string[] = [];
  wb.getWorksheet('Summary')!.eachRow((row) => names.push(String(row.getCell(1).value)));
  return { wb, names };
}

describe('campaign analysis and report with an accepted break', () => {
  it('when a stored campaign has an isoinversion, then the asked forecast names its branch and the report has the break rows', async () => {
    const analysis = computeAnalysis(campaign, stored(iso), {
      weighting: 'none',
      uncertaintyScale: 'absolute',
      confidence: 0.95,
      atK: K - 40,
    });
    expect(analysis.at!.model).toBe('segmented');
    expect(analysis.at!.branch).toBe('low');
    expect(analysis.curve.every((p) => p.model === 'segmented')).toBe(true);
    const { wb, names } = await reportOf('Invented isoinversion', stored(iso), analysis);
    expect(names).toContain('Isoinversion temperature, where r has a maximum (°C)');
    const forecast = wb.getWorksheet('Forecast')!;
    const header = (forecast.getRow(1).values as unknown[]).map(String);
    expect(header).toContain('Model');
  });

  it('when a stored campaign is one straight line, then the report has no break or isoinversion row', async () => {
    const analysis = computeAnalysis(campaign, stored(straight), { weighting: 'none', uncertaintyScale: 'absolute', confidence: 0.95 });
    const { names } = await reportOf('Invented line', stored(straight), analysis);
    expect(names.some((n) => /isoinversion|change of slope/i.test(n))).toBe(false);
    expect(names).toContain('Curvature check');
  });
});

describe('project comparison with an accepted break', () => {
  it('when one campaign has an isoinversion and another is straight, then only the first carries a break and a branch forecast', async () => {
    const db = testKnex();
    const owner = await createUser();
    const project = await createProject([{ user: owner, role: 'owner' }]);
    const bent = await createCampaign(project.id, { title: 'A: invented isoinversion', measure: 'ratio', defaultUncertainty: null });
    const line = await createCampaign(project.id, { title: 'B: invented straight line', measure: 'ratio', defaultUncertainty: null });
    for (const [c, rows] of [
      [bent, iso],
      [line, straight],
    ] as const) {
      await MeasurementModel.query(db).insert(
        rows.map((m) => ({
          campaignId: c.id,
          temperatureK: m.temperature.value + K,
          measure: 'ratio' as const,
          value: m.selectivity.value,
        })),
      );
    }
    const cmp = await compareCampaigns(db, project.id, -40);
    const [a, b] = cmp.campaigns;
    expect(a!.preferred).toBe('two-branch');
    expect(a!.breakAt).toMatchObject({ claim: 'isoinversion', extremum: 'maximum' });
    expect(a!.breakAt!.celsius).toBeGreaterThan(-20);
    expect(a!.prediction!.model).toBe('segmented');
    expect(a!.prediction!.branch).toBe('low');
    expect(b!.preferred).toBe('one-line');
    expect(b!.breakAt).toBeNull();
    expect(b!.prediction!.model).toBe('one-line');
  });
});
