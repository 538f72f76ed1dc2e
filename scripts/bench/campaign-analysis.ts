/**
 * Campaign analysis benchmark: GET /api/v1/campaigns/:id/analysis over a campaign of 1 000 stored
 * runs, through the whole app (bearer token, authorization, load, fit, two-branch check, 60-point
 * curve, JSON). Reports p50/p99 of 200 sequential requests and req/s at 10 connections (autocannon),
 * beside the time of the analysis alone (no HTTP, no database; best of 20 after warm-up), and
 * beside a bare Express route that selects the same rows with pg and returns them as JSON, loaded
 * the same way (the ratio analysis req/s ÷ bare req/s is `analysisRatio`).
 *
 * Needs DATABASE_URL (npm run bench provides a throwaway cluster).
 */
import '../../api/db/pg-types';
import autocannon from 'autocannon';
import express from 'express';
import pg from 'pg';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { randomBytes } from 'node:crypto';
import { performance } from 'node:perf_hooks';
import { createApp } from '../../api/app';
import { loadConfig } from '../../api/config';
import { createKnex, migrateLatest } from '../../api/db/knex';
import { computeAnalysis } from '../../api/features/campaigns/analysis';
import { createToken } from '../../api/features/tokens/service';
import { Campaign } from '../../api/models/campaign';
import { Measurement } from '../../api/models/measurement';
import type { BenchSuite } from './suites';
import { insertSyntheticScreen } from './synthetic-screen';
import { recordFigure } from './results';

const RUNS = 1000;
const SEQUENTIAL = 200;
const CONNECTIONS = 10;
const DURATION_S = Number(process.env.BENCH_SECONDS ?? 8);

const percentile = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!;

async function run() {
  const knex = createKnex(process.env.DATABASE_URL!, { min: 0, max: 4 });
  await migrateLatest(knex);
  try {
    const tag = randomBytes(4).toString('hex');
    const [user] = await knex('users')
      .insert({ provider: 'local-demo', providerUserId: `bench-${tag}`, login: `bench-${tag}`, displayName: 'Bench user' })
      .returning('*');
    const { projectId, campaignId } = await insertSyntheticScreen(
      knex,
      user.id,
      { project: `Bench project ${tag}`, campaign: `Bench screen ${tag}` },
      RUNS,
    );
    const campaign = await Campaign.query(knex).findById(campaignId).throwIfNotFound();
    const { secret } = await createToken(knex, user.id, { name: 'bench', expiresInDays: 1 });

    const measurements = await Measurement.query(knex)
      .where({ campaignId: campaign.id })
      .orderBy('temperatureK')
      .orderBy('createdAt')
      .orderBy('id');
    let bestCompute = Infinity;
    for (let k = 0; k < 20; k++) {
      const t0 = performance.now();
      computeAnalysis(campaign, measurements, { weighting: 'none', uncertaintyScale: 'absolute', confidence: 0.95 });
      bestCompute = Math.min(bestCompute, performance.now() - t0);
    }

    const app = createApp({ knex, config: loadConfig({ nodeEnv: 'production', devTools: false }), webDist: null });
    const server = await new Promise<Server>((resolve) => {
      const s = app.listen(0, '127.0.0.1', () => resolve(s));
    });
    const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}/api/v1/campaigns/${campaign.id}/analysis`;
    const headers = { authorization: `Bearer ${secret}` };

    const first = await fetch(url, { headers });
    if (first.status !== 200) throw new Error(`analysis answered ${first.status}: ${await first.text()}`);
    const body = (await first.json()) as { fit: { n: number } | null };
    if (!body.fit || body.fit.n !== RUNS) throw new Error('the benchmark campaign did not fit every run');

    const times: number[] = [];
    for (let i = 0; i < SEQUENTIAL; i++) {
      const t0 = performance.now();
      const res = await fetch(url, { headers });
      await res.arrayBuffer();
      times.push(performance.now() - t0);
      if (res.status !== 200) throw new Error(`analysis answered ${res.status}`);
    }
    times.sort((a, b) => a - b);

    // The baseline: the same rows (the columns the analysis reads, in its order) straight from pg as JSON.
    const pool = new pg.Pool({ connectionString: process.env.DATABASE_URL!, max: 4 });
    const bare = express();
    bare.get('/rows/:id', async (req, res) => {
      const { rows } = await pool.query(
        'select id, temperature_k, measure, value, value_b, is_lower_bound, uncertainty, replicate_label, sample_id, excluded, excluded_reason from measurements where campaign_id = $1 order by temperature_k, created_at, source_row, id',
        [req.params.id],
      );
      res.json(rows);
    });
    const bareServer = await new Promise<Server>((resolve) => {
      const s = bare.listen(0, '127.0.0.1', () => resolve(s));
    });
    const bareUrl = `http://127.0.0.1:${(bareServer.address() as AddressInfo).port}/rows/${campaign.id}`;
    const bareRows = (await (await fetch(bareUrl)).json()) as unknown[];
    if (bareRows.length !== RUNS) throw new Error(`the bare route returned ${bareRows.length} rows`);

    await autocannon({ url, connections: CONNECTIONS, duration: 2, headers });
    const load = await autocannon({ url, connections: CONNECTIONS, duration: DURATION_S, headers });
    await autocannon({ url: bareUrl, connections: CONNECTIONS, duration: 2 });
    const bareLoad = await autocannon({ url: bareUrl, connections: CONNECTIONS, duration: DURATION_S });
    bareServer.close();
    bareServer.closeAllConnections();
    await pool.end();
    server.close();
    server.closeAllConnections();
    // autocannon stops with requests in flight; let their queries finish before the pool goes away.
    const knexPool = (knex.client as { pool: { numUsed(): number; numPendingAcquires(): number } }).pool;
    for (let waited = 0; waited < 5000 && knexPool.numUsed() + knexPool.numPendingAcquires() > 0; waited += 50)
      await new Promise((r) => setTimeout(r, 50));
    if (load.non2xx > 0 || load.errors > 0) throw new Error(`${load.non2xx} non-2xx answers, ${load.errors} errors under load`);
    if (bareLoad.non2xx > 0 || bareLoad.errors > 0)
      throw new Error(`bare route: ${bareLoad.non2xx} non-2xx answers, ${bareLoad.errors} errors under load`);

    console.log(`\nCampaign analysis: GET /campaigns/:id/analysis, ${RUNS} stored runs`);
    console.log(`analysis alone (no HTTP, no DB), best of 20: ${bestCompute.toFixed(1)} ms`);
    console.log(
      `${SEQUENTIAL} sequential requests: p50 ${percentile(times, 50).toFixed(1)} ms, p99 ${percentile(times, 99).toFixed(1)} ms`,
    );
    console.log(
      `${CONNECTIONS} connections, ${DURATION_S} s (autocannon): ${load.requests.average.toFixed(0)} req/s, p50 ${load.latency.p50} ms, p99 ${load.latency.p99} ms`,
    );
    console.log(
      `bare pg route, same rows as JSON: ${bareLoad.requests.average.toFixed(0)} req/s, p50 ${bareLoad.latency.p50} ms, p99 ${bareLoad.latency.p99} ms; ratio ${(load.requests.average / bareLoad.requests.average).toFixed(2)}× (target ≥ 0.5×)`,
    );
    recordFigure('analysisRatio', load.requests.average / bareLoad.requests.average);

    await knex('projects').where({ id: projectId }).delete();
    await knex('users').where({ id: user.id }).delete();
  } finally {
    await knex.destroy();
  }
}

export const campaignAnalysisBenchSuite: BenchSuite = { name: 'campaign-analysis', run };
