import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { randomBytes } from 'node:crypto';
import type { Express } from 'express';
import type { User } from '../../api/models/user';
import { testKnex } from '../support/db';
import { signIn } from '../support/auth';
import { startInstance, stopInstance, type Instance } from '../support/instances';
import { newIdentity } from '../factories/users';
import { createProject } from '../factories/projects';
import { createApiToken } from '../factories/tokens';
import { createCampaign } from '../factories/campaigns';

/**
 * Two app processes (api/server.ts, as `npm start` runs it) on different ports against one
 * database: nothing a user relies on may live in one process's memory.
 */
const shared = {
  DATABASE_URL: process.env.DATABASE_URL ?? '',
  // One deployment: both instances count against the same budgets.
  EYRIE_RATE_LIMIT_PREFIX: `two-${randomBytes(4).toString('hex')}`,
  EYRIE_SIGN_IN_LIMIT: '8',
  EYRIE_COMPUTE_LIMIT: '10',
  // Every import is "large"; a dead instance's job is taken over within seconds.
  EYRIE_IMPORT_JOB_BYTES: '64',
  EYRIE_JOB_EXPIRE_SECONDS: '3',
  EYRIE_JOB_MAINTENANCE_SECONDS: '1',
  EYRIE_JOB_POLL_SECONDS: '0.5',
};

let a: Instance;
testKnex(); // binds the models the factories use
let b: Instance;
const extra: Instance[] = [];
let user: { id: string };
let bearer: string;
let projectId: string;

beforeAll(async () => {
  [a, b] = await Promise.all([startInstance(shared), startInstance(shared)]);
}, 120_000);

afterAll(async () => {
  await Promise.all([a, b, ...extra].filter(Boolean).map((i) => stopInstance(i)));
});

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** A CSV screen of `rows` runs over eight temperatures. */
function screenCsv(rows: number): Buffer {
  const lines = ['T (°C),ee (%),sample'];
  for (let i = 0; i < rows; i++) lines.push(`${-70 + (i % 8) * 10},${(88 + (i % 8) * 0.7).toFixed(1)},S-${i}`);
  return Buffer.from(lines.join('\n') + '\n');
}

async function mappingFor(csv: Buffer, campaignId: string) {
  const preview = await request(b.url)
    .post(`/api/v1/campaigns/${campaignId}/imports/preview`)
    .set('Authorization', bearer)
    .attach('file', csv.subarray(0, 400), 'screen.csv')
    .expect(200);
  expect(preview.body.mapping).not.toBeNull();
  return preview.body.mapping;
}

async function pollUntilDone(base: string, jobId: string, timeoutMs = 90_000) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const res = await request(base).get(`/api/v1/jobs/${jobId}`).set('Authorization', bearer);
    if (res.status === 200 && (res.body.state === 'succeeded' || res.body.state === 'failed')) return res.body;
    await sleep(200);
  }
  throw new Error(`job ${jobId} did not finish`);
}

/** Start an import of an invented screen of `rows` runs into a new campaign through the instance at `base`. */
async function startImport(base: string, rows: number) {
  const campaign = await createCampaign(projectId);
  const csv = screenCsv(rows);
  const mapping = await mappingFor(csv, campaign.id);
  const started = await request(base)
    .post(`/api/v1/campaigns/${campaign.id}/imports`)
    .set('Authorization', bearer)
    .attach('file', csv, 'screen.csv')
    .field('request', JSON.stringify({ mapping, acknowledgeWarnings: true }))
    .expect(202);
  return { campaign, jobId: started.body.job.id as string };
}

/** The worker (host:pid) running the job once it runs, or null if it has not started within about ten seconds. */
async function runningWorker(jobId: string): Promise<string | null> {
  for (let i = 0; i < 400; i++) {
    const row = await testKnex()('jobs').where({ id: jobId }).first('state', 'worker');
    if (row.state === 'running' && row.worker) return row.worker;
    await sleep(25);
  }
  return null;
}

const stored = async (campaignId: string) => ({
  rows: Number((await testKnex()('measurements').where({ campaignId }).count({ n: '*' }).first())!.n),
  audits: Number(
    (await testKnex()('audit_events').where({ entityType: 'measurement_import', entityId: campaignId }).count({ n: '*' }).first())!.n,
  ),
});

describe('two instances, one database', () => {
  it('when someone signs in through one instance, then their session works on the other', async () => {
    const identity = newIdentity();
    const { agent, user: me } = await signIn(a.url as unknown as Express, identity);
    const session = await agent.get('/api/v1/session').expect(200);
    const cookie = (session.request as unknown as { cookies: string }).cookies;
    expect(cookie).toContain('eyrie.sid=');
    const onB = await request(b.url).get('/api/v1/session').set('Cookie', cookie).expect(200);
    expect(onB.body.user).toMatchObject({ id: me.id, login: identity.login });
    user = { id: me.id };
    projectId = (await createProject([{ user: user as User, role: 'owner' }])).id;
    bearer = `Bearer ${(await createApiToken(user as User)).secret}`;
    // A write with the session's CSRF token through the other instance.
    await request(b.url)
      .post('/api/v1/projects')
      .set('Cookie', cookie)
      .set('X-CSRF-Token', onB.body.csrfToken)
      .send({ name: 'Made on B' })
      .expect(201);
  });

  it('when requests are spread over both instances, then the rate limit counts them together', async () => {
    // Sign-in: counted exactly (8 allowed; the sign-in above used 2 of them through A).
    const hits: number[] = [];
    for (let i = 0; i < 6; i++) hits.push((await request(i % 2 ? b.url : a.url).get('/auth/github')).status);
    expect(hits).toEqual([302, 302, 302, 302, 302, 302]);
    expect((await request(a.url).get('/auth/github')).status).toBe(429);
    expect((await request(b.url).get('/auth/github')).status).toBe(429);

    // Calculators: counted in memory, shared once a second (10 allowed).
    const body = {
      basis: { kind: 'gap', ddG: { value: 5, unit: 'kJ/mol' }, temperature: { value: 25, unit: 'C' } },
      temperatures: { list: [{ value: 0, unit: 'C' }] },
    };
    const forecast = (base: string) => request(base).post('/api/v1/forecast').send(body);
    for (let i = 0; i < 6; i++) expect((await forecast(a.url)).status).toBeLessThan(429);
    await sleep(1500);
    for (let i = 0; i < 4; i++) expect((await forecast(b.url)).status).toBeLessThan(429);
    await sleep(2500);
    expect((await forecast(a.url)).status).toBe(429);
    expect((await forecast(b.url)).status).toBe(429);
  });

  it('when a large import is started on one instance, then it finishes and is visible on the other', async () => {
    const { campaign, jobId } = await startImport(a.url, 2000);
    const done = await pollUntilDone(b.url, jobId);
    expect(done).toMatchObject({ state: 'succeeded', result: { inserted: 2000 } });
    const listed = await request(b.url).get(`/api/v1/campaigns/${campaign.id}/measurements`).set('Authorization', bearer).expect(200);
    expect(listed.body.measurements).toHaveLength(2000);
  });

  it('when the instance running an import is killed, then the other finishes it, once', async () => {
    const { campaign, jobId } = await startImport(b.url, 30_000);
    const worker = await runningWorker(jobId);
    expect(worker).not.toBeNull();
    const pid = Number(worker!.split(':').pop());
    const victim = [a, b].find((i) => i.child.pid === pid)!;
    const survivor = victim === a ? b : a;
    expect(victim).toBeDefined();
    victim.child.kill('SIGKILL');
    await victim.exited;

    const done = await pollUntilDone(survivor.url, jobId);
    expect(done.state).toBe('succeeded');
    expect(done.attempts).toBeGreaterThanOrEqual(2);
    expect(await stored(campaign.id)).toEqual({ rows: 30_000, audits: 1 });

    // Bring the pair back for the next test.
    const replacement = await startInstance(shared);
    extra.push(replacement);
    if (victim === a) a = replacement;
    else b = replacement;
  }, 120_000);

  it('when the instance running an import is stopped with SIGTERM, then it exits cleanly and the job still ends once', async () => {
    const { campaign, jobId } = await startImport(a.url, 30_000);
    const worker = await runningWorker(jobId);
    const pid = Number(worker!.split(':').pop());
    const runner = [a, b].find((i) => i.child.pid === pid)!;
    const other = runner === a ? b : a;
    // Finishes its job within the grace period or hands it back; either way it exits 0.
    expect(await stopInstance(runner)).toBe(0);
    const done = await pollUntilDone(other.url, jobId);
    expect(done.state).toBe('succeeded');
    expect(await stored(campaign.id)).toEqual({ rows: 30_000, audits: 1 });
  }, 120_000);
});
