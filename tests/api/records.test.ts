import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash, randomBytes } from 'node:crypto';
import { closeTestKnex, testKnex } from '../support/db';
import { signInEach, startAuthApp, type AuthTestApp, type SignedInRequests } from '../support/auth';
import { createUser } from '../factories/users';
import { createTeamProjects } from '../factories/projects';
import { sample } from '../unit/imports/helpers';
import { loadReportData } from '../../api/features/campaigns/report-data';
import type { User } from '../../api/models/user';
import type { Project } from '../../api/models/project';

type Who = 'owner' | 'editor' | 'viewer' | 'outsider';

let env: AuthTestApp;
let users: Record<Who, User>;
let project: Project;
let as: (who: Who) => SignedInRequests;

beforeAll(async () => {
  env = await startAuthApp();
  users = {
    owner: await createUser({ name: 'Ada Okafor' }),
    editor: await createUser({ name: 'Tomás Reyes' }),
    viewer: await createUser({ name: 'Ines Lund' }),
    outsider: await createUser(),
  };
  ({ project } = await createTeamProjects(users));
  as = await signInEach(env.app, users);
});

afterAll(async () => {
  await env?.close();
  await closeTestKnex();
});

const C = (value: number) => ({ value, unit: 'C' as const });
const UUID_IN_TEXT = /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/i;

async function newCampaign(who: Who = 'editor', title = `Records screen ${randomBytes(3).toString('hex')}`) {
  const res = await as(who)
    .post(`/api/v1/projects/${project.id}/campaigns`)
    .send({ title, productNameA: '(S)-amine', productNameB: '(R)-amine', measure: 'ee', assayMethod: 'chiral-hplc' });
  expect(res.status).toBe(201);
  return res.body as { id: string; version: number; title: string };
}

async function addRun(
  campaignId: string,
  run: { celsius: number; ee: number; sampleId?: string; replicateLabel?: string },
  who: Who = 'editor',
) {
  const res = await as(who)
    .post(`/api/v1/campaigns/${campaignId}/measurements`)
    .send({
      temperature: C(run.celsius),
      selectivity: { measure: 'ee', value: run.ee },
      sampleId: run.sampleId,
      replicateLabel: run.replicateLabel,
    });
  expect(res.status).toBe(201);
  return res.body as { id: string; version: number };
}

async function history(campaignId: string, who: Who = 'viewer') {
  const res = await as(who).get(`/api/v1/campaigns/${campaignId}/history?limit=200`).expect(200);
  return (res.body.entries as { sentence: string; who: string; reason: string | null }[]).map((e) => e.sentence);
}

/** Preview with the guessed mapping, then import (confirming warnings when asked to). */
async function importFile(campaignId: string, file: { name: string; buffer: Buffer }, acknowledge: boolean, who: Who = 'editor') {
  const preview = await as(who)
    .post(`/api/v1/campaigns/${campaignId}/imports/preview`)
    .attach('file', file.buffer, file.name)
    .field('request', '{}');
  expect(preview.status).toBe(200);
  const imported = await as(who)
    .post(`/api/v1/campaigns/${campaignId}/imports`)
    .attach('file', file.buffer, file.name)
    .field('request', JSON.stringify({ mapping: preview.body.mapping, acknowledgeWarnings: acknowledge }));
  return { preview: preview.body, imported };
}

describe('history as sentences', () => {
  it('when a run is changed with a reason, then the campaign history says who changed what from what to what, and why', async () => {
    const c = await newCampaign();
    const run = await addRun(c.id, { celsius: -20, ee: 98.7, sampleId: 'KL-12', replicateLabel: 'a' });
    await as('editor')
      .patch(`/api/v1/measurements/${run.id}`)
      .send({ version: 1, reason: 'integration corrected', selectivity: { measure: 'ee', value: 98.9 } })
      .expect(200);
    const sentences = await history(c.id);
    expect(sentences[0]).toBe('Tomás Reyes changed run KL-12 a at −20 °C: ee 98.7 → 98.9 %, reason: integration corrected.');
    expect(sentences[1]).toBe('Tomás Reyes added run KL-12 a at −20 °C: ee 98.7 %.');
    expect(sentences[2]).toBe(`Tomás Reyes created campaign “${c.title}”.`);
  });

  it('when every kind of change happens to a campaign, then each has its own sentence with no ids and no JSON', async () => {
    const c = await newCampaign();
    const run = await addRun(c.id, { celsius: 0, ee: 91.5, sampleId: 'S-7' });
    await as('editor')
      .patch(`/api/v1/measurements/${run.id}`)
      .send({ version: 1, reason: 'bath log read again', temperature: C(-2.5), conversionPercent: 45 })
      .expect(200);
    await as('editor')
      .put(`/api/v1/measurements/${run.id}/exclusion`)
      .send({ version: 2, excluded: true, reason: 'sample warmed before quench' })
      .expect(200);
    await as('editor').put(`/api/v1/measurements/${run.id}/exclusion`).send({ version: 3, excluded: false }).expect(200);
    await as('editor')
      .delete(`/api/v1/measurements/${run.id}?version=4&reason=${encodeURIComponent('entered in the wrong campaign')}`)
      .expect(204);
    await as('editor')
      .post(`/api/v1/campaigns/${c.id}/measurements/batch`)
      .send({ measurements: [-40, -20, 0, 20].map((t, i) => ({ temperature: C(t), selectivity: { measure: 'ee', value: 96 - 4 * i } })) })
      .expect(201);
    await importFile(c.id, sample('kestrelmoor-skylark-screen.csv'), true);
    await as('editor').patch(`/api/v1/campaigns/${c.id}`).send({ version: 1, status: 'completed' }).expect(200);
    await as('editor')
      .post(`/api/v1/campaigns/${c.id}/forecasts`)
      .send({ temperature: C(-30), label: 'pilot plant' })
      .expect(201);

    const sentences = await history(c.id);
    expect(sentences.slice(0, 9).reverse()).toEqual([
      'Tomás Reyes added run S-7 at 0 °C: ee 91.5 %.',
      'Tomás Reyes changed run S-7 at 0 °C: temperature 0 → −2.5 °C, conversion none → 45 %, reason: bath log read again.',
      'Tomás Reyes excluded run S-7 at −2.5 °C from the fit, reason: sample warmed before quench.',
      'Tomás Reyes brought run S-7 at −2.5 °C back into the fit.',
      'Tomás Reyes deleted run S-7 at −2.5 °C (ee 91.5 %), reason: entered in the wrong campaign.',
      'Tomás Reyes added 4 runs by typing or pasting.',
      // The sample screen: 12 rows at 6 temperatures from −20 to 40 °C [samples/kestrelmoor-skylark-screen.csv].
      'Tomás Reyes imported 12 runs from “kestrelmoor-skylark-screen.csv” (at 6 temperatures, −20 to 40 °C).',
      'Tomás Reyes changed campaign “' + c.title + '”: status active → completed.',
      'Tomás Reyes saved a forecast “pilot plant” at −30 °C.',
    ]);
    for (const s of sentences) {
      expect(s).not.toMatch(UUID_IN_TEXT);
      expect(s).not.toMatch(/[{}[\]]|camelCase|temperatureK|null|undefined|NaN/);
    }
  });

  it('when the project history is read, then campaign sentences name their campaign and membership changes read as sentences', async () => {
    const c = await newCampaign();
    await addRun(c.id, { celsius: 10, ee: 88, sampleId: 'P-1' });
    const guest = await createUser({ name: 'Mira Hallstrom' });
    await testKnex()('projectMembers').insert({ projectId: project.id, userId: guest.id, role: 'viewer' });
    await as('owner').patch(`/api/v1/projects/${project.id}/members/${guest.id}`).send({ role: 'editor' }).expect(200);
    await as('owner').delete(`/api/v1/projects/${project.id}/members/${guest.id}`).expect(204);
    const res = await as('owner').get(`/api/v1/projects/${project.id}/history?limit=20`).expect(200);
    const sentences = (res.body.entries as { sentence: string }[]).map((e) => e.sentence);
    expect(sentences.slice(0, 3)).toEqual([
      'Ada Okafor removed Mira Hallstrom (editor) from the project.',
      'Ada Okafor changed the role of Mira Hallstrom: viewer → editor.',
      `Tomás Reyes added run P-1 at 10 °C to “${c.title}”: ee 88 %.`,
    ]);
    expect((await as('editor').get(`/api/v1/projects/${project.id}/history`)).status).toBe(403);
  });

  it('when the history is exported, then the CSV has one line per change with time, person, sentence and reason', async () => {
    const c = await newCampaign();
    const run = await addRun(c.id, { celsius: -20, ee: 97.1, sampleId: '=HYPERLINK("x")' });
    await as('editor')
      .patch(`/api/v1/measurements/${run.id}`)
      .send({ version: 1, reason: 'peak, re-integrated', notes: 'checked' })
      .expect(200);
    const res = await as('viewer')
      .get(`/api/v1/campaigns/${c.id}/history.csv`)
      .buffer(true)
      .parse((r, cb) => {
        let text = '';
        r.on('data', (d: Buffer) => (text += d.toString('utf8')));
        r.on('end', () => cb(null, text));
      });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename=.*-history\.csv$/);
    const lines = (res.body as string)
      .replace(/^\uFEFF/, '')
      .trimEnd()
      .split('\r\n');
    expect(lines[0]).toBe('When (UTC),Who,What happened,Reason');
    expect(lines).toHaveLength(4);
    expect(lines[1]).toMatch(
      /^\d{4}-\d\d-\d\d \d\d:\d\d:\d\d,Tomás Reyes,"Tomás Reyes changed run =HYPERLINK\(""x""\) at −20 °C: notes none → “checked”, reason: peak, re-integrated\.","peak, re-integrated"$/,
    );
  });
});

describe('reasons for changes to stored measurements', () => {
  it('when a run is edited or deleted without a reason, then 400 names reason and nothing changes', async () => {
    const c = await newCampaign();
    const run = await addRun(c.id, { celsius: 5, ee: 90 });
    const edit = await as('editor').patch(`/api/v1/measurements/${run.id}`).send({ version: 1, notes: 'x' });
    expect(edit.status).toBe(400);
    expect(edit.body.errors).toEqual([{ path: 'reason', message: 'give a reason (kept in the history)' }]);
    const short = await as('editor').patch(`/api/v1/measurements/${run.id}`).send({ version: 1, reason: ' a ', notes: 'x' });
    expect(short.body.errors[0]).toEqual({ path: 'reason', message: 'give a reason (at least 3 characters)' });
    const del = await as('editor').delete(`/api/v1/measurements/${run.id}?version=1`);
    expect(del.status).toBe(400);
    expect(del.body.errors[0].path).toBe('reason');
    const stored = await testKnex()('measurements').where({ id: run.id }).first('version', 'notes');
    expect(stored).toEqual({ version: 1, notes: null });
  });
});

describe('sign-off', () => {
  it('when the last editor tries to sign off, then 409 says another person must', async () => {
    const c = await newCampaign();
    await addRun(c.id, { celsius: 0, ee: 90 });
    const res = await as('editor').post(`/api/v1/campaigns/${c.id}/sign-off`).send({});
    expect(res.status).toBe(409);
    expect(res.body.detail).toBe(`You made the last change to “${c.title}”; another owner or editor of the project must sign it off.`);
    expect((await as('viewer').post(`/api/v1/campaigns/${c.id}/sign-off`).send({})).status).toBe(403);
  });

  it('when another member signs off, then every change to measurements is refused with 409 until it is reopened with a reason', async () => {
    const c = await newCampaign();
    const run = await addRun(c.id, { celsius: 0, ee: 90, sampleId: 'L-1' });
    const signed = await as('owner').post(`/api/v1/campaigns/${c.id}/sign-off`).send({ note: 'fit reviewed' }).expect(200);
    expect(signed.body.signOff).toMatchObject({ by: 'Ada Okafor', note: 'fit reviewed' });
    const view = await as('viewer').get(`/api/v1/campaigns/${c.id}`).expect(200);
    expect(view.body.signOff).toMatchObject({ by: 'Ada Okafor', note: 'fit reviewed', byUserId: users.owner.id });

    const day = new Date().toISOString().slice(0, 10);
    const locked = `“${c.title}” was signed off by Ada Okafor on ${day}; its measurements are locked. An owner or editor can reopen it, giving a reason, to change them.`;
    const attempts = [
      await as('editor').patch(`/api/v1/measurements/${run.id}`).send({ version: 1, reason: 'late fix', notes: 'x' }),
      await as('editor').put(`/api/v1/measurements/${run.id}/exclusion`).send({ version: 1, excluded: true, reason: 'late' }),
      await as('editor').delete(`/api/v1/measurements/${run.id}?version=1&reason=late`),
      await as('editor')
        .post(`/api/v1/campaigns/${c.id}/measurements`)
        .send({ temperature: C(10), selectivity: { measure: 'ee', value: 85 } }),
      await as('editor')
        .post(`/api/v1/campaigns/${c.id}/measurements/batch`)
        .send({ measurements: [{ temperature: C(10), selectivity: { measure: 'ee', value: 85 } }] }),
      (await importFile(c.id, sample('kestrelmoor-skylark-screen.csv'), true)).imported,
    ];
    for (const res of attempts) {
      expect(res.status).toBe(409);
      expect(res.body.detail).toBe(locked);
    }
    expect(await testKnex()('measurements').where({ campaignId: c.id }).count({ n: '*' }).first()).toEqual({ n: 1 });
    expect(await testKnex()('importFiles').where({ campaignId: c.id }).count({ n: '*' }).first()).toEqual({ n: 0 });

    const again = await as('editor').post(`/api/v1/campaigns/${c.id}/sign-off`).send({});
    expect(again.status).toBe(409);
    const noReason = await as('editor').post(`/api/v1/campaigns/${c.id}/reopen`).send({});
    expect(noReason.status).toBe(400);
    expect(noReason.body.errors[0].path).toBe('reason');
    const reopened = await as('editor').post(`/api/v1/campaigns/${c.id}/reopen`).send({ reason: 'one run re-integrated' }).expect(200);
    expect(reopened.body.signOff).toBeNull();
    await as('editor').patch(`/api/v1/measurements/${run.id}`).send({ version: 1, reason: 'late fix', notes: 'x' }).expect(200);

    const sentences = await history(c.id);
    expect(sentences.slice(0, 3)).toEqual([
      'Tomás Reyes changed run L-1 at 0 °C: notes none → “x”, reason: late fix.',
      `Tomás Reyes reopened campaign “${c.title}” (signed off by Ada Okafor on ${day}), reason: one run re-integrated.`,
      `Ada Okafor signed off campaign “${c.title}” (1 measurement locked), note: fit reviewed.`,
    ]);
  });

  it('when a campaign is signed off, then the report data carries who signed it and when', async () => {
    const c = await newCampaign();
    await addRun(c.id, { celsius: 0, ee: 90 });
    expect((await loadReportData(testKnex(), project.id, c.id)).signOff).toBeNull();
    await as('owner').post(`/api/v1/campaigns/${c.id}/sign-off`).send({}).expect(200);
    const data = await loadReportData(testKnex(), project.id, c.id);
    expect(data.signOff).toMatchObject({ by: 'Ada Okafor', note: null });
    expect(Date.now() - Date.parse(data.signOff!.at)).toBeLessThan(60_000);
  });
});

describe('uploaded files kept as records', () => {
  it('when a file is imported, then it is kept byte for byte with its hash, uploader and rows, and each run links back to its file and row', async () => {
    const c = await newCampaign();
    const file = sample('kestrelmoor-skylark-screen.csv');
    const { imported } = await importFile(c.id, file, false);
    expect(imported.status).toBe(201);
    const sha256 = createHash('sha256').update(file.buffer).digest('hex');
    expect(imported.body.file).toMatchObject({ name: file.name, sizeBytes: file.buffer.length, sha256 });

    const list = await as('viewer').get(`/api/v1/campaigns/${c.id}/files`).expect(200);
    expect(list.body.files).toEqual([
      expect.objectContaining({
        fileName: file.name,
        sizeBytes: file.buffer.length,
        sha256,
        rowCount: 12,
        storedRowCount: 12,
        uploadedBy: 'Tomás Reyes',
        format: 'csv',
      }),
    ]);
    const fileId = list.body.files[0].id;
    const download = await as('viewer')
      .get(`/api/v1/import-files/${fileId}`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (d: Buffer) => chunks.push(d));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(download.status).toBe(200);
    expect(Buffer.compare(download.body as Buffer, file.buffer)).toBe(0);
    expect(download.headers['content-disposition']).toBe(`attachment; filename=${file.name}`);
    expect(download.headers['content-digest']).toBe(`sha-256=:${Buffer.from(sha256, 'hex').toString('base64')}:`);

    const runs = await testKnex()('measurements')
      .where({ campaignId: c.id })
      .orderBy('sourceRow')
      .select('importFileId', 'sourceRow', 'sampleId');
    expect(runs.every((r) => r.importFileId === fileId)).toBe(true);
    // The first data row of the sample is spreadsheet row 2, sample KL7702-S-001 [samples/kestrelmoor-skylark-screen.csv].
    expect(runs[0]).toMatchObject({ sourceRow: 2, sampleId: 'KL7702-S-001' });

    expect((await as('outsider').get(`/api/v1/import-files/${fileId}`)).status).toBe(404);
    expect((await as('viewer').get('/api/v1/import-files/not-a-file')).status).toBe(404);
  });
});

describe('duplicate imports', () => {
  it('when the rows of a file are already in the campaign, then the preview warns and the import needs explicit confirmation', async () => {
    const c = await newCampaign();
    const file = sample('kestrelmoor-skylark-screen.csv');
    expect((await importFile(c.id, file, false)).imported.status).toBe(201);
    const { preview, imported } = await importFile(c.id, file, false);
    expect(preview.warningCount).toBe(12);
    expect(preview.issues[0]).toEqual({
      severity: 'warning',
      row: 2,
      column: null,
      message: 'sample KL7702-S-001 a is already in the campaign (same sample id and replicate); importing adds it again.',
    });
    expect(imported.status).toBe(422);
    expect(imported.body.title).toBe('Warnings need confirmation');
    expect(await testKnex()('measurements').where({ campaignId: c.id }).count({ n: '*' }).first()).toEqual({ n: 12 });
    expect((await importFile(c.id, file, true)).imported.status).toBe(201);
  });

  it('when a file repeats a typed-in run (same temperature and value, no sample id), then that row is a warning too', async () => {
    const c = await newCampaign();
    await addRun(c.id, { celsius: -20, ee: 93.4 });
    const file = { name: 'bench.csv', buffer: Buffer.from('Temperature (°C),ee (%)\r\n-20,93.4\r\n0,90.2\r\n') };
    const { preview, imported } = await importFile(c.id, file, false);
    expect(preview.issues).toEqual([
      {
        severity: 'warning',
        row: 2,
        column: null,
        message:
          'the campaign already has a measurement at this temperature with this value; importing adds it again (was this file imported before?).',
      },
    ]);
    expect(imported.status).toBe(422);
  });
});

describe('import template', () => {
  it('when the template is downloaded, then it previews with every column recognised and no problems', async () => {
    const c = await newCampaign();
    const res = await as('viewer').get(`/api/v1/campaigns/${c.id}/imports/template.csv`).expect(200);
    expect(res.headers['content-disposition']).toMatch(/-template\.csv$/);
    const text = res.text;
    const preview = await as('editor')
      .post(`/api/v1/campaigns/${c.id}/imports/preview`)
      .attach('file', Buffer.from(text), 'template.csv')
      .field('request', '{}');
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({ rowCount: 5, validRowCount: 5, errorCount: 0, warningCount: 0 });
    expect(preview.body.mapping).toMatchObject({ temperatureUnit: 'C', measure: 'ee' });
    expect(Object.keys(preview.body.mapping.columns).sort()).toEqual([
      'conversionPercent',
      'notes',
      'reactionTime',
      'replicateLabel',
      'sampleId',
      'temperature',
      'value',
    ]);
  });
});
