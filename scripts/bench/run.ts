/**
 * Benchmarks (never timed tests). Run through `npm run bench`.
 * 1. HTTP: /api/v1/forecast (200 temperatures) and /api/v1/fit (50 runs) at 50 connections, each cycling
 *    through 64 different screens, in alternating rounds with a bare Express JSON route that returns the
 *    same bodies (precomputed), in the same process.
 * 2. Engine: fitEyring cost from 10³ to 10⁶ points (should grow linearly).
 * 3. Feature benchmarks registered in scripts/bench/suites.ts (imports, campaign analysis).
 */
import '../../api/db/pg-types';
import { execFile } from 'node:child_process';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { createRequire } from 'node:module';
import express from 'express';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { performance } from 'node:perf_hooks';
import { createApp } from '../../api/app';
import { loadConfig } from '../../api/config';
import { createKnex, migrateLatest } from '../../api/db/knex';
import { runFit } from '../../api/features/calculators/fit';
import { runForecast } from '../../api/features/calculators/forecast';
import { fitRequestSchema, forecastRequestSchema } from '../../api/features/calculators/schemas';
import { fitEyring } from '../../api/science';
import { extraSuites } from './suites';
import { printBenchLine, recordFigure, type BenchKey } from './results';

const DURATION_S = Number(process.env.BENCH_SECONDS ?? 8);
/** Alternating rounds per HTTP comparison (the time of a side is DURATION_S, split over them). */
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 4);
const execFileAsync = promisify(execFile);
const autocannonCli = createRequire(import.meta.url).resolve('autocannon/autocannon.js');
const CONNECTIONS = 50;

function listen(app: express.Express): Promise<{ server: Server; url: string }> {
  return new Promise((resolve) => {
    const server = app.listen(0, '127.0.0.1', () => resolve({ server, url: `http://127.0.0.1:${(server.address() as AddressInfo).port}` }));
  });
}

type Load = { rps: number; p50: number; p99: number; total: number; cpuUs: number };

/** The header naming which of the screens a request carries, so the bare route can answer that screen's body. */
const CASE_HEADER = 'x-bench-case';

/**
 * A load generator in a separate process (the autocannon CLI), so it does not share the server's
 * event loop. Each connection cycles through `bodies` (a HAR file of one POST per body, the body's
 * index in CASE_HEADER). `hit(seconds)` runs it once against `url`.
 */
async function loader(url: string, bodies: readonly unknown[]) {
  const dir = await mkdtemp(path.join(os.tmpdir(), 'eyrie-bench-body-'));
  const file = path.join(dir, 'requests.har');
  const entries = bodies.map((body, i) => ({
    request: {
      method: 'POST',
      url,
      headers: [
        { name: 'content-type', value: 'application/json' },
        { name: CASE_HEADER, value: String(i) },
      ],
      postData: { mimeType: 'application/json', text: JSON.stringify(body) },
    },
  }));
  await writeFile(file, JSON.stringify({ log: { entries } }));
  const hit = async (seconds: number): Promise<Load> => {
    const args = [autocannonCli, '-c', String(CONNECTIONS), '-d', String(seconds), '--har', file, '--json', url];
    // The server's CPU time per answer: it moves less than req/s when other jobs share the cores.
    const cpu0 = process.cpuUsage();
    const { stdout } = await execFileAsync(process.execPath, args, { maxBuffer: 16 * 1024 * 1024 });
    const cpu = process.cpuUsage(cpu0);
    const result = JSON.parse(stdout) as {
      requests: { average: number; total: number };
      latency: { p50: number; p99: number };
      non2xx: number;
      errors: number;
    };
    if (result.non2xx > 0 || result.errors > 0) throw new Error(`${url}: ${result.non2xx} non-2xx answers, ${result.errors} errors`);
    return {
      rps: result.requests.average,
      p50: result.latency.p50,
      p99: result.latency.p99,
      total: result.requests.total,
      cpuUs: cpu.user + cpu.system,
    };
  };
  return { hit, close: () => rm(dir, { recursive: true, force: true }) };
}

/** Length of one warm-up run, and the most runs a route gets to settle. */
const WARM_UP_RUN_S = 2;
const WARM_UP_MAX_RUNS = 6;

/**
 * Load a route until its rate settles: runs of WARM_UP_RUN_S until one answers within 3 % of the
 * run before it. Until then V8 is still compiling the route's code, on the second core: from cold,
 * our fit route took about 6 s to reach its steady rate (the compiler threads used half a core for
 * the first 3 s), the bare route about 2 s, and a fixed 2 s warm-up left the first measured round
 * of ours 10–20 % low. Returns the seconds it took.
 */
async function warmUp(route: { hit(seconds: number): Promise<Load> }): Promise<number> {
  let previous = 0;
  for (let run = 1; run <= WARM_UP_MAX_RUNS; run++) {
    const { rps } = await route.hit(WARM_UP_RUN_S);
    if (run > 1 && Math.abs(rps - previous) <= 0.03 * previous) return run * WARM_UP_RUN_S;
    previous = rps;
  }
  return WARM_UP_MAX_RUNS * WARM_UP_RUN_S;
}

/**
 * Our route and the bare one in turns: each warmed up until its rate settles, then ROUNDS rounds
 * of DURATION_S/ROUNDS seconds each, alternating, so a drift in the machine's speed (another job,
 * clock changes) falls on both alike. The ratio is of the two routes' total answers.
 */
async function sideBySide(ourUrl: string, bareUrl: string, bodies: readonly unknown[]) {
  const ours = await loader(ourUrl, bodies);
  const bare = await loader(bareUrl, bodies);
  try {
    const warmUpS = { ours: await warmUp(ours), bare: await warmUp(bare) };
    const seconds = Math.max(1, Math.round(DURATION_S / ROUNDS));
    const rounds: { ours: Load; bare: Load }[] = [];
    for (let r = 0; r < ROUNDS; r++) {
      const first = r % 2 === 0 ? await ours.hit(seconds) : await bare.hit(seconds);
      const second = r % 2 === 0 ? await bare.hit(seconds) : await ours.hit(seconds);
      rounds.push(r % 2 === 0 ? { ours: first, bare: second } : { ours: second, bare: first });
    }
    const sum = (pick: (x: { ours: Load; bare: Load }) => number) => rounds.reduce((acc, x) => acc + pick(x), 0);
    const median = (xs: number[]) => [...xs].sort((p, q) => p - q)[Math.floor(xs.length / 2)]!;
    return {
      warmUpS,
      ratio: sum((x) => x.ours.total) / sum((x) => x.bare.total),
      roundRatios: rounds.map((x) => x.ours.rps / x.bare.rps),
      rps: sum((x) => x.ours.rps) / ROUNDS,
      bareRps: sum((x) => x.bare.rps) / ROUNDS,
      p50: median(rounds.map((x) => x.ours.p50)),
      p99: median(rounds.map((x) => x.ours.p99)),
      cpuUs:
        sum((x) => x.ours.cpuUs) /
        Math.max(
          1,
          sum((x) => x.ours.total),
        ),
      bareCpuUs:
        sum((x) => x.bare.cpuUs) /
        Math.max(
          1,
          sum((x) => x.bare.total),
        ),
    };
  } finally {
    await ours.close();
    await bare.close();
  }
}

const C = (value: number) => ({ value, unit: 'C' as const });
/**
 * Screens per route, each request carrying the next. Scripts send a library of different screens,
 * so every answer's numbers differ from the last one's; one body sent over and over would let V8's
 * number-to-string cache write most of the answer's numbers for free (it once made a compiled
 * serialiser look twice as fast as JSON.stringify, when on new numbers it was twice as slow).
 */
const SCREENS = 64;
const forecastBodies = Array.from({ length: SCREENS }, (_, k) => ({
  basis: { kind: 'observed', selectivity: { measure: 'ee', value: 88 + (8 * k) / SCREENS }, temperature: C(-5 + (10 * k) / SCREENS) },
  temperatures: { from: C(-80), to: C(60), count: 200 },
}));
// Synthetic screens for load only: ln r = A/T − B with deterministic scatter, A and B varying from screen
// to screen; the same 50 temperatures in each (a library run on one temperature programme).
const fitBodies = Array.from({ length: SCREENS }, (_, k) => ({
  measurements: Array.from({ length: 50 }, (_, i) => {
    const t = 200 + i * 3;
    const lnR = (1700 + (200 * k) / SCREENS) / t - (3.3 + (0.2 * k) / SCREENS) + 0.03 * Math.sin(i * 1.7 + k);
    return { temperature: { value: t, unit: 'K' as const }, selectivity: { measure: 'ratio' as const, value: Math.exp(lnR) } };
  }),
  predict: Array.from({ length: 60 }, (_, i) => ({ value: 190 + i * 2.7, unit: 'K' as const })),
}));

async function httpSuite() {
  const knex = createKnex(process.env.DATABASE_URL!, { min: 0, max: 4 });
  await migrateLatest(knex);
  const app = createApp({ knex, config: loadConfig({ nodeEnv: 'production', devTools: false }), webDist: null });
  const real = await listen(app);

  // The baseline: a bare Express app with a JSON body parser answering each screen's precomputed body.
  const forecastAnswers = forecastBodies.map((b) => runForecast(forecastRequestSchema.parse(b)));
  const fitAnswers = fitBodies.map((b) => runFit(fitRequestSchema.parse(b)));
  const bare = express();
  bare.use(express.json({ limit: '1mb' }));
  const screenOf = (req: express.Request) => Number(req.get(CASE_HEADER));
  bare.post('/forecast', (req, res) => void res.json(forecastAnswers[screenOf(req)]));
  bare.post('/fit', (req, res) => void res.json(fitAnswers[screenOf(req)]));
  const baseline = await listen(bare);

  console.log(
    `\nHTTP, ${CONNECTIONS} connections cycling through ${SCREENS} screens, our route and a bare Express route with the same bodies in turns: ${ROUNDS} rounds of ${Math.max(1, Math.round(DURATION_S / ROUNDS))} s each after warming each route until its rate settles (autocannon in its own process)`,
  );
  console.log(
    'endpoint                         req/s    p50 ms  p99 ms   bare req/s  ratio   per round              server CPU µs/answer (bare)  warm-up s (bare)',
  );
  for (const [name, route, bodies, key] of [
    ['forecast (200 temperatures)', '/api/v1/forecast', forecastBodies, 'forecastRatio'],
    ['fit (50 runs, 60 predictions)', '/api/v1/fit', fitBodies, 'fitRatio'],
  ] as const) {
    const r = await sideBySide(real.url + route, baseline.url + route.replace('/api/v1', ''), bodies);
    console.log(
      `${name.padEnd(32)} ${r.rps.toFixed(0).padStart(6)}  ${String(r.p50).padStart(6)}  ${String(r.p99).padStart(6)}   ${r.bareRps.toFixed(0).padStart(10)}  ${r.ratio.toFixed(2)}×   ${r.roundRatios
        .map((x) => x.toFixed(2))
        .join(' ')
        .padEnd(22)} ${`${r.cpuUs.toFixed(0)} (${r.bareCpuUs.toFixed(0)})`.padEnd(28)} ${r.warmUpS.ours} (${r.warmUpS.bare})`,
    );
    recordFigure(key, r.ratio);
  }
  real.server.close();
  baseline.server.close();
  await knex.destroy();
}

function engineSuite() {
  console.log('\nEngine: fitEyring (OLS, no predictions), best of 3 (CPU: process time of that run, GC threads included)');
  console.log('points       ms     ns/point   CPU ns/point');
  for (const n of [1e3, 1e4, 1e5, 1e6]) {
    const data = Array.from({ length: n }, (_, i) => {
      const t = 200 + (150 * i) / n;
      return { temperatureK: t, ratio: Math.exp(1800 / t - 3.4 + 0.02 * Math.sin(i)) };
    });
    let best = Infinity;
    let bestCpu = Infinity;
    for (let k = 0; k < 3; k++) {
      const cpu0 = process.cpuUsage();
      const t0 = performance.now();
      fitEyring(data, { weighting: 'none' });
      best = Math.min(best, performance.now() - t0);
      const cpu = process.cpuUsage(cpu0);
      bestCpu = Math.min(bestCpu, (cpu.user + cpu.system) / 1000);
    }
    console.log(
      `${String(n).padEnd(10)} ${best.toFixed(1).padStart(7)}  ${((best * 1e6) / n).toFixed(0).padStart(8)}   ${((bestCpu * 1e6) / n).toFixed(0).padStart(12)}`,
    );
    if (n === 1e6) recordFigure('engineNsPerPointAt1e6', (best * 1e6) / n, 0);
  }
}

/** Which suite measures each figure, so a partial run can say why a figure is missing. */
const suiteOf: Record<BenchKey, string> = {
  forecastRatio: 'http',
  fitRatio: 'http',
  analysisRatio: 'campaign-analysis',
  engineNsPerPointAt1e6: 'engine',
  importRatio50k: 'imports',
  reportRatio10k: 'report',
  initialJsGzipKB: 'bundle',
  campaignPageMs: 'campaign-page',
};

// One suite, or several separated by commas (npm run bench -- imports,campaign-page).
const only = process.argv[2] ? new Set(process.argv[2].split(',')) : null;
const suites: { name: string; run(): unknown }[] = [{ name: 'http', run: httpSuite }, { name: 'engine', run: engineSuite }, ...extraSuites];
const failed = new Map<string, string>();
for (const suite of suites) {
  if (only && !only.has(suite.name)) continue;
  try {
    await suite.run();
  } catch (err) {
    // One broken suite must not hide the others' figures; its own figures stay null.
    const reason = err instanceof Error ? err.message : String(err);
    failed.set(suite.name, reason);
    console.log(`\nsuite ${suite.name} failed: ${reason}`);
  }
}
console.log('');
printBenchLine((key) => {
  const suite = suiteOf[key];
  if (failed.has(suite)) return `suite ${suite} failed: ${failed.get(suite)}`;
  return only && !only.has(suite) ? `suite ${suite} not run (npm run bench -- ${suite})` : null;
});
process.exit(0);
