import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { closeTestKnex, testKnex } from '../support/db';
import { binaryBody, signInEach, startAuthApp, type AuthTestApp, type SignedInRequests } from '../support/auth';
import { createUser } from '../factories/users';
import { createProject, createTeamProjects } from '../factories/projects';
import { createCampaign } from '../factories/campaigns';
import { Measurement } from '../../api/models/measurement';
import { campaignPlanSchema, comparisonSchema } from '../../api/features/plan/schemas';
import { loadComparisonReportData, loadPlanReportData } from '../../api/features/plan/report-data';
import type { User } from '../../api/models/user';
import type { Project } from '../../api/models/project';

type Who = 'owner' | 'editor' | 'viewer' | 'outsider';

let env: AuthTestApp;
let users: Record<Who, User>;
let project: Project;
let outsiderProject: Project;
let as: (who: Who) => SignedInRequests;

const R = 6.02214076e23 * 1.380649e-23; // CODATA 2018 [S]
const NOISE = [0.04, -0.03, 0.02, -0.05, 0.03, -0.01, 0.05, -0.02, 0.01, -0.04]; // invented scatter in ln r
const TEMPS_K = [-60, -60, -40, -40, -20, -20, 0, 0, 20, 20].map((c) => c + 273.15);
const kTrue = (t: number) => 2.083661912e10 * t * Math.exp(-100 / R) * Math.exp(-55_000 / (R * t)); // invented [C]

/** An invented screen: ln r = ΔΔH‡/RT − ΔΔS‡/R + noise, stored as ee, with conversion and time on each run. */
async function screen(projectId: string, ddH = 12_000, shift = 0, measure: 'ee' | 'dr' = 'ee') {
  const campaign = await createCampaign(projectId, { measure });
  await Measurement.query(testKnex()).insert(
    TEMPS_K.map((t, i) => {
      const y = ddH / (R * t) - 10 / R + shift + NOISE[i]!;
      const timeS = 3600 * 30 * Math.exp(-((t - 213.15) / 25));
      return {
        campaignId: campaign.id,
        temperatureK: t,
        measure,
        value: measure === 'ee' ? 100 * Math.tanh(y / 2) : Math.exp(y),
        ...(measure === 'dr' ? { valueB: 1 } : {}),
        conversionPercent: 100 * (1 - Math.exp(-kTrue(t) * timeS)),
        reactionTimeS: timeS,
      };
    }),
  );
  return campaign;
}

beforeAll(async () => {
  env = await startAuthApp();
  users = { owner: await createUser(), editor: await createUser(), viewer: await createUser(), outsider: await createUser() };
  ({ project, outsiderProject } = await createTeamProjects(users));
  as = await signInEach(env.app, users);
});

afterAll(async () => {
  await env?.close();
  await closeTestKnex();
});

const audits = async (entityType: string, entityId: string) => testKnex()('audit_events').where({ entityType, entityId }).orderBy('id');
const RANGE = { from: { value: -70, unit: 'C' }, to: { value: 40, unit: 'C' } };

describe('specifications', () => {
  it('when an editor sets the project default and a campaign override, then the campaign reads its override, both are audited and versioned', async () => {
    const campaign = await screen(project.id);
    const put1 = await as('editor')
      .put(`/api/v1/projects/${project.id}/specification`)
      .send({ measure: 'ee', minimum: 97, probability: 0.9 })
      .expect(200);
    expect(put1.body.specification).toMatchObject({ measure: 'ee', minimum: 97, probability: 0.9, runs: 1, version: 1 });
    const inherited = await as('viewer').get(`/api/v1/campaigns/${campaign.id}/specification`).expect(200);
    expect(inherited.body.source).toBe('project');
    expect(inherited.body.effective.minimum).toBe(97);

    await as('editor')
      .put(`/api/v1/campaigns/${campaign.id}/specification`)
      .send({ measure: 'ee', minimum: 98, probability: 0.95 })
      .expect(200);
    const stale = await as('editor')
      .put(`/api/v1/campaigns/${campaign.id}/specification`)
      .send({ measure: 'ee', minimum: 98.5, probability: 0.95, version: 7 })
      .expect(409);
    expect(stale.body.currentVersion).toBe(1);
    const put3 = await as('editor')
      .put(`/api/v1/campaigns/${campaign.id}/specification`)
      .send({ measure: 'ee', minimum: 98.5, probability: 0.95, version: 1 })
      .expect(200);
    expect(put3.body).toMatchObject({ source: 'campaign', effective: { minimum: 98.5, version: 2 }, project: { minimum: 97 } });
    const history = await audits('campaign-specification', campaign.id);
    expect(history.map((h) => h.action)).toEqual(['create', 'update']);
    expect(history[1].before.minimum).toBe(98);
    expect(history[1].after.minimum).toBe(98.5);
  });

  it.each([
    [{ measure: 'ee', minimum: 100.5, probability: 0.95 }, 'minimum'],
    [{ measure: 'dr', minimum: 0.5, probability: 0.95 }, 'minimum'],
    [{ measure: 'ee', minimum: 99, probability: 0.4 }, 'probability'],
    [{ measure: 'ee', minimum: 99, probability: 0.9995 }, 'probability'],
    [{ measure: 'ratio', minimum: 20, probability: 0.95 }, 'measure'],
  ])('when the specification %j is sent, then 400 names %s and nothing is stored', async (body, path) => {
    const campaign = await createCampaign(project.id);
    const res = await as('editor').put(`/api/v1/campaigns/${campaign.id}/specification`).send(body).expect(400);
    expect(res.body.errors.map((e: { path: string }) => e.path)).toContain(path);
    expect(await testKnex()('plan_specifications').where({ campaignId: campaign.id }).count({ n: '*' }).first()).toEqual({ n: 0 });
  });

  it('when a viewer writes or an outsider reads, then 403 and 404', async () => {
    const campaign = await createCampaign(project.id);
    await as('viewer')
      .put(`/api/v1/campaigns/${campaign.id}/specification`)
      .send({ measure: 'ee', minimum: 98, probability: 0.95 })
      .expect(403);
    await as('outsider').get(`/api/v1/campaigns/${campaign.id}/specification`).expect(404);
    await as('outsider').get(`/api/v1/projects/${project.id}/specification`).expect(404);
  });
});

describe('campaign plan', () => {
  it('when an editor saves a plan with the stored specification and runs, then inputs and result are kept, versioned and audited', async () => {
    const campaign = await screen(project.id);
    await as('editor')
      .put(`/api/v1/campaigns/${campaign.id}/specification`)
      .send({ measure: 'ee', minimum: 98, probability: 0.95 })
      .expect(200);
    expect((await as('viewer').get(`/api/v1/campaigns/${campaign.id}/plan`).expect(200)).body.plan).toBeNull();
    const inputs = { temperatures: RANGE, rate: { targetConversionPercent: 95, maxTime: { value: 24, unit: 'h' } }, curvePoints: 11 };
    const saved = await as('editor').put(`/api/v1/campaigns/${campaign.id}/plan`).send({ inputs }).expect(200);
    const plan = campaignPlanSchema.parse(saved.body.plan);
    expect(plan.version).toBe(1);
    expect(plan.result.specification.minimum).toBe(98);
    expect(plan.result.rate!.runs).toHaveLength(10); // every stored run carries conversion and time
    expect(plan.result.rate!.dH['kJ/mol']).toBeCloseTo(55, 3); // [C] runs made on the invented rate line
    expect(plan.result.recommended).not.toBeNull();
    expect(plan.result.caution).toMatch(/calorimetry/);

    // The stateless planner gives the same answer on the same numbers.
    const runs = await Measurement.query(testKnex()).where({ campaignId: campaign.id }).orderBy('temperatureK').orderBy('id');
    const stateless = await request(env.app)
      .post('/api/v1/plan')
      .send({
        measurements: runs.map((m) => ({
          temperature: { value: m.temperatureK, unit: 'K' },
          selectivity: { measure: 'ee', value: m.value },
        })),
        specification: { measure: 'ee', minimum: 98, probability: 0.95 },
        temperatures: RANGE,
        rate: {
          ...inputs.rate,
          runs: runs.map((m) => ({
            temperature: { value: m.temperatureK, unit: 'K' },
            conversionPercent: m.conversionPercent,
            time: { value: m.reactionTimeS, unit: 's' },
          })),
        },
        curvePoints: 11,
      })
      .expect(200);
    expect(plan.result.recommended!.kelvin).toBeCloseTo(stateless.body.recommended.kelvin, 9);

    await as('editor').put(`/api/v1/campaigns/${campaign.id}/plan`).send({ inputs }).expect(409);
    const again = await as('editor')
      .put(`/api/v1/campaigns/${campaign.id}/plan`)
      .send({ inputs: { ...inputs, rule: 'coldest' }, version: 1 })
      .expect(200);
    expect(again.body.plan.version).toBe(2);
    expect(again.body.plan.result.rule.name).toBe('coldest');
    const read = await as('viewer').get(`/api/v1/campaigns/${campaign.id}/plan`).expect(200);
    expect(read.body.plan.inputs.rule).toBe('coldest');
    expect((await audits('campaign-plan', campaign.id)).map((a) => a.action)).toEqual(['create', 'update']);
    // The report sheets read the same plan in a plain shape.
    const sheet = (await loadPlanReportData(testKnex(), project.id, campaign.id))!;
    expect(sheet.rows).toHaveLength(11);
    expect(sheet.version).toBe(2);
    expect(sheet.recommended!.celsius).toBeCloseTo(again.body.plan.result.recommended.celsius, 3);
    expect(sheet.caution).toMatch(/calorimetry/);
  });

  it('when a campaign has a saved plan and the project a saved comparison, then the workbook carries a Plan and a Comparison sheet with their numbers', async () => {
    const campaign = await screen(project.id);
    const other = await screen(project.id, 12_000, 0.6);
    await as('editor')
      .put(`/api/v1/campaigns/${campaign.id}/specification`)
      .send({ measure: 'ee', minimum: 98, probability: 0.95 })
      .expect(200);
    const inputs = {
      temperatures: RANGE,
      rate: { targetConversionPercent: 95, maxTime: { value: 24, unit: 'h' } },
      curvePoints: 11,
      nextRuns: { count: 2 },
    };
    const plan = campaignPlanSchema.parse(
      (await as('editor').put(`/api/v1/campaigns/${campaign.id}/plan`).send({ inputs }).expect(200)).body.plan,
    );
    const rec = plan.result.recommended!;
    expect(rec).not.toBeNull();
    await as('editor')
      .post('/api/v1/comparisons')
      .send({ projectId: project.id, name: 'Report pair', campaignIds: [other.id, campaign.id], temperature: { value: -20, unit: 'C' } })
      .expect(201);

    const res = await as('viewer').get(`/api/v1/campaigns/${campaign.id}/report.xlsx`).buffer(true).parse(binaryBody).expect(200);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(res.body as unknown as ArrayBuffer);
    expect(wb.worksheets.map((w) => w.name)).toEqual(expect.arrayContaining(['Summary', 'Plan', 'Comparison']));
    const named = (name: string) => {
      const [sheet, ref] = wb.definedNames.getRanges(name).ranges[0]!.split('!');
      return wb.getWorksheet(sheet!.replace(/'/g, ''))!.getCell(ref!.replace(/\$/g, '')).value;
    };
    // The same numbers as the stored plan, rounded only as the report shape rounds them (5 significant digits).
    expect(named('Plan_recommended_T_C')).toBeCloseTo(rec.celsius, 2);
    expect(named('Recommended_T_C')).toBeCloseTo(rec.celsius, 2);
    expect(named('Plan_probability')).toBeCloseTo(rec.probabilityMeetsSpec, 4);
    expect(named('Recommended_probability')).toBeCloseTo(rec.probabilityMeetsSpec, 4);

    const planSheet = wb.getWorksheet('Plan')!;
    const byLabel = (ws: ExcelJS.Worksheet, label: string) => {
      let found: ExcelJS.Row | undefined;
      ws.eachRow((row) => {
        if (!found && row.getCell(1).value === label) found = row;
      });
      return found!;
    };
    expect(byLabel(planSheet, 'Rule').getCell(2).value).toBe(plan.result.rule.text);
    expect(byLabel(planSheet, 'Operating window from').getCell(2).value).toBeCloseTo(plan.result.window!.from.celsius, 2);
    expect(byLabel(planSheet, 'Operating window to').getCell(2).value).toBeCloseTo(plan.result.window!.to.celsius, 2);
    expect(byLabel(planSheet, 'Binding constraints').getCell(2).value).toBe(
      plan.result.binding.length ? plan.result.binding.join(', ') : 'none',
    );
    expect(String(byLabel(planSheet, 'Caution').getCell(2).value)).toMatch(/calorimetry/);
    expect(String(byLabel(planSheet, 'Next runs').getCell(2).value)).toMatch(/°C.*°C/);
    expect(byLabel(planSheet, 'Allowed temperature range').getCell(2).value).toBe('−70 °C to 40 °C');
    expect(planSheet.getImages()).toHaveLength(1);
    // The curve table: one row per stored curve point, probabilities as stored.
    const head = byLabel(planSheet, 'Curve: T (°C)');
    plan.result.curve.forEach((p, i) => {
      const row = planSheet.getRow(head.number + 1 + i);
      expect(row.getCell(1).value).toBeCloseTo(p.celsius, 3);
      expect(row.getCell(3).value).toBeCloseTo(p.probabilityMeetsSpec, 4);
      expect(row.getCell(9).value).toBe(p.feasible ? 'yes' : 'no');
    });

    const summary = wb.getWorksheet('Summary')!;
    expect(String(byLabel(summary, 'Operating window').getCell(2).value)).toMatch(/°C to .*°C/);
    // The Forecast sheet forecasts at the recommended temperature too.
    const recommendedRows: number[] = [];
    wb.getWorksheet('Forecast')!.eachRow((row) => {
      if (row.getCell(3).value === 'recommended by the saved plan') recommendedRows.push(row.getCell(2).value as number);
    });
    expect(recommendedRows).toHaveLength(1);
    expect(recommendedRows[0]).toBeCloseTo(rec.kelvin, 3);

    const cmp = wb.getWorksheet('Comparison')!;
    const pairRow = byLabel(cmp, `${other.title} against ${campaign.title}`);
    expect(pairRow).toBeDefined();
    const stored = await loadComparisonReportData(
      testKnex(),
      project.id,
      users.viewer.id,
      (await testKnex()('comparisons').where({ name: 'Report pair' }).first('id')).id,
    );
    expect(pairRow.getCell(2).value).toBeCloseTo(stored.pairs[0]!.differenceLnR, 6);
    expect(pairRow.getCell(8).value).toBe('the first is more selective');
  });

  it('when no specification is stored or sent, then 400 names inputs.specification and nothing is stored', async () => {
    const other = await createProject([{ user: users.editor, role: 'editor' }]);
    const campaign = await screen(other.id);
    const res = await as('editor')
      .put(`/api/v1/campaigns/${campaign.id}/plan`)
      .send({ inputs: { temperatures: RANGE } })
      .expect(400);
    expect(res.body.errors[0].path).toBe('inputs.specification');
    expect(await testKnex()('campaign_plans').where({ campaignId: campaign.id }).count({ n: '*' }).first()).toEqual({ n: 0 });
  });

  it('when the body is bad, then 400 names the field (range reversed, hold without barrier)', async () => {
    const campaign = await screen(project.id);
    const spec = { measure: 'ee', minimum: 98, probability: 0.95 };
    const reversed = await as('editor')
      .put(`/api/v1/campaigns/${campaign.id}/plan`)
      .send({ inputs: { specification: spec, temperatures: { from: RANGE.to, to: RANGE.from } } })
      .expect(400);
    expect(reversed.body.errors[0].path).toBe('inputs.temperatures.to');
    const hold = await as('editor')
      .put(`/api/v1/campaigns/${campaign.id}/plan`)
      .send({ inputs: { specification: spec, temperatures: RANGE, hold: { time: { value: 1, unit: 'h' }, floorEePercent: 97 } } })
      .expect(400);
    expect(hold.body.errors[0].path).toBe('inputs.hold.barrier');
  });
});

describe('comparisons', () => {
  it('when an editor compares a screen with a clearly more selective one, then the pair says which is better and the saved comparison is shared', async () => {
    const a = await screen(project.id, 12_000, 0.6);
    const b = await screen(project.id);
    const res = await as('editor')
      .post('/api/v1/comparisons')
      .send({ projectId: project.id, name: 'Ligand A against B', campaignIds: [a.id, b.id], temperature: { value: -20, unit: 'C' } })
      .expect(201);
    const view = comparisonSchema.parse(res.body);
    expect(view.result.pairs).toHaveLength(1);
    expect(view.result.pairs[0]!.verdict).toBe('first');
    expect(view.result.pairs[0]!.differenceLnR).toBeCloseTo(0.6, 1); // [C] the invented offset
    expect(view.result.pairs[0]!.probabilityFirstBetter).toBeGreaterThan(0.99);
    expect(view.result.campaigns[0]!.fit!.curve.length).toBeGreaterThan(10);
    const read = await as('viewer').get(`/api/v1/comparisons/${view.id}`).expect(200);
    expect(read.body.name).toBe('Ligand A against B');
    expect(read.body.result.pairs[0].verdict).toBe('first');
    const list = await as('viewer').get('/api/v1/comparisons').expect(200);
    expect(list.body.comparisons.map((c: { id: string }) => c.id)).toContain(view.id);
    expect((await as('outsider').get('/api/v1/comparisons').expect(200)).body.comparisons.map((c: { id: string }) => c.id)).not.toContain(
      view.id,
    );
    await as('outsider').get(`/api/v1/comparisons/${view.id}`).expect(404);
    expect((await audits('comparison', view.id)).map((x) => x.action)).toEqual(['create']);
    const sheet = await loadComparisonReportData(testKnex(), project.id, users.viewer.id, view.id);
    expect(sheet.pairs[0]!.first).toBe(a.title);
    expect(sheet.pairs[0]!.verdict).toBe('first');
  });

  it('when each campaign has a specification, then the comparison says in words which meets its own at the temperature', async () => {
    const a = await screen(project.id, 12_000, 0.6);
    const b = await screen(project.id);
    const body = {
      projectId: project.id,
      name: 'Against the specification',
      campaignIds: [a.id, b.id],
      temperature: { value: -20, unit: 'C' },
    };
    const first = comparisonSchema.parse((await as('editor').post('/api/v1/comparisons').send(body).expect(201)).body);
    // The project's default applies until a campaign sets its own.
    expect(first.result.campaigns.every((c) => c.specification !== null)).toBe(true);
    // A minimum between the two fitted ee values at −20 °C: the first reaches it, the second does not [C].
    const [eeA, eeB] = first.result.campaigns.map((c) => c.fit!.at.value);
    const minimum = Math.round(((eeA! + eeB!) / 2) * 10) / 10;
    for (const c of [a, b])
      await as('editor').put(`/api/v1/campaigns/${c.id}/specification`).send({ measure: 'ee', minimum, probability: 0.9 }).expect(200);
    const read = comparisonSchema.parse((await as('viewer').get(`/api/v1/comparisons/${first.id}`).expect(200)).body);
    expect(read.result.campaigns.map((c) => c.meetsAtTemperature)).toEqual(['meets', 'falls short']);
    expect(read.result.campaigns[0]!.specification).toMatchObject({ measure: 'ee', minimum, probability: 0.9, runs: 1 });
    expect(read.result.campaigns[0]!.specification!.lnRatio).toBeCloseTo(Math.log((100 + minimum) / (100 - minimum)), 12); // ee → ln r [C]
    const sheet = await loadComparisonReportData(testKnex(), project.id, users.viewer.id, first.id);
    expect(sheet.campaigns.map((c) => c.meetsAtTemperature)).toEqual(['meets', 'falls short']);
  });

  it('when two screens share one line, then the comparison says the data cannot tell them apart', async () => {
    const a = await screen(project.id);
    const b = await screen(project.id);
    const res = await as('editor')
      .post('/api/v1/comparisons')
      .send({ projectId: project.id, name: 'Same', campaignIds: [a.id, b.id], temperature: { value: -20, unit: 'C' } })
      .expect(201);
    expect(res.body.result.pairs[0].verdict).toBe('cannot-tell');
    expect(res.body.result.pairs[0].note).toMatch(/cannot tell/);
  });

  it.each([
    ['one campaign', async () => [(await screen(project.id)).id], 'campaignIds'],
    [
      'a campaign from a project the caller cannot read',
      async () => [(await screen(project.id)).id, (await screen(outsiderProject.id)).id],
      'campaignIds.1',
    ],
    [
      'ee against dr with no common scale',
      async () => [(await screen(project.id)).id, (await screen(project.id, 12_000, 0, 'dr')).id],
      'campaignIds.1',
    ],
    [
      'the same campaign twice',
      async () => {
        const id = (await screen(project.id)).id;
        return [id, id];
      },
      'campaignIds.1',
    ],
  ])('when the comparison has %s, then 400 names %s and nothing is stored', async (_label, ids, path) => {
    const res = await as('editor')
      .post('/api/v1/comparisons')
      .send({ projectId: project.id, name: 'Bad', campaignIds: await ids(), temperature: { value: -20, unit: 'C' } })
      .expect(400);
    expect(res.body.errors.map((e: { path: string }) => e.path)).toContain(path);
    expect(await testKnex()('comparisons').where({ projectId: project.id, name: 'Bad' }).count({ n: '*' }).first()).toEqual({ n: 0 });
  });

  it('when a viewer saves a comparison, then 403', async () => {
    const a = await screen(project.id);
    const b = await screen(project.id);
    await as('viewer')
      .post('/api/v1/comparisons')
      .send({ projectId: project.id, name: 'No', campaignIds: [a.id, b.id], temperature: { value: -20, unit: 'C' } })
      .expect(403);
  });
});
