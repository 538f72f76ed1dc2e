import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { randomBytes } from 'node:crypto';
import { closeTestKnex, testKnex } from '../support/db';
import { signInEach, startAuthApp, type AuthTestApp, type SignedInRequests } from '../support/auth';
import { createUser } from '../factories/users';
import { createProject, createTeamProjects } from '../factories/projects';
import { sample } from '../unit/imports/helpers';
import { analysisResponseSchema, comparisonResponseSchema, savedForecastViewSchema } from '../../api/features/campaigns/analysis-schemas';
import { toKelvin } from '../../api/features/campaigns/schemas';
import type { User } from '../../api/models/user';
import type { Project } from '../../api/models/project';

type Who = 'owner' | 'editor' | 'viewer' | 'outsider';

let env: AuthTestApp;
let users: Record<Who, User>;
let project: Project;
let as: (who: Who) => SignedInRequests;

// Exact SI: R = N_A·k_B (CODATA 2018 [S]).
const R = 6.02214076e23 * 1.380649e-23;
const C = (value: number) => ({ value, unit: 'C' as const });

beforeAll(async () => {
  env = await startAuthApp();
  users = { owner: await createUser(), editor: await createUser(), viewer: await createUser(), outsider: await createUser() };
  ({ project } = await createTeamProjects(users));
  as = await signInEach(env.app, users);
});

afterAll(async () => {
  await env?.close();
  await closeTestKnex();
});

const count = async (table: string, where: Record<string, unknown>) =>
  Number((await testKnex()(table).where(where).count({ n: '*' }).first())!.n);

async function newCampaign(overrides: Record<string, unknown> = {}, projectId = project.id) {
  const res = await as('editor')
    .post(`/api/v1/projects/${projectId}/campaigns`)
    .send({
      title: `Route screen ${randomBytes(3).toString('hex')}`,
      productNameA: '(S)-amine',
      productNameB: '(R)-amine',
      measure: 'ee',
      assayMethod: 'chiral-hplc',
      ...overrides,
    });
  expect(res.status).toBe(201);
  return res.body as { id: string; version: number; title: string };
}

interface Run {
  celsius: number;
  ee: number;
  uncertainty?: number;
  atLeast?: boolean;
  sampleId?: string;
}

/**
 * ee from ΔΔH‡ = 12 kJ/mol and ΔΔS‡ = 5 J/(mol·K) [C] (ln r = ΔΔH‡/RT − ΔΔS‡/R, ee = tanh(ln r / 2)),
 * nudged by a fixed zig-zag so the line does not fit exactly; rounded to 0.01 % as an assay reports it.
 */
function screen(celsius: number[], nudge = 0.15): Run[] {
  return celsius.map((c, i) => {
    const lnR = 12_000 / (R * (c + 273.15)) - 5 / R;
    const ee = 100 * Math.tanh(lnR / 2) + (i % 2 === 0 ? nudge : -nudge);
    return { celsius: c, ee: Math.round(ee * 100) / 100, sampleId: `KL-T${i + 1}` };
  });
}

const body = (r: Run) => ({
  temperature: C(r.celsius),
  selectivity: { measure: 'ee', value: r.ee, ...(r.atLeast ? { atLeast: true } : {}) },
  ...(r.uncertainty !== undefined ? { uncertainty: r.uncertainty } : {}),
  ...(r.sampleId ? { sampleId: r.sampleId } : {}),
});

async function addRuns(campaignId: string, runs: Run[]): Promise<{ id: string; version: number }[]> {
  const out = [];
  for (const r of runs) {
    const res = await as('editor').post(`/api/v1/campaigns/${campaignId}/measurements`).send(body(r));
    expect(res.status).toBe(201);
    out.push(res.body);
  }
  return out;
}

/** The same runs sent to the stateless calculator (no sign-in). */
async function statelessFit(runs: (Run & { excluded?: boolean })[], options: Record<string, unknown>, predictK: number[]) {
  const res = await request(env.app)
    .post('/api/v1/fit')
    .send({
      measurements: runs.map((r) => ({
        // The kelvin value a campaign stores (−50 °C as 223.15 K exactly), so both paths see the same numbers.
        temperature: { value: toKelvin(r.celsius, 'C'), unit: 'K' },
        selectivity: { measure: 'ee', value: r.ee, ...(r.atLeast ? { atLeast: true } : {}) },
        ...(r.uncertainty !== undefined ? { uncertainty: r.uncertainty } : {}),
        ...(r.excluded ? { excluded: true } : {}),
      })),
      predict: predictK.map((value) => ({ value, unit: 'K' })),
      ...options,
    });
  expect(res.status).toBe(200);
  return res.body;
}

describe('campaign CRUD and versions', () => {
  it('when an editor creates, reads, lists, changes and deletes a campaign, then each step answers as agreed', async () => {
    const created = await newCampaign({ defaultUncertainty: 0.3 });
    expect(created.version).toBe(1);

    const one = await as('viewer').get(`/api/v1/campaigns/${created.id}`).expect(200);
    expect(one.headers.etag).toBe('W/"1"');
    // The body names the caller's role, so no cache may replay it to another account.
    expect(one.headers['cache-control']).toBe('private, no-store');
    expect(one.body).toMatchObject({
      id: created.id,
      projectId: project.id,
      role: 'viewer',
      productNameA: '(S)-amine',
      defaultUncertainty: 0.3,
    });

    await addRuns(created.id, screen([-20, 0, 20]));
    const list = await as('viewer').get(`/api/v1/projects/${project.id}/campaigns`).expect(200);
    const mine = list.body.campaigns.find((c: { id: string }) => c.id === created.id);
    expect(mine).toMatchObject({
      measurementCount: 3,
      includedCount: 3,
      distinctTemperatures: 3,
      temperatureRangeK: { min: 253.15, max: 293.15 },
    });

    const patched = await as('editor').patch(`/api/v1/campaigns/${created.id}`).send({ version: 1, status: 'completed' }).expect(200);
    expect(patched.body).toMatchObject({ version: 2, status: 'completed' });
    expect(patched.headers.etag).toBe('W/"2"');

    const viaHeader = await as('editor')
      .patch(`/api/v1/campaigns/${created.id}`)
      .set('If-Match', 'W/"2"')
      .send({ notes: 'cooling bath logged' })
      .expect(200);
    expect(viaHeader.body).toMatchObject({ version: 3, notes: 'cooling bath logged' });

    await as('editor').delete(`/api/v1/campaigns/${created.id}?version=3`).expect(204);
    await as('editor').get(`/api/v1/campaigns/${created.id}`).expect(404);
    expect(await count('measurements', { campaignId: created.id })).toBe(0);
  });

  it('when a stale version is sent (body, If-Match or delete), then 409 carries currentVersion and nothing changes', async () => {
    const c = await newCampaign();
    await as('editor')
      .patch(`/api/v1/campaigns/${c.id}`)
      .send({ version: 1, title: `${c.title} (2)` })
      .expect(200);
    const stale = await as('owner').patch(`/api/v1/campaigns/${c.id}`).send({ version: 1, notes: 'late edit' });
    expect(stale.status).toBe(409);
    expect(stale.body).toMatchObject({ status: 409, currentVersion: 2 });
    const staleHeader = await as('owner').patch(`/api/v1/campaigns/${c.id}`).set('If-Match', 'W/"1"').send({ notes: 'late edit' });
    expect(staleHeader.status).toBe(409);
    expect(staleHeader.body.currentVersion).toBe(2);
    const staleDelete = await as('owner').delete(`/api/v1/campaigns/${c.id}`).set('If-Match', 'W/"1"');
    expect(staleDelete.status).toBe(409);
    const now = await as('viewer').get(`/api/v1/campaigns/${c.id}`).expect(200);
    expect(now.body).toMatchObject({ version: 2, notes: null });
  });

  it('when the version is missing, malformed or disagrees with If-Match, then 400 names version', async () => {
    const c = await newCampaign();
    const noVersion = await as('editor').delete(`/api/v1/campaigns/${c.id}`);
    expect(noVersion.status).toBe(400);
    expect(noVersion.body.errors).toEqual([{ path: 'version', message: 'version is required' }]);
    const badQuery = await as('editor').delete(`/api/v1/campaigns/${c.id}?version=first`);
    expect(badQuery.status).toBe(400);
    expect(badQuery.body.errors[0].path).toBe('version');
    const disagree = await as('editor').patch(`/api/v1/campaigns/${c.id}`).set('If-Match', 'W/"2"').send({ version: 1, notes: 'x' });
    expect(disagree.status).toBe(400);
    expect(disagree.body.errors[0].path).toBe('version');
    const garbled = await as('editor').patch(`/api/v1/campaigns/${c.id}`).set('If-Match', '*').send({ notes: 'x' });
    expect(garbled.status).toBe(400);
    expect(garbled.body.errors[0].path).toBe('If-Match');
    const missing = await as('editor').patch(`/api/v1/campaigns/${c.id}`).send({ notes: 'x' });
    expect(missing.status).toBe(400);
    expect(missing.body.errors[0].path).toBe('version');
  });
});

describe('roles', () => {
  it('when a viewer reads, then analysis, forecasts, measurements and the report are open but every write is 403', async () => {
    const c = await newCampaign();
    const [m] = await addRuns(c.id, screen([-30, -10, 10, 30]));
    const viewer = as('viewer');
    await viewer.get(`/api/v1/campaigns/${c.id}/analysis`).expect(200);
    await viewer.get(`/api/v1/campaigns/${c.id}/forecasts`).expect(200);
    await viewer.get(`/api/v1/campaigns/${c.id}/measurements`).expect(200);
    await viewer.get(`/api/v1/campaigns/${c.id}/report.xlsx`).expect(200);
    await viewer.get(`/api/v1/projects/${project.id}/comparison`).expect(200);
    expect((await viewer.post(`/api/v1/campaigns/${c.id}/measurements`).send(body(screen([0])[0]!))).status).toBe(403);
    expect((await viewer.patch(`/api/v1/campaigns/${c.id}`).send({ version: 1, notes: 'x' })).status).toBe(403);
    expect(
      (await viewer.put(`/api/v1/measurements/${m!.id}/exclusion`).send({ version: 1, excluded: true, reason: 'viewer tries' })).status,
    ).toBe(403);
    expect((await viewer.post(`/api/v1/campaigns/${c.id}/forecasts`).send({ temperature: C(-40) })).status).toBe(403);
    expect(
      (await viewer.post(`/api/v1/projects/${project.id}/campaigns`).send({ title: 'Viewer screen', measure: 'ee', assayMethod: 'nmr' }))
        .status,
    ).toBe(403);
    expect(await count('measurements', { campaignId: c.id })).toBe(4);
  });

  it('when someone outside the project asks, then every campaign address is 404, as if it did not exist', async () => {
    const c = await newCampaign();
    const [m] = await addRuns(c.id, screen([-30, 0, 30]));
    const outsider = as('outsider');
    for (const url of [
      `/api/v1/campaigns/${c.id}`,
      `/api/v1/campaigns/${c.id}/analysis`,
      `/api/v1/campaigns/${c.id}/report.xlsx`,
      `/api/v1/projects/${project.id}/comparison`,
    ]) {
      expect((await outsider.get(url)).status, url).toBe(404);
    }
    expect((await outsider.patch(`/api/v1/measurements/${m!.id}`).send({ version: 1, notes: 'x' })).status).toBe(404);
    expect((await as('editor').get('/api/v1/campaigns/not-a-uuid')).status).toBe(404);
    expect((await request(env.app).get(`/api/v1/campaigns/${c.id}`)).status).toBe(401);
  });
});

describe('measurements', () => {
  it('when runs are added, changed, excluded and deleted, then the list, versions and reasons follow', async () => {
    const c = await newCampaign();
    const [cold, warm] = await addRuns(c.id, [
      { celsius: 20, ee: 90.1, uncertainty: 0.4 },
      { celsius: -40, ee: 96.2 },
    ]);
    const list = await as('viewer').get(`/api/v1/campaigns/${c.id}/measurements`).expect(200);
    // Sorted by temperature: −40 °C first.
    expect(list.body.measurements.map((m: { temperatureK: number }) => m.temperatureK)).toEqual([233.15, 293.15]);

    const changed = await as('editor')
      .patch(`/api/v1/measurements/${cold!.id}`)
      .send({ version: 1, reason: 'reported as er by the analyst', selectivity: { measure: 'er', value: '95:5' } })
      .expect(200);
    expect(changed.body).toMatchObject({ version: 2, measure: 'er', value: 95, valueB: 5 });
    const stale = await as('editor').patch(`/api/v1/measurements/${cold!.id}`).send({ version: 1, reason: 'late note', notes: 'late' });
    expect(stale.status).toBe(409);
    expect(stale.body.currentVersion).toBe(2);

    const excluded = await as('editor')
      .put(`/api/v1/measurements/${warm!.id}/exclusion`)
      .send({ version: 1, excluded: true, reason: 'bath drifted to −35 °C' })
      .expect(200);
    expect(excluded.body).toMatchObject({ excluded: true, excludedReason: 'bath drifted to −35 °C', version: 2 });
    const noReason = await as('editor').put(`/api/v1/measurements/${warm!.id}/exclusion`).send({ version: 2, excluded: true });
    expect(noReason.status).toBe(400);
    expect(noReason.body.errors[0].path).toBe('reason');

    await as('editor').delete(`/api/v1/measurements/${warm!.id}?version=1&reason=bath%20failed`).expect(409);
    await as('editor').delete(`/api/v1/measurements/${warm!.id}?reason=bath%20failed`).set('If-Match', 'W/"2"').expect(204);
    expect(await count('measurements', { campaignId: c.id })).toBe(1);
  });

  it('when a batch holds one bad run, then 400 names measurements.<i>.<field> and nothing is stored', async () => {
    const c = await newCampaign();
    const runs = screen([-40, -20, 0]).map(body);
    const bad = await as('editor')
      .post(`/api/v1/campaigns/${c.id}/measurements/batch`)
      .send({ measurements: [runs[0], { ...runs[1], selectivity: { measure: 'ee', value: 100 } }, { ...runs[2], temperature: C(-300) }] });
    expect(bad.status).toBe(400);
    expect(bad.body.errors.map((e: { path: string }) => e.path)).toEqual([
      'measurements.1.selectivity.value',
      'measurements.2.temperature.value',
    ]);
    expect(await count('measurements', { campaignId: c.id })).toBe(0);

    const tooMany = await as('editor')
      .post(`/api/v1/campaigns/${c.id}/measurements/batch`)
      .send({ measurements: Array.from({ length: 5001 }, () => runs[0]) });
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.errors[0].path).toBe('measurements');

    const ok = await as('editor').post(`/api/v1/campaigns/${c.id}/measurements/batch`).send({ measurements: runs }).expect(201);
    expect(ok.body).toEqual({ created: 3 });
    expect(await count('measurements', { campaignId: c.id })).toBe(3);
    expect(await count('audit_events', { entityId: c.id, entityType: 'measurement_batch' })).toBe(1);
  });

  it('when several runs are changed in one request, then all are saved with their versions bumped and one history entry each', async () => {
    const c = await newCampaign();
    const [a, b] = await addRuns(c.id, [
      { celsius: -20, ee: 94.0 },
      { celsius: 0, ee: 91.0 },
    ]);
    const res = await as('editor')
      .patch(`/api/v1/campaigns/${c.id}/measurements`)
      .send({
        measurements: [
          { id: a!.id, version: 1, reason: 'typo in the ee', selectivity: { measure: 'ee', value: 94.5 } },
          { id: b!.id, version: 1, reason: 'bath was at −1 °C', temperature: C(-1), notes: 'probe checked' },
        ],
      })
      .expect(200);
    expect(res.body.measurements).toMatchObject([
      { id: a!.id, version: 2, value: 94.5 },
      { id: b!.id, version: 2, temperatureK: 272.15, notes: 'probe checked' },
    ]);
    const history = await testKnex()('audit_events').where({ campaignId: c.id, entityType: 'measurement', action: 'update' }).orderBy('id');
    expect(history.map((h: { entityId: string; reason: string }) => [h.entityId, h.reason])).toEqual([
      [a!.id, 'typo in the ee'],
      [b!.id, 'bath was at −1 °C'],
    ]);
  });

  it('when one row of a batched change is stale, then 409 names that row and no row is saved', async () => {
    const c = await newCampaign();
    const [a, b] = await addRuns(c.id, [
      { celsius: -20, ee: 94.0 },
      { celsius: 0, ee: 91.0 },
    ]);
    await as('owner').patch(`/api/v1/measurements/${b!.id}`).send({ version: 1, reason: 'someone else first', notes: 'x' }).expect(200);
    const stale = await as('editor')
      .patch(`/api/v1/campaigns/${c.id}/measurements`)
      .send({
        measurements: [
          { id: a!.id, version: 1, reason: 'fix', notes: 'mine' },
          { id: b!.id, version: 1, reason: 'fix', notes: 'mine too' },
        ],
      });
    expect(stale.status).toBe(409);
    expect(stale.body.detail).toMatch(/row 2 \(version 1, now 2\)/);
    expect(stale.body.staleRows).toEqual([{ path: 'measurements.1', id: b!.id, sentVersion: 1, currentVersion: 2 }]);
    const rows = await testKnex()('measurements').whereIn('id', [a!.id, b!.id]).orderBy('temperature_k');
    expect(rows.map((r: { version: number; notes: string | null }) => [r.version, r.notes])).toEqual([
      [1, null],
      [2, 'x'],
    ]);
  });

  it('when a batched change names a run of another campaign, repeats a run or has a bad field, then 400 names measurements.<i>.<field>', async () => {
    const c = await newCampaign();
    const other = await newCampaign();
    const [a] = await addRuns(c.id, [{ celsius: -20, ee: 94.0 }]);
    const [foreign] = await addRuns(other.id, [{ celsius: -20, ee: 94.0 }]);
    const send = (measurements: unknown[]) => as('editor').patch(`/api/v1/campaigns/${c.id}/measurements`).send({ measurements });
    const notHere = await send([
      { id: a!.id, version: 1, reason: 'fix', notes: 'ok' },
      { id: foreign!.id, version: 1, reason: 'fix', notes: 'not mine' },
    ]);
    expect(notHere.status).toBe(400);
    expect(notHere.body.errors).toEqual([{ path: 'measurements.1.id', message: expect.stringContaining('no measurement') }]);
    const twice = await send([
      { id: a!.id, version: 1, reason: 'fix', notes: 'one' },
      { id: a!.id, version: 1, reason: 'fix', notes: 'two' },
    ]);
    expect(twice.status).toBe(400);
    expect(twice.body.errors.map((e: { path: string }) => e.path)).toEqual(['measurements.1.id']);
    const bad = await send([{ id: a!.id, version: 1, reason: 'fix', selectivity: { measure: 'ee', value: 100 } }]);
    expect(bad.body.errors.map((e: { path: string }) => e.path)).toEqual(['measurements.0.selectivity.value']);
    const nothing = await send([{ id: a!.id, version: 1, reason: 'fix' }]);
    expect(nothing.status).toBe(400);
    expect(await testKnex()('measurements').where({ id: a!.id }).first()).toMatchObject({ version: 1, notes: null });
  });

  it('when the campaign is signed off, then a batched change is 409 and nothing is saved', async () => {
    const c = await newCampaign();
    const [a] = await addRuns(c.id, [{ celsius: -20, ee: 94.0 }]);
    await as('owner').post(`/api/v1/campaigns/${c.id}/sign-off`).send({ note: 'reviewed' }).expect(200);
    const locked = await as('editor')
      .patch(`/api/v1/campaigns/${c.id}/measurements`)
      .send({ measurements: [{ id: a!.id, version: 1, reason: 'late fix', notes: 'late' }] });
    expect(locked.status).toBe(409);
    expect(locked.body.detail).toMatch(/locked/);
    expect(await testKnex()('measurements').where({ id: a!.id }).first()).toMatchObject({ version: 1, notes: null });
  });
});

describe('imports', () => {
  /** Preview (guessing the mapping), then import with the mapping the preview settled on. */
  async function previewThenImport(campaignId: string, file: { name: string; buffer: Buffer }) {
    const preview = await as('editor')
      .post(`/api/v1/campaigns/${campaignId}/imports/preview`)
      .attach('file', file.buffer, file.name)
      .field('request', '{}');
    expect(preview.status).toBe(200);
    expect(preview.body.errorCount).toBe(0);
    expect(preview.body.mapping).not.toBeNull();
    const imported = await as('editor')
      .post(`/api/v1/campaigns/${campaignId}/imports`)
      .attach('file', file.buffer, file.name)
      .field('request', JSON.stringify({ mapping: preview.body.mapping, acknowledgeWarnings: preview.body.warningCount > 0 }));
    return { preview: preview.body, imported };
  }

  it.each(['kestrelmoor-skylark-screen.csv', 'kestrelmoor-merlin-screen-de.csv', 'kestrelmoor-skylark-methf-screen.xlsx'])(
    'when %s is previewed and imported, then every row is stored and the campaign can be analysed',
    async (name) => {
      const c = await newCampaign();
      const before = await count('measurements', { campaignId: c.id });
      const { preview, imported } = await previewThenImport(c.id, sample(name));
      expect(imported.status).toBe(201);
      expect(imported.body.inserted).toBe(preview.rowCount);
      expect(await count('measurements', { campaignId: c.id })).toBe(before + preview.rowCount);
      const analysis = await as('viewer').get(`/api/v1/campaigns/${c.id}/analysis`).expect(200);
      expect(analysis.body.fit).not.toBeNull();
      expect(analysis.body.points).toHaveLength(preview.rowCount);
      if (name.endsWith('.xlsx')) {
        // The −60 °C runs are "≥99.8" text cells: lower bounds, so censored rather than fitted.
        const cold = analysis.body.points.filter((p: { kelvin: number }) => Math.abs(p.kelvin - 213.15) < 1e-6);
        expect(cold.length).toBeGreaterThan(0);
        expect(cold.every((p: { status: string }) => p.status === 'censored')).toBe(true);
      }
    },
  );

  it('when the file with errors is imported, then 422 lists row and column issues and nothing is written', async () => {
    const c = await newCampaign();
    const file = sample('kestrelmoor-screen-with-errors.csv');
    const preview = await as('editor')
      .post(`/api/v1/campaigns/${c.id}/imports/preview`)
      .attach('file', file.buffer, file.name)
      .field('request', '{}')
      .expect(200);
    expect(preview.body.errorCount).toBeGreaterThan(0);
    const res = await as('editor')
      .post(`/api/v1/campaigns/${c.id}/imports`)
      .attach('file', file.buffer, file.name)
      .field(
        'request',
        JSON.stringify({
          mapping: preview.body.suggestedMapping.mapping ??
            preview.body.mapping ?? { columns: { temperature: 2, value: 3 }, temperatureUnit: 'C', measure: 'ee' },
          acknowledgeWarnings: true,
        }),
      );
    expect(res.status).toBe(422);
    expect(res.body.title).toBe('Import rejected');
    const errors = res.body.issues.filter((i: { severity: string }) => i.severity === 'error');
    // Row 4 lacks its temperature; row 6 has ee 104.2 % (samples/README.md).
    expect(errors.some((i: { row: number; column: string | null }) => i.row === 4 && i.column !== null)).toBe(true);
    expect(errors.some((i: { row: number; column: string | null }) => i.row === 6 && i.column !== null)).toBe(true);
    expect(await count('measurements', { campaignId: c.id })).toBe(0);
  });

  it('when no file is sent, then 400 names the form field', async () => {
    const c = await newCampaign();
    const res = await as('editor').post(`/api/v1/campaigns/${c.id}/imports/preview`).field('request', '{}');
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([{ path: 'file', message: 'a file is required' }]);
  });
});

describe('list of runs', () => {
  it('when a caller sends the list tag back, then the answer is 304 until a run is added, changed, excluded or removed', async () => {
    const c = await newCampaign();
    const stored = await addRuns(c.id, screen([-40, -20, 0]));
    const url = `/api/v1/campaigns/${c.id}/measurements`;

    const first = await as('viewer').get(url).expect(200);
    const tag = first.headers.etag as string;
    expect(tag).toMatch(/^W\/"m-[\w-]+"$/);
    expect(first.headers['cache-control']).toBe('private, no-store');
    expect(first.headers['content-type']).toMatch(/^application\/json/);
    expect(first.body.measurements).toHaveLength(3);
    // One entry serves every member: the runs say nothing about who asks.
    expect(JSON.stringify(first.body)).not.toMatch(/"role"/);
    await as('owner').get(url).set('If-None-Match', tag).expect(304);
    expect((await as('outsider').get(url).set('If-None-Match', tag)).status).toBe(404);

    // Each change to the runs is a new list, read back as the server now holds it.
    await as('editor')
      .patch(`/api/v1/measurements/${stored[0]!.id}`)
      .send({ version: 1, reason: 'sample id corrected', sampleId: 'S-17b' })
      .expect(200);
    const afterEdit = await as('viewer').get(url).set('If-None-Match', tag).expect(200);
    expect(afterEdit.body.measurements.find((m: { id: string }) => m.id === stored[0]!.id)).toMatchObject({
      sampleId: 'S-17b',
      version: 2,
    });

    await as('editor')
      .put(`/api/v1/measurements/${stored[1]!.id}/exclusion`)
      .send({ version: 1, excluded: true, reason: 'quench late' })
      .expect(200);
    const afterExclusion = await as('viewer')
      .get(url)
      .set('If-None-Match', afterEdit.headers.etag as string)
      .expect(200);
    expect(afterExclusion.body.measurements.find((m: { id: string }) => m.id === stored[1]!.id)).toMatchObject({ excluded: true });

    const [added] = await addRuns(c.id, screen([20]));
    const afterAdd = await as('viewer')
      .get(url)
      .set('If-None-Match', afterExclusion.headers.etag as string)
      .expect(200);
    expect(afterAdd.body.measurements).toHaveLength(4);

    await as('editor').delete(`/api/v1/measurements/${added!.id}?version=1&reason=duplicate%20entry`).expect(204);
    const afterDelete = await as('viewer')
      .get(url)
      .set('If-None-Match', afterAdd.headers.etag as string)
      .expect(200);
    expect(afterDelete.body.measurements.map((m: { id: string }) => m.id)).toEqual(
      afterExclusion.body.measurements.map((m: { id: string }) => m.id),
    );
    await as('viewer')
      .get(url)
      .set('If-None-Match', afterDelete.headers.etag as string)
      .expect(304);
  });
});

describe('analysis', () => {
  it('when a caller sends the analysis tag back, then the answer is 304 until the campaign, a run or the query changes', async () => {
    const c = await newCampaign({ defaultUncertainty: 0.3 });
    const stored = await addRuns(c.id, screen([-60, -40, -20, 0, 20]));
    const url = `/api/v1/campaigns/${c.id}/analysis`;

    const first = await as('viewer').get(url).expect(200);
    const tag = first.headers.etag as string;
    expect(tag).toMatch(/^W\/"a-[\w-]+"$/);
    expect(first.headers['cache-control']).toBe('private, no-store');
    // The tag is shared by every member, which is only sound while the body says nothing about the caller.
    expect(JSON.stringify(first.body)).not.toMatch(/"role"/);
    expect(analysisResponseSchema.parse(first.body).points).toHaveLength(5);

    const again = await as('viewer').get(url).set('If-None-Match', tag).expect(304);
    expect(again.text).toBe('');
    await as('owner').get(url).set('If-None-Match', tag).expect(304);
    // Someone outside the project learns nothing, tag or not.
    expect((await as('outsider').get(url).set('If-None-Match', tag)).status).toBe(404);

    // Another query is another analysis.
    const other = await as('viewer').get(`${url}?confidence=0.9`).set('If-None-Match', tag).expect(200);
    expect(other.headers.etag).not.toBe(tag);

    // A changed run does not bump the campaign's version, yet the cached analysis must go.
    await as('editor')
      .patch(`/api/v1/measurements/${stored[0]!.id}`)
      .send({ version: 1, reason: 'assay re-run', selectivity: { measure: 'ee', value: 50 } })
      .expect(200);
    const afterEdit = await as('viewer').get(url).set('If-None-Match', tag).expect(200);
    expect(afterEdit.headers.etag).not.toBe(tag);
    expect(afterEdit.body.points.find((p: { measurementId: string }) => p.measurementId === stored[0]!.id).eePercent).toBeCloseTo(50, 9);

    const added = await addRuns(c.id, screen([30]));
    const afterAdd = await as('viewer')
      .get(url)
      .set('If-None-Match', afterEdit.headers.etag as string)
      .expect(200);
    expect(afterAdd.body.points).toHaveLength(6);

    await as('editor').delete(`/api/v1/measurements/${added[0]!.id}?version=1&reason=duplicate%20entry`).expect(204);
    const afterDelete = await as('viewer')
      .get(url)
      .set('If-None-Match', afterAdd.headers.etag as string)
      .expect(200);
    expect(afterDelete.body.points).toHaveLength(5);

    // A new campaign version (its default precision weights the fit) is a new analysis too.
    await as('editor').patch(`/api/v1/campaigns/${c.id}`).send({ version: 1, defaultUncertainty: 0.5 }).expect(200);
    const afterCampaign = await as('viewer')
      .get(url)
      .set('If-None-Match', afterDelete.headers.etag as string)
      .expect(200);
    expect(afterCampaign.body.campaignVersion).toBe(2);
    await as('viewer')
      .get(url)
      .set('If-None-Match', afterCampaign.headers.etag as string)
      .expect(304);
  });

  it('when a campaign is analysed, then the fit equals POST /api/v1/fit on the same runs, excluded run included', async () => {
    const c = await newCampaign();
    const runs = screen([-60, -40, -20, 0, 20, 40]).map((r, i) => ({ ...r, uncertainty: 0.2 + 0.05 * i }));
    const stored = await addRuns(c.id, runs);
    await as('editor')
      .put(`/api/v1/measurements/${stored[2]!.id}/exclusion`)
      .send({ version: 1, excluded: true, reason: 'sample warmed before quench' })
      .expect(200);

    const res = await as('viewer').get(`/api/v1/campaigns/${c.id}/analysis?weighting=uncertainty&confidence=0.9&at=-70`).expect(200);
    const a = analysisResponseSchema.parse(res.body);
    expect(a.curve).toHaveLength(60);
    // The curve spans the measured range ± 15 K, evenly in 1/T [C].
    expect(a.curve[0]!.kelvin).toBeCloseTo(213.15 - 15, 9);
    expect(a.curve[59]!.kelvin).toBeCloseTo(313.15 + 15, 9);
    expect(1 / a.curve[1]!.kelvin - 1 / a.curve[0]!.kelvin).toBeCloseTo(1 / a.curve[2]!.kelvin - 1 / a.curve[1]!.kelvin, 12);
    expect(a.at!.celsius).toBeCloseTo(-70, 9);

    const reference = await statelessFit(
      runs.map((r, i) => ({ ...r, excluded: i === 2 })),
      { weighting: 'uncertainty', confidence: 0.9 },
      [...a.curve.map((p) => p.kelvin), a.at!.kelvin],
    );
    const fit = a.fit!;
    for (const key of [
      'n',
      'dof',
      'slope',
      'intercept',
      'covariance',
      'correlation',
      'rSquared',
      'ddH',
      'ddS',
      'ddGAt25C',
      'twoBranch',
      'predictions',
    ] as const) {
      expect(fit[key], key).toEqual(reference[key]);
    }
    // Warnings are the same, except that extrapolation is reported for the asked temperature
    // only, not for the drawing grid that runs past the data on purpose.
    const codes = (list: { code: string }[]) => list.map((w) => w.code);
    expect(codes(fit.warnings)).toEqual(codes(reference.warnings));
    expect(fit.warnings.find((w) => w.code === 'extrapolation')!.message).toMatch(/^−?70\.0 °C lies outside/);
    expect(fit.residuals.map((r) => [r.lnRatio, r.residual, r.studentized, r.status])).toEqual(
      reference.residuals.map((r: { lnRatio: number; residual: number; studentized: number; status: string }) => [
        r.lnRatio,
        r.residual,
        r.studentized,
        r.status,
      ]),
    );
    expect(a.points[2]).toMatchObject({
      measurementId: stored[2]!.id,
      status: 'excluded',
      exclusionReason: 'sample warmed before quench',
      label: 'KL-T3',
    });
    expect(fit.n).toBe(5);
  });

  it('when a run is stored as "at least", then it is a censored bound in a censored fit, with the least-squares fit without it alongside', async () => {
    const c = await newCampaign();
    const runs = screen([-50, -30, -10, 10, 30]);
    await addRuns(c.id, runs);
    const bound99: Run = { celsius: -70, ee: 99.0, atLeast: true };
    await addRuns(c.id, [bound99]);
    const a = analysisResponseSchema.parse((await as('viewer').get(`/api/v1/campaigns/${c.id}/analysis`).expect(200)).body);
    const bound = a.points.find((p) => Math.abs(p.celsius + 70) < 1e-9)!;
    expect(bound.status).toBe('censored');
    const withoutBound = await statelessFit(runs, {}, []);
    const withBound = await statelessFit([...runs, bound99], {}, []);
    expect(a.fit!.n).toBe(5);
    expect(a.fit!.estimator).toBe('censored-ml');
    expect(a.fit!.ddH).toEqual(withBound.ddH);
    expect(a.fit!.leastSquaresWithoutBounds!.ddH).toEqual(withoutBound.ddH);
    expect(a.fit!.leastSquaresWithoutBounds!.label).toMatch(/bounds dropped/);
    // The line predicts more than 99.0 % ee at −70 °C, so the bound agrees and the run is not flagged [C].
    expect(bound.flagged).toBe(false);
  });

  it('when runs lack an uncertainty, then weighting uses the campaign default; without one, the analysis says why', async () => {
    const withDefault = await newCampaign({ defaultUncertainty: 0.3 });
    const runs = screen([-40, -20, 0, 20]);
    await addRuns(withDefault.id, runs);
    const a = (await as('viewer').get(`/api/v1/campaigns/${withDefault.id}/analysis?weighting=uncertainty`).expect(200)).body;
    const reference = await statelessFit(
      runs.map((r) => ({ ...r, uncertainty: 0.3 })),
      { weighting: 'uncertainty' },
      a.curve.map((p: { kelvin: number }) => p.kelvin),
    );
    expect(a.fit.ddH).toEqual(reference.ddH);
    expect(a.fit.predictions).toEqual(reference.predictions);
    // ln r ± σ(ln r) with σ(ln r) = 2σ_ee/(1 − ee²) [S: api/science/README.md §3 error propagation].
    const p0 = a.points[0];
    const ee = runs[0]!.ee / 100;
    expect(p0.lnRatioHigh - p0.lnRatio).toBeCloseTo((2 * 0.003) / (1 - ee * ee), 10);

    const noDefault = await newCampaign();
    await addRuns(noDefault.id, runs);
    const b = (await as('viewer').get(`/api/v1/campaigns/${noDefault.id}/analysis?weighting=uncertainty`).expect(200)).body;
    expect(b.fit).toBeNull();
    expect(b.problem.code).toBe('sigma-missing');
    expect(b.problem.message).toContain('-40.00 °C (KL-T1)');
    expect(b.curve).toEqual([]);
    expect(b.points).toHaveLength(4);
  });

  it('when there is only one temperature or no run, then there is no fit and the problem says so', async () => {
    const empty = await newCampaign();
    const e = (await as('viewer').get(`/api/v1/campaigns/${empty.id}/analysis`).expect(200)).body;
    expect(e).toMatchObject({ fit: null, problem: { code: 'no-measurements' }, curve: [], at: null, points: [] });
    await addRuns(empty.id, [
      { celsius: 0, ee: 95 },
      { celsius: 0, ee: 95.2 },
    ]);
    const one = (await as('viewer').get(`/api/v1/campaigns/${empty.id}/analysis?at=-20`).expect(200)).body;
    expect(one).toMatchObject({ fit: null, problem: { code: 'too-few-temperatures' }, at: null });
    expect(one.caution).toContain('calorimetry');
  });

  it('when the campaign sets the assay precision of a new run and the quantitation limit, then the analysis uses them and the query can override them', async () => {
    const c = await newCampaign({ newRunUncertainty: 0.25, quantitationLimit: 99.5 });
    await addRuns(c.id, screen([-60, -40, -20, 0, 20]));
    const a = analysisResponseSchema.parse((await as('viewer').get(`/api/v1/campaigns/${c.id}/analysis?at=-70`).expect(200)).body);
    expect(a.fit!.newRun).toMatchObject({ source: 'assay', measure: 'ee', uncertainty: 0.25 });
    expect(a.fit!.newRun!.note).toMatch(/campaign's setting/);
    expect(a.fit!.quantitationLimit).toMatchObject({ measure: 'ee', value: 99.5 });
    expect(a.at!.newRunSigmaLnR).toEqual(expect.any(Number));
    const b = analysisResponseSchema.parse(
      (await as('viewer').get(`/api/v1/campaigns/${c.id}/analysis?newRunUncertainty=0.4&quantitationLimit=99.9`).expect(200)).body,
    );
    expect(b.fit!.newRun).toMatchObject({ uncertainty: 0.4 });
    expect(b.fit!.quantitationLimit).toMatchObject({ value: 99.9 });
    const bad = await as('viewer').get(`/api/v1/campaigns/${c.id}/analysis?quantitationLimit=150`).expect(400);
    expect(bad.body.errors.map((e: { path: string }) => e.path)).toEqual(['quantitationLimit']);
  });

  it('when a quantitation limit does not suit the campaign measure, then 400 names quantitationLimit and nothing changes', async () => {
    const created = await as('editor')
      .post(`/api/v1/projects/${project.id}/campaigns`)
      .send({ title: `Limit ${randomBytes(3).toString('hex')}`, measure: 'ee', assayMethod: 'chiral-hplc', quantitationLimit: 100 });
    expect(created.status).toBe(400);
    expect(created.body.errors.map((e: { path: string }) => e.path)).toEqual(['quantitationLimit']);
    const dr = await newCampaign({ measure: 'dr', quantitationLimit: 200 });
    const changed = await as('editor').patch(`/api/v1/campaigns/${dr.id}`).send({ version: dr.version, measure: 'ee' });
    expect(changed.status).toBe(400);
    expect(changed.body.errors.map((e: { path: string }) => e.path)).toEqual(['quantitationLimit']);
    const again = await as('viewer').get(`/api/v1/campaigns/${dr.id}`).expect(200);
    expect(again.body).toMatchObject({ measure: 'dr', quantitationLimit: 200, version: dr.version });
  });

  it('when the query is wrong, then 400 names the parameter', async () => {
    const c = await newCampaign();
    for (const [query, path] of [
      ['confidence=2', 'confidence'],
      ['weighting=heavy', 'weighting'],
      ['at=-300', 'at'],
      ['at=cold', 'at'],
    ] as const) {
      const res = await as('viewer').get(`/api/v1/campaigns/${c.id}/analysis?${query}`);
      expect(res.status, query).toBe(400);
      expect(res.body.errors[0].path, query).toBe(path);
    }
  });
});

describe('saved forecasts', () => {
  it('when a forecast is saved and a run is later measured near it, then the list compares them', async () => {
    const c = await newCampaign();
    await addRuns(c.id, screen([-40, -20, 0, 20, 40]));
    const analysis = (await as('viewer').get(`/api/v1/campaigns/${c.id}/analysis?at=-60`).expect(200)).body;

    // A result sent by the client is refused: the server computes it.
    const forged = await as('editor')
      .post(`/api/v1/campaigns/${c.id}/forecasts`)
      .send({ temperature: C(-60), result: { eePercent: 100 } });
    expect(forged.status).toBe(400);

    const saved = await as('editor')
      .post(`/api/v1/campaigns/${c.id}/forecasts`)
      .send({ temperature: C(-60), label: 'Plant jacket limit' })
      .expect(201);
    const view = savedForecastViewSchema.parse(saved.body);
    expect(view.result).toEqual(analysis.at);
    expect(view).toMatchObject({
      label: 'Plant jacket limit',
      temperatureK: 213.15,
      createdBy: { id: users.editor.id, login: users.editor.login },
      measured: [],
    });

    // Two later runs within 1 K: one on the line, one far below it.
    const lnR = 12_000 / (R * 213.65) - 5 / R; // [C] the screen's own model at −59.5 °C
    const onLine = Math.round(100 * Math.tanh(lnR / 2) * 100) / 100;
    await addRuns(c.id, [
      { celsius: -59.5, ee: onLine },
      { celsius: -60.8, ee: 80 },
      { celsius: -62, ee: 99 }, // 1.85 K away: not compared
    ]);
    const list = await as('viewer').get(`/api/v1/campaigns/${c.id}/forecasts`).expect(200);
    const [first] = list.body.forecasts;
    expect(first.id).toBe(view.id);
    expect(first.result).toEqual(view.result); // the snapshot, not a recomputation
    const byEe = Object.fromEntries(
      first.measured.map((m: { eePercent: number; insidePredictionInterval: boolean | null }) => [
        m.eePercent.toFixed(2),
        m.insidePredictionInterval,
      ]),
    );
    expect(Object.keys(byEe)).toHaveLength(2);
    expect(byEe[onLine.toFixed(2)]).toBe(true);
    expect(byEe['80.00']).toBe(false);

    await as('viewer').delete(`/api/v1/forecasts/${view.id}`).expect(403);
    await as('editor').delete(`/api/v1/forecasts/${view.id}`).expect(204);
    expect((await as('viewer').get(`/api/v1/campaigns/${c.id}/forecasts`).expect(200)).body.forecasts).toEqual([]);
  });

  it('when the campaign cannot be fitted, then saving a forecast is 422 and stores nothing', async () => {
    const c = await newCampaign();
    await addRuns(c.id, [{ celsius: 0, ee: 90 }]);
    const res = await as('editor')
      .post(`/api/v1/campaigns/${c.id}/forecasts`)
      .send({ temperature: C(-20) });
    expect(res.status).toBe(422);
    expect(res.body.errors[0].path).toBe('temperature');
    expect(await count('savedForecasts', { campaignId: c.id })).toBe(0);
  });
});

describe('project comparison', () => {
  it('when two campaigns are compared at one temperature, then each carries its own prediction there', async () => {
    const p = await createProject([
      { user: users.editor, role: 'editor' },
      { user: users.viewer, role: 'viewer' },
    ]);
    const a = await newCampaign({ title: 'Catalyst A in toluene' }, p.id);
    const b = await newCampaign({ title: 'Catalyst B in toluene' }, p.id);
    await addRuns(a.id, screen([-40, -20, 0, 20]));
    await addRuns(b.id, screen([-40, 0], 0));
    const res = await as('viewer').get(`/api/v1/projects/${p.id}/comparison?at=-30`).expect(200);
    const cmp = comparisonResponseSchema.parse(res.body);
    expect(cmp.at.kelvin).toBeCloseTo(243.15, 9);
    expect(cmp.campaigns.map((x) => x.title)).toEqual(['Catalyst A in toluene', 'Catalyst B in toluene']);
    const single = (await as('viewer').get(`/api/v1/campaigns/${a.id}/analysis?at=-30`).expect(200)).body;
    expect(cmp.campaigns[0]!.prediction).toEqual(single.at);
    expect(cmp.campaigns[0]!.ddH!['kJ/mol']).toBe(single.fit.ddH['kJ/mol']);
    // Two exact runs recover the generating ΔΔH‡ = 12 kJ/mol to the rounding of ee [C].
    expect(cmp.campaigns[1]!.ddH!['kJ/mol']).toBeCloseTo(12, 0);
    expect(cmp.campaigns[1]!.n).toBe(2);
    expect((await as('viewer').get(`/api/v1/projects/${p.id}/comparison?at=-274`)).status).toBe(400);
  });
});

describe('one grammar for selectivities on every entry point', () => {
  const fitBody = (selectivity: object) => ({
    measurements: [
      { temperature: C(-20), selectivity: { measure: 'ee', value: 95 } },
      { temperature: C(0), selectivity: { measure: 'ee', value: 92 } },
      { temperature: C(20), selectivity },
    ],
  });
  const forecastBody = (selectivity: object) => ({
    basis: { kind: 'observed', selectivity, temperature: C(0) },
    temperatures: { values: [C(-10)] },
  });
  const runBody = (selectivity: object) => ({ temperature: C(20), selectivity });

  async function statuses(selectivity: object) {
    const c = await newCampaign({ measure: (selectivity as { measure: string }).measure });
    const fit = await request(env.app).post('/api/v1/fit').send(fitBody(selectivity));
    const forecast = await request(env.app).post('/api/v1/forecast').send(forecastBody(selectivity));
    const run = await as('editor').post(`/api/v1/campaigns/${c.id}/measurements`).send(runBody(selectivity));
    return {
      fit: fit.status,
      forecast: forecast.status,
      run: run.status,
      paths: [fit, forecast, run].map((r) => r.body.errors?.[0]?.path ?? null),
    };
  }

  it('when ee is 100, then /fit, /forecast and a campaign run all answer 400 naming the value', async () => {
    const s = await statuses({ measure: 'ee', value: 100 });
    expect([s.fit, s.forecast, s.run]).toEqual([400, 400, 400]);
    expect(s.paths).toEqual(['measurements.2.selectivity.value', 'basis.selectivity.value', 'selectivity.value']);
  });

  it('when a ratio is written ".5:1", then every entry point reads it as 0.5', async () => {
    const s = await statuses({ measure: 'ratio', value: '.5:1' });
    expect([s.fit, s.forecast, s.run]).toEqual([200, 200, 201]);
  });

  it.each(['0x10', '0b1', '0o7', '1e2:1', '-1:2'])('when a dr string is "%s", then every entry point answers 400', async (value) => {
    const s = await statuses({ measure: 'dr', value });
    expect([s.fit, s.forecast, s.run]).toEqual([400, 400, 400]);
  });

  it('when a calculator run is a bound ("≥ 99.8"), then /fit censors it as the campaign analysis does', async () => {
    const body = fitBody({ measure: 'ee', value: 99.8, atLeast: true });
    body.measurements[2]!.temperature = C(-60);
    const fit = await request(env.app).post('/api/v1/fit').send(body).expect(200);
    const bound = fit.body.residuals.find((r: { index: number }) => r.index === 2);
    expect(bound.status).toBe('censored');
    expect(fit.body.residuals.filter((r: { status: string }) => r.status === 'fitted')).toHaveLength(2);
  });
});
