import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import type { Knex } from 'knex';
import { createKnex } from '../../api/db/knex';
import { User } from '../../api/models/user';
import { createApiToken } from '../factories/tokens';
import { freePort, startNode, startOwnCluster, timedFetch, type OwnCluster } from '../support/own-cluster';

/**
 * `npm start` against a PostgreSQL cluster this file starts itself (never the shared test cluster), which
 * the tests freeze with SIGSTOP and stop outright. Short database limits keep the waits to a few seconds.
 */
const DB_LIMITS = {
  EYRIE_DB_ACQUIRE_TIMEOUT_MS: '2000',
  EYRIE_DB_CONNECT_TIMEOUT_MS: '1000',
  EYRIE_DB_STATEMENT_TIMEOUT_MS: '3000',
};

let cluster: OwnCluster;
let knex: Knex;
let start: ReturnType<typeof startNode>;
let base: string;
let bearer: string;

async function until<T>(what: string, fn: () => Promise<T | null>, timeoutMs: number, everyMs = 250): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const got = await fn().catch(() => null);
    if (got !== null) return got;
    if (Date.now() > end) throw new Error(`gave up waiting for ${what}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}
const healthy = () =>
  until('a healthy answer', async () => ((await timedFetch(`${base}/api/health`, {}, 5000)).status === 200 ? true : null), 20_000);
const projects = () => timedFetch(`${base}/api/v1/projects`, { headers: { authorization: bearer } });

beforeAll(async () => {
  cluster = await startOwnCluster();
  const port = await freePort();
  base = `http://127.0.0.1:${port}`;
  start = startNode(['scripts/start.mjs'], {
    ...DB_LIMITS,
    DATABASE_URL: cluster.url,
    PORT: String(port),
    NODE_ENV: 'production',
    LOG_LEVEL: 'warn',
    EYRIE_DEV_TOOLS: '1',
  });
  await start.output.waitFor(/Eyrie is ready/, 90_000);
  knex = createKnex(cluster.url, { min: 0, max: 2 });
  const user = await User.query(knex).whereNotNull('email').first();
  bearer = `Bearer ${(await createApiToken(user!, {}, knex)).secret}`;
}, 120_000);

afterAll(async () => {
  if (start?.child.exitCode === null) {
    const exited = new Promise((r) => start.child.once('exit', r));
    start.child.kill('SIGTERM');
    await exited;
  }
  await knex?.destroy();
  cluster?.close();
}, 60_000);

describe('a database that stops answering', () => {
  it('when PostgreSQL is frozen (SIGSTOP), then health and data routes answer 503 within seconds and recover without a restart', async () => {
    expect((await projects()).status).toBe(200);
    cluster.freeze();
    try {
      const health = await timedFetch(`${base}/api/health`);
      expect(health.status).toBe(503);
      expect(health.body).toMatchObject({ database: 'down' });
      expect(health.headers.get('retry-after')).toBe('5');
      expect(health.ms).toBeLessThan(4_000);

      const data = await projects();
      expect(data.status).toBe(503);
      expect(data.headers.get('content-type')).toMatch(/application\/problem\+json/);
      expect(data.headers.get('retry-after')).toBe('5');
      expect(data.body).toMatchObject({ status: 503, title: 'Service unavailable', requestId: expect.any(String) });
      expect(data.ms).toBeLessThan(10_000);
    } finally {
      cluster.thaw();
    }
    await healthy();
    await until('the data route to answer 200', async () => ((await projects()).status === 200 ? true : null), 20_000);
  }, 60_000);

  it('when PostgreSQL is stopped, then the answers are 503 with Retry-After, and the same server recovers once it is back', async () => {
    cluster.stop();
    const health = await timedFetch(`${base}/api/health`);
    expect(health.status).toBe(503);
    const data = await projects();
    expect(data.status).toBe(503);
    expect(data.headers.get('retry-after')).toBe('5');
    expect(data.ms).toBeLessThan(8_000);
    await cluster.restart();
    await healthy();
    expect((await projects()).status).toBe(200);
  }, 60_000);
});

describe('supervision by npm start', () => {
  it('when the API process is killed with -9, then the supervisor restarts it and says why', async () => {
    const pids = [...start.output.text.matchAll(/the API server started \(pid (\d+)\)/g)].map((m) => Number(m[1]));
    const first = pids.at(-1)!;
    process.kill(first, 'SIGKILL');
    await start.output.waitFor(/the API server stopped: it was killed \(SIGKILL[^\n]*restarting in/, 10_000);
    const again = await start.output.waitFor(new RegExp(`the API server started \\(pid (?!${first}\\))(\\d+)\\)`), 10_000);
    expect(Number(again[1])).not.toBe(first);
    await healthy();
    expect((await projects()).status).toBe(200);
    expect(start.child.exitCode).toBeNull();
  }, 60_000);
});

describe('a crash in the middle of an import', () => {
  it('when the API is killed -9 while an import is inserting, then no row of it remains and the restarted server takes imports again', async () => {
    const owner = await knex('projectMembers').where({ role: 'owner' }).first('projectId', 'userId');
    const campaign = await knex('campaigns').where({ projectId: owner.projectId }).first('id');
    const user = await User.query(knex).findById(owner.userId);
    const auth = `Bearer ${(await createApiToken(user!, {}, knex)).secret}`;
    const before = Number((await knex('measurements').where({ campaignId: campaign.id }).count({ n: '*' }).first())!.n);
    // 20 000 invented runs (fixed pattern): two COPY batches in one transaction, long enough to be caught.
    const rows = Array.from({ length: 20_000 }, (_, i) => `${(-60 + (i % 80) + i / 1e5).toFixed(5)},${(80 + (i % 19)).toFixed(1)},S-${i}`);
    const csvOf = (lines: string[]) => `Temperature (°C),ee (%),Sample\n${lines.join('\n')}\n`;
    const form = (csv: string) => {
      const f = new FormData();
      f.append('file', new Blob([csv], { type: 'text/csv' }), 'big-screen.csv');
      f.append(
        'request',
        JSON.stringify({
          mapping: { columns: { temperature: 0, value: 1, sampleId: 2 }, temperatureUnit: 'C', measure: 'ee' },
          acknowledgeWarnings: true,
        }),
      );
      return f;
    };
    const apiPid = Number([...start.output.text.matchAll(/the API server started \(pid (\d+)\)/g)].at(-1)![1]);
    const upload = fetch(`${base}/api/v1/campaigns/${campaign.id}/imports`, {
      method: 'POST',
      headers: { authorization: auth },
      body: form(csvOf(rows)),
    }).then(
      (r) => r.status,
      () => 'connection lost',
    );
    // Wait until PostgreSQL shows the import's COPY inside its transaction, then kill the API outright.
    await until(
      'the import to be inserting',
      async () =>
        (await knex('pg_stat_activity')
          .where('query', 'like', 'copy measurements%')
          .where({ state: 'active' })
          .whereNotNull('xactStart')
          .first('pid'))
          ? true
          : null,
      60_000,
      20,
    );
    process.kill(apiPid, 'SIGKILL');
    expect(await upload).toBe('connection lost');
    await start.output.waitFor(new RegExp(`the API server started \\(pid (?!${apiPid}\\))\\d+\\)`), 15_000);
    await healthy();
    // The transaction died with its connection: not one of the 20 000 rows is there.
    await until(
      'the killed backend to be gone',
      async () => ((await knex('pg_stat_activity').where('query', 'like', 'copy measurements%').first('pid')) ? null : true),
      20_000,
    );
    expect(Number((await knex('measurements').where({ campaignId: campaign.id }).count({ n: '*' }).first())!.n)).toBe(before);
    // The restarted server takes an import again (a small one, to keep the test light).
    const again = await fetch(`${base}/api/v1/campaigns/${campaign.id}/imports`, {
      method: 'POST',
      headers: { authorization: auth },
      body: form(csvOf(rows.slice(0, 500))),
    });
    expect(again.status).toBe(201);
    expect(Number((await knex('measurements').where({ campaignId: campaign.id }).count({ n: '*' }).first())!.n)).toBe(before + 500);
  }, 120_000);
});

describe('graceful shutdown', () => {
  it('when the server gets SIGTERM during a request, then that request still gets its answer and the process exits 0', async () => {
    const port = await freePort();
    const server = startNode(['--import', 'tsx', 'api/server.ts'], {
      ...DB_LIMITS,
      DATABASE_URL: cluster.url,
      PORT: String(port),
      NODE_ENV: 'production',
      LOG_LEVEL: 'warn',
      EYRIE_DEV_TOOLS: '0',
    });
    await new Promise<void>((resolve, reject) => {
      server.child.on('message', (m: { type?: string }) => m?.type === 'ready' && resolve());
      server.child.once('exit', () => reject(new Error(`the server exited early:\n${server.output.text}`)));
    });
    const body = JSON.stringify({
      basis: { kind: 'observed', selectivity: { measure: 'ee', value: 90 }, temperature: { value: 25, unit: 'C' } },
      temperatures: { values: [{ value: -20, unit: 'C' }] },
    });
    const answer = new Promise<{ status: number; text: string }>((resolve, reject) => {
      const req = http.request(
        {
          host: '127.0.0.1',
          port,
          path: '/api/v1/forecast',
          method: 'POST',
          headers: { 'content-type': 'application/json', 'content-length': Buffer.byteLength(body) },
        },
        (res) => {
          let text = '';
          res.on('data', (d: Buffer) => (text += d.toString()));
          res.on('end', () => resolve({ status: res.statusCode ?? 0, text }));
        },
      );
      req.on('error', reject);
      // Half the body now; SIGTERM while the request is in flight; the rest afterwards.
      req.write(body.slice(0, 40));
      setTimeout(() => {
        server.child.kill('SIGTERM');
        setTimeout(() => req.end(body.slice(40)), 500);
      }, 300);
    });
    const exited = new Promise<number | null>((resolve) => server.child.once('exit', (code) => resolve(code)));
    const done = await answer;
    expect(done.status).toBe(200);
    expect(JSON.parse(done.text)).toHaveProperty('points');
    expect(await exited).toBe(0);
    await expect(fetch(`http://127.0.0.1:${port}/api/health`)).rejects.toThrow();
  }, 60_000);
});
