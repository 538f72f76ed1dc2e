import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { testApp } from '../support/app';
import { closeTestKnex, testKnex } from '../support/db';
import { createUser } from '../factories/users';
import { createProject } from '../factories/projects';
import { createCampaign } from '../factories/campaigns';
import { createApiToken } from '../factories/tokens';
import { toProblem } from '../../api/lib/problem';
import type { Project } from '../../api/models/project';

let app: ReturnType<typeof testApp>['app'];
let project: Project;
let bearer: string;

beforeAll(async () => {
  app = testApp().app;
  const owner = await createUser();
  project = await createProject([{ user: owner, role: 'owner' }]);
  bearer = `Bearer ${(await createApiToken(owner)).secret}`;
});
afterAll(closeTestKnex);

const count = async (table: string, where: Record<string, unknown>) =>
  Number((await testKnex()(table).where(where).count({ n: '*' }).first())!.n);
const run = (celsius: number, extra: Record<string, unknown> = {}) => ({
  temperature: { value: celsius, unit: 'C' },
  selectivity: { measure: 'ee', value: 90 },
  ...extra,
});

describe('NUL characters in text', () => {
  it('when a batch holds a NUL deep in a note, then 400 names that field and nothing is stored', async () => {
    const c = await createCampaign(project.id);
    const notes = `${'a'.repeat(5000).slice(0, 1500)}\u0000tail`;
    const res = await request(app)
      .post(`/api/v1/campaigns/${c.id}/measurements/batch`)
      .set('Authorization', bearer)
      .send({ measurements: [run(-20), run(0, { notes })] });
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([{ path: 'measurements.1.notes', message: expect.stringContaining('NUL character') }]);
    expect(await count('measurements', { campaignId: c.id })).toBe(0);
  });

  it('when the text only spells a backslash before u0000, then it is not a NUL and the runs are stored', async () => {
    // The raw text holds the six bytes \u0000 after an escaped backslash: the byte search finds them, the walk clears them.
    const c = await createCampaign(project.id);
    const notes = 'path C:\\u0000 in a note';
    const body = JSON.stringify({ measurements: [run(-20, { notes })] });
    expect(body).toContain('\\u0000');
    const res = await request(app)
      .post(`/api/v1/campaigns/${c.id}/measurements/batch`)
      .set('Authorization', bearer)
      .set('Content-Type', 'application/json')
      .send(body);
    expect(res.status).toBe(201);
    expect(await count('measurements', { campaignId: c.id, notes })).toBe(1);
  });

  it('when a body in UTF-16 holds a NUL, then 400 names the field (the byte search reads UTF-8 only)', async () => {
    const c = await createCampaign(project.id);
    const body = Buffer.from(JSON.stringify({ measurements: [run(-20, { notes: 'a\u0000b' })] }), 'utf16le');
    const res = await request(app)
      .post(`/api/v1/campaigns/${c.id}/measurements/batch`)
      .set('Authorization', bearer)
      .set('Content-Type', 'application/json; charset=utf-16le')
      // Sent as the bytes given (superagent would write a Buffer out as JSON).
      .serialize((bytes: Buffer) => bytes as unknown as string)
      .send(body);
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([{ path: 'measurements.0.notes', message: expect.stringContaining('NUL character') }]);
    expect(await count('measurements', { campaignId: c.id })).toBe(0);
  });

  it('when a calculator request holds a NUL, then 400 names the field before the calculation', async () => {
    const res = await request(app)
      .post('/api/v1/fit')
      .send({
        measurements: [run(-20), run(0), { ...run(20), selectivity: { measure: 'ee\u0000', value: 80 } }],
      });
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([{ path: 'measurements.2.selectivity.measure', message: expect.stringContaining('NUL character') }]);
  });

  it('when a project name or a campaign title holds a NUL, then 400 names the field', async () => {
    const p = await request(app).post('/api/v1/projects').set('Authorization', bearer).send({ name: 'Screen\u0000', description: '' });
    expect(p.status).toBe(400);
    expect(p.body.errors[0].path).toBe('name');
    const c = await request(app)
      .post(`/api/v1/projects/${project.id}/campaigns`)
      .set('Authorization', bearer)
      .send({ title: 'ok', productNameA: 'A\u0000', productNameB: 'B', measure: 'ee', assayMethod: 'chiral-hplc' });
    expect(c.status).toBe(400);
    expect(c.body.errors.map((e: { path: string }) => e.path)).toEqual(['productNameA']);
  });

  it('when an imported file has a NUL in a text cell past its first 4 KB, then the file is refused naming the line', async () => {
    const c = await createCampaign(project.id);
    const filler = Array.from({ length: 120 }, (_, i) => `${-40 + (i % 60)},92,run ${i} ${'x'.repeat(30)}`).join('\n');
    const csv = Buffer.from(`Temperature (°C),ee (%),Notes\n${filler}\n-10,91,bad\u0000note\n`, 'utf8');
    expect(csv.indexOf(0)).toBeGreaterThan(4096);
    const mapping = { columns: { temperature: 0, value: 1, notes: 2 }, temperatureUnit: 'C', measure: 'ee' };
    const res = await request(app)
      .post(`/api/v1/campaigns/${c.id}/imports`)
      .set('Authorization', bearer)
      .attach('file', csv, 'screen.csv')
      .field('request', JSON.stringify({ mapping, acknowledgeWarnings: true }));
    // The reader refuses the file before any row is mapped: the line is the file's own (header = line 1).
    expect(res.status).toBe(400);
    expect(res.body.detail).toMatch(/NUL character .* at line 122/);
    expect(await count('measurements', { campaignId: c.id })).toBe(0);
  });
});

describe('query parameters', () => {
  it('when ?at= is empty, then 400 names it instead of reading 0 °C', async () => {
    const res = await request(app).get(`/api/v1/projects/${project.id}/comparison?at=`).set('Authorization', bearer);
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([{ path: 'at', message: expect.stringContaining('empty') }]);
    await request(app).get(`/api/v1/projects/${project.id}/comparison?at=0`).set('Authorization', bearer).expect(200);
  });
});

describe('database errors as problems', () => {
  it('when PostgreSQL refuses text (22021, 22P05), then the problem is a 400, not a 500', () => {
    // SQLSTATE 22021 character_not_in_repertoire, 22P05 untranslatable_character (PostgreSQL manual, appendix A [S]).
    for (const code of ['22021', '22P05', '22P02']) {
      const err = Object.assign(new Error('invalid byte sequence for encoding "UTF8": 0x00'), { code });
      expect(toProblem(err).status).toBe(400);
    }
  });

  it('when the database is gone or a statement timed out, then the problem is a 503', () => {
    // 57014 query_canceled (statement_timeout), 57P01 admin_shutdown, 08006 connection_failure [S].
    for (const code of ['57014', '57P01', '08006', 'ECONNREFUSED']) {
      expect(toProblem(Object.assign(new Error('gone'), { code })).status).toBe(503);
    }
    expect(
      toProblem(Object.assign(new Error('Knex: Timeout acquiring a connection. The pool is probably full.'), { name: 'KnexTimeoutError' }))
        .status,
    ).toBe(503);
    // pg's own connect timeout (connectionTimeoutMillis) says just this.
    expect(toProblem(new Error('timeout expired')).status).toBe(503);
    expect(toProblem(new Error('something else')).status).toBe(500);
  });

  it('when a request fails, then the problem carries the request id the response header names', async () => {
    const res = await request(app).get('/api/v1/nothing-here').set('X-Request-Id', 'proxy-given-id-123');
    expect(res.headers['x-request-id']).toBe('proxy-given-id-123');
    expect(res.body.requestId).toBe('proxy-given-id-123');
    const own = await request(app).get('/api/v1/nothing-here').set('X-Request-Id', 'bad id with spaces');
    expect(own.body.requestId).toMatch(/^[0-9a-f-]{36}$/);
    expect(own.headers['x-request-id']).toBe(own.body.requestId);
  });
});
