import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { testApp } from '../support/app';
import { createUser } from '../factories/users';
import { createProject } from '../factories/projects';
import { createApiToken } from '../factories/tokens';
import { createCampaign } from '../factories/campaigns';
import { closeReadPool } from '../../api/features/imports/parse-pool';
import { lyingBombWorkbook, manyRowsWorkbook, nulWorkbook, ratioBombWorkbook } from '../support/xlsx-bombs';

// Imports stay in the request here (no job threshold), so their refusals are answered directly.
const { app, knex } = testApp({ importJobBytes: 1e9 });
let bearer: string;
let campaignId: string;
let mapping: unknown;

beforeAll(async () => {
  const owner = await createUser();
  const project = await createProject([{ user: owner, role: 'owner' }]);
  campaignId = (await createCampaign(project.id)).id;
  bearer = `Bearer ${(await createApiToken(owner)).secret}`;
  const preview = await send('imports/preview', Buffer.from('T (°C),ee (%)\n-20,91.5\n0,88\n'), 'screen.csv').expect(200);
  mapping = preview.body.mapping;
});
afterAll(() => closeReadPool());

const counts = async () => ({
  rows: Number((await knex('measurements').where({ campaignId }).count({ n: '*' }).first())!.n),
  audits: Number((await knex('audit_events').where({ entityId: campaignId }).count({ n: '*' }).first())!.n),
});

const send = (route: 'imports' | 'imports/preview', bytes: Buffer, name: string) =>
  request(app)
    .post(`/api/v1/campaigns/${campaignId}/${route}`)
    .set('Authorization', bearer)
    .attach('file', bytes, name)
    .field('request', JSON.stringify(route === 'imports' ? { mapping } : {}));

describe('hostile files through the upload routes', () => {
  it('when a zip bomb, a lying zip bomb or a row bomb is previewed or imported, then each is 413 problem details and nothing is stored', async () => {
    const before = await counts();
    for (const [bytes, name] of [
      [ratioBombWorkbook(100), 'bomb.xlsx'],
      [lyingBombWorkbook(200), 'liar.xlsx'],
      [manyRowsWorkbook(150_000), 'rows.xlsx'],
    ] as const) {
      for (const route of ['imports/preview', 'imports'] as const) {
        const res = await send(route, bytes, name);
        expect(res.status, `${route} ${name}: ${res.body.detail}`).toBe(413);
        expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
        expect(res.body.detail).toMatch(new RegExp(`^${name.replace('.', '\\.')}`));
      }
    }
    expect(await counts()).toEqual(before);
  });

  it('when a file carries a NUL character (CSV after 4 KB, or a workbook cell), then it is 400 naming the file and nothing is stored', async () => {
    const before = await counts();
    const lines = Array.from({ length: 500 }, (_, i) => `${i % 40},9${i % 10}.5`);
    lines[400] = '12,93\u0000.5';
    const csv = Buffer.from(`T (°C),ee (%)\n${lines.join('\n')}\n`);
    for (const [bytes, name] of [
      [csv, 'screen.csv'],
      [nulWorkbook(), 'screen.xlsx'],
    ] as const) {
      for (const route of ['imports/preview', 'imports'] as const) {
        const res = await send(route, bytes, name);
        expect(res.status, `${route} ${name}`).toBe(400);
        expect(res.body.errors[0].path).toBe('file');
      }
    }
    expect(await counts()).toEqual(before);
  });
});
