/**
 * Campaign page in the browser: a campaign of 1 000 stored runs opened in headless Chromium
 * (Debian's /usr/bin/chromium through playwright-core) from the built web app served by the real
 * API on loopback. The figure, `campaignPageMs`, is the time to interactive read from the page's
 * own Performance API: the later of DOMContentLoaded, the moment the Eyring plot's measured points,
 * the fitted parameters and the first rows of the runs list are on screen, and the end of the last
 * long task (> 50 ms, PerformanceObserver 'longtask') before the page went quiet, that is before a
 * full second passed with no long task. Median of 11 cold loads (EYRIE_PAGE_LOADS=n for another count):
 * single loads of one build spread from under 400 to over 700 ms within a minute, and a median of 5 moved with one
 * or two slow loads.
 * The page watches itself (a script run before its own, see OBSERVE_PAGE) and the bench only reads
 * its notes, so no harness code runs in the page while it loads.
 *
 * EYRIE_PAGE_BASELINE=<another build's dist/web> interleaves loads of that build, served by the same
 * API, and prints both medians and their ratio: the fair comparison on a machine whose load varies.
 * EYRIE_PAGE_PROFILE=file.cpuprofile adds one load under the DevTools CPU profiler and prints the
 * page's requests with their timings and the number of elements in its charts and tables.
 * EYRIE_PAGE_TRACE=file.json (with EYRIE_PAGE_PROFILE) also writes that load's timeline trace, and
 * EYRIE_PAGE_FIGURES=file.html the markup of its charts.
 * EYRIE_PAGE_LOADS=n counts n loads instead of 11; EYRIE_PAGE_DIST=<dist/web> serves that build as this one.
 *
 * Needs DATABASE_URL and dist/web (npm run bench provides both).
 */
import '../../api/db/pg-types';
import { randomBytes } from 'node:crypto';
import { writeFile } from 'node:fs/promises';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import type { BrowserContext, CDPSession } from 'playwright-core';
import { createApp } from '../../api/app';
import { loadConfig } from '../../api/config';
import { createKnex, migrateLatest } from '../../api/db/knex';
import { startFakeOAuthProvider } from '../../api/features/auth/fake-provider';
import { openBrowser } from '../../tests/support/browser';
import { sessionCookie, signIn } from '../../tests/support/auth';
import { recordFigure } from './results';
import type { BenchSuite } from './suites';
import { insertSyntheticScreen } from './synthetic-screen';

const RUNS = 1000;
/** Loads counted (after one warm-up); another count with EYRIE_PAGE_LOADS (more when comparing two builds). */
const LOADS = Math.max(1, Number(process.env.EYRIE_PAGE_LOADS ?? 11) || 11);
const QUIET_MS = 1000;

/** What marks the page as ready: the fitted parameters, the Eyring plot's own marks and the first rows of the runs list. */
const READY_SELECTORS = [
  'section[aria-label="Fitted parameters"]',
  // The plot's own marks (a path per kind of mark, or a circle per run in builds before that): the
  // legend's swatches sit outside the plot's box and are drawn before the plot is.
  '[data-testid="eyring-plot"] svg :is(path.eyrie-points-fitted, circle)',
  'table[aria-label="Measurements"] tbody tr td',
];

/**
 * Runs in the page before its scripts. Keeps every long task, and at each animation frame looks for
 * the ready marks until all are there, noting the frame's time. The page watches itself, so nothing
 * of the harness runs in it while it loads: Playwright's own page script (injected on first use of
 * its waiting helpers, 15-60 ms of evaluation on the page's main thread) is never called for, and
 * the bench reads the notes through bare DevTools evaluations.
 */
const OBSERVE_PAGE = `
  window.__eyrieLongTasks = [];
  new PerformanceObserver((list) => { for (const e of list.getEntries()) window.__eyrieLongTasks.push([e.startTime, e.duration]); }).observe({ type: 'longtask', buffered: true });
  window.__eyrieReady = null;
  const readyMarks = ${JSON.stringify(READY_SELECTORS)};
  const lookForReady = () => {
    if (readyMarks.every((s) => document.querySelector(s))) window.__eyrieReady = performance.now();
    else requestAnimationFrame(lookForReady);
  };
  requestAnimationFrame(lookForReady);
`;

interface LoadFigures {
  tti: number;
  ready: number;
  dcl: number;
  lastLongTaskEnd: number;
  /** The renderer's own counters (CDP Performance.getMetrics) once the page is quiet: CPU time of its main thread and its layouts. */
  mainThreadCpuMs: number;
  layouts: number;
  layoutMs: number;
  styleMs: number;
  scriptMs: number;
}

/** An expression evaluated in the page through DevTools alone (no Playwright page script), its value returned. */
async function readInPage<T>(cdp: CDPSession, expression: string): Promise<T> {
  const { result, exceptionDetails } = await cdp.send('Runtime.evaluate', { expression, returnByValue: true });
  if (exceptionDetails) throw new Error(`in the page: ${exceptionDetails.text} (${expression})`);
  return result.value as T;
}

/** Polls `expression` in the page every `everyMs` until it is truthy; returns that value. */
async function pollInPage<T>(cdp: CDPSession, expression: string, everyMs: number, timeoutMs = 60_000): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const value = await readInPage<T | null>(cdp, expression);
    if (value) return value;
    if (Date.now() > until) throw new Error(`the page never reached: ${expression}`);
    await new Promise((resolve) => setTimeout(resolve, everyMs));
  }
}

/** One cold load of `url` in a new tab, timed by the page's own clock (see the top of this file). */
async function measureLoad(context: BrowserContext, url: string): Promise<LoadFigures> {
  const page = await context.newPage();
  const cdp = await context.newCDPSession(page);
  await cdp.send('Performance.enable', { timeDomain: 'threadTicks' });
  await page.goto(url, { waitUntil: 'commit' });
  // The moment the plot, the fit and the runs list are on screen, as the page's own clock read it.
  const ready = await pollInPage<number>(cdp, 'window.__eyrieReady', 50);
  // Quiet: a full second with no long task (a later one would still keep the page from answering).
  const lastLongTaskEnd = 'window.__eyrieLongTasks.reduce((m, [s, d]) => Math.max(m, s + d), 0)';
  await pollInPage(cdp, `performance.now() - ${lastLongTaskEnd} >= ${QUIET_MS}`, 100);
  const figures = await readInPage<{ dcl: number; lastLongTaskEnd: number }>(
    cdp,
    `({ dcl: performance.getEntriesByType('navigation')[0].domContentLoadedEventEnd, lastLongTaskEnd: ${lastLongTaskEnd} })`,
  );
  // The main thread's CPU time hardly moves with other jobs on the machine, unlike the clock: the
  // steadier figure when two builds are compared.
  const { metrics } = await cdp.send('Performance.getMetrics');
  const metric = (name: string) => metrics.find((m) => m.name === name)?.value ?? NaN;
  await page.close();
  return {
    ...figures,
    ready,
    tti: Math.max(figures.dcl, ready, figures.lastLongTaskEnd),
    mainThreadCpuMs: metric('ThreadTime') * 1000,
    layouts: metric('LayoutCount'),
    layoutMs: metric('LayoutDuration') * 1000,
    styleMs: metric('RecalcStyleDuration') * 1000,
    scriptMs: metric('ScriptDuration') * 1000,
  };
}

const medianLoad = (loads: LoadFigures[]) => [...loads].sort((a, b) => a.tti - b.tti)[Math.floor(loads.length / 2)]!;

const medianOf = (loads: LoadFigures[], key: keyof LoadFigures) => median(loads.map((l) => l[key]));
const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)]!;

function describeLoads(loads: LoadFigures[]) {
  const m = medianLoad(loads);
  return (
    `${m.tti.toFixed(0)} ms (DOMContentLoaded ${m.dcl.toFixed(0)} ms, plot + fit + list on screen ${m.ready.toFixed(0)} ms, last long task ends ${m.lastLongTaskEnd.toFixed(0)} ms); all loads: ${loads.map((t) => t.tti.toFixed(0)).join(', ')} ms\n` +
    `  main thread until quiet (medians): CPU ${medianOf(loads, 'mainThreadCpuMs').toFixed(0)} ms, ${medianOf(loads, 'layouts')} layouts taking ${medianOf(loads, 'layoutMs').toFixed(0)} ms, style ${medianOf(loads, 'styleMs').toFixed(0)} ms, script ${medianOf(loads, 'scriptMs').toFixed(0)} ms`
  );
}

interface TraceEvent {
  name: string;
  ph: string;
  dur?: number;
  tid: number;
  pid: number;
  args?: { name?: string };
}

/** Time of the renderer's main thread in its top kinds of work (layout, style, paint, script…), from a timeline trace. */
function mainThreadWork(events: TraceEvent[]): string {
  const kinds = new Set([
    'Layout',
    'UpdateLayoutTree',
    'Paint',
    'PrePaint',
    'Layerize',
    'FunctionCall',
    'EvaluateScript',
    'v8.compile',
    'ParseHTML',
    'MajorGC',
    'MinorGC',
    'EventDispatch',
    'TimerFire',
    'FireAnimationFrame',
    'RunMicrotasks',
    'ParseAuthorStyleSheet',
    'HitTest',
    'ResourceReceivedData',
  ]);
  // The page's renderer may change at navigation: the busiest renderer main thread is the page's.
  const mains = new Set(
    events.filter((e) => e.name === 'thread_name' && e.args?.name === 'CrRendererMain').map((e) => `${e.pid}:${e.tid}`),
  );
  const byThread = new Map<string, Map<string, number>>();
  const countsByThread = new Map<string, Map<string, number>>();
  for (const e of events) {
    const thread = `${e.pid}:${e.tid}`;
    if (!mains.has(thread) || e.ph !== 'X' || !kinds.has(e.name)) continue;
    const totals = byThread.get(thread) ?? new Map<string, number>();
    totals.set(e.name, (totals.get(e.name) ?? 0) + (e.dur ?? 0) / 1000);
    byThread.set(thread, totals);
    const counts = countsByThread.get(thread) ?? new Map<string, number>();
    counts.set(e.name, (counts.get(e.name) ?? 0) + 1);
    countsByThread.set(thread, counts);
  }
  const sum = (m: Map<string, number>) => [...m.values()].reduce((a, b) => a + b, 0);
  const busiest = [...byThread].sort((a, b) => sum(b[1]) - sum(a[1]))[0];
  if (!busiest) return 'no renderer main thread in the trace';
  const counts = countsByThread.get(busiest[0])!;
  // How often matters as much as how long for layout: each forced layout lays out the page again.
  return [...busiest[1]]
    .sort((a, b) => b[1] - a[1])
    .map(([k, ms]) => `${k} ${ms.toFixed(0)} ms${k === 'Layout' || k === 'UpdateLayoutTree' ? ` (${counts.get(k)}×)` : ''}`)
    .join(', ');
}

/** One more load under the DevTools CPU profiler, written as a .cpuprofile, with the API requests' timings printed. */
async function profileOneLoad(context: BrowserContext, url: string, file: string) {
  const page = await context.newPage();
  const cdp = await context.newCDPSession(page);
  await cdp.send('Profiler.enable');
  await cdp.send('Profiler.setSamplingInterval', { interval: 200 });
  await cdp.send('Profiler.start');
  const traceEvents: TraceEvent[] = [];
  cdp.on('Tracing.dataCollected', (e) => traceEvents.push(...(e.value as unknown as TraceEvent[])));
  // EYRIE_PAGE_TRACE=file.json also keeps the whole timeline trace (every task with what ran inside it), for Chromium's
  // Performance panel or a script.
  const traceFile = process.env.EYRIE_PAGE_TRACE;
  await cdp.send('Tracing.start', {
    categories: traceFile ? 'devtools.timeline,disabled-by-default-devtools.timeline,toplevel,blink.user_timing' : 'devtools.timeline',
    transferMode: 'ReportEvents',
  });
  await page.goto(url, { waitUntil: 'commit' });
  // As in a counted load, only the page's own notes are read until it is ready.
  await pollInPage(cdp, 'window.__eyrieReady', 50);
  await page.waitForTimeout(QUIET_MS);
  const { profile } = await cdp.send('Profiler.stop');
  const traced = new Promise<void>((resolve) => cdp.once('Tracing.tracingComplete', () => resolve()));
  await cdp.send('Tracing.end');
  await traced;
  console.log(`Main thread of the page, by kind of work: ${mainThreadWork(traceEvents)}`);
  const requests = await page.evaluate(() =>
    performance
      .getEntriesByType('resource')
      .filter((e) => e.name.includes('/api/') || /\.(js|css)$/.test(e.name))
      .map((e) => {
        const r = e as PerformanceResourceTiming;
        return `${r.startTime.toFixed(0).padStart(5)}–${r.responseEnd.toFixed(0).padStart(5)} ms ${String(r.encodedBodySize).padStart(8)} B ${new URL(r.name).pathname}`;
      }),
  );
  const longTasks = await page.evaluate(() =>
    (window as unknown as { __eyrieLongTasks: [number, number][] }).__eyrieLongTasks.map(([s, d]) => `${s.toFixed(0)}+${d.toFixed(0)}`),
  );
  console.log(`Long tasks (start+duration, ms): ${longTasks.join(', ')}`);
  const elements = await page.evaluate(() => ({
    page: document.querySelectorAll('*').length,
    plots: [...document.querySelectorAll('figure svg')].map((svg) => svg.querySelectorAll('*').length),
    tables: [...document.querySelectorAll('table')].map(
      (t) => `${t.getAttribute('aria-label') ?? t.querySelector('caption')?.textContent}: ${t.querySelectorAll('*').length}`,
    ),
  }));
  console.log(JSON.stringify(elements));
  // The charts as drawn, once every pass has settled: two builds' drawings compared side by side
  // (the synthetic screen is drawn at random, so compare the structure and the axes, not the marks).
  if (process.env.EYRIE_PAGE_FIGURES) {
    await page.waitForTimeout(QUIET_MS);
    const figures = await page.evaluate(() => [...document.querySelectorAll('figure')].map((f) => f.outerHTML));
    await writeFile(process.env.EYRIE_PAGE_FIGURES, figures.join('\n\n'));
  }
  await page.close();
  await writeFile(file, JSON.stringify(profile));
  if (traceFile) await writeFile(traceFile, JSON.stringify({ traceEvents }));
  console.log(`\nProfiled load written to ${file}; requests:\n${requests.join('\n')}`);
}

async function run() {
  const knex = createKnex(process.env.DATABASE_URL!, { min: 0, max: 4 });
  await migrateLatest(knex);
  const provider = await startFakeOAuthProvider();
  // Test mode: session cookies without the Secure flag, since the page is served over plain loopback HTTP.
  const app = createApp({
    knex,
    config: loadConfig({ nodeEnv: 'test', devTools: true, databaseUrl: process.env.DATABASE_URL! }),
    fakeOAuth: provider,
    // Another build in place of dist/web (say, one built with `vite build --minify false` for a readable profile).
    ...(process.env.EYRIE_PAGE_DIST ? { webDist: process.env.EYRIE_PAGE_DIST } : {}),
  });
  const tag = randomBytes(4).toString('hex');
  const identity = { login: `page-bench-${tag}`, name: 'Page bench', email: `page-bench-${tag}@example.test` };
  const browser = await openBrowser(app);
  let baselineServer: Server | null = null;
  let projectId: string | null = null;
  try {
    const { done, user } = await signIn(app, identity);
    const cookie = sessionCookie(done.headers['set-cookie'] as unknown as string[]);
    if (!cookie) throw new Error('sign-in set no session cookie');
    const screen = await insertSyntheticScreen(knex, user.id, { project: `Page bench ${tag}`, campaign: `Page bench screen ${tag}` }, RUNS);
    projectId = screen.projectId;
    const campaign = { id: screen.campaignId };

    const [name, value] = cookie.split(';')[0]!.split('=') as [string, string];
    const { context, baseUrl } = browser;
    await context.addCookies([{ name, value, url: baseUrl }]);
    await context.addInitScript(OBSERVE_PAGE);
    const url = `${baseUrl}/campaigns/${campaign.id}`;

    // Optionally another build of the web app (say, of an earlier commit) served by the same API, its
    // loads interleaved with this build's, so the two figures share the machine's load of the moment.
    const baselineDist = process.env.EYRIE_PAGE_BASELINE;
    let baselineUrl: string | null = null;
    if (baselineDist) {
      const baselineApp = createApp({
        knex,
        config: loadConfig({ nodeEnv: 'test', devTools: true, databaseUrl: process.env.DATABASE_URL! }),
        fakeOAuth: provider,
        webDist: baselineDist,
      });
      baselineServer = await new Promise<Server>((resolve) => {
        const server = baselineApp.listen(0, '127.0.0.1', () => resolve(server));
      });
      const base = `http://127.0.0.1:${(baselineServer.address() as AddressInfo).port}`;
      await context.addCookies([{ name, value, url: base }]);
      baselineUrl = `${base}/campaigns/${campaign.id}`;
    }

    const times: LoadFigures[] = [];
    const baselineTimes: LoadFigures[] = [];
    for (let i = 0; i <= LOADS; i++) {
      const current = await measureLoad(context, url);
      const baseline = baselineUrl ? await measureLoad(context, baselineUrl) : null;
      // The first load warms the server and the browser's code cache; it is not counted.
      if (i > 0) {
        times.push(current);
        if (baseline) baselineTimes.push(baseline);
      }
    }
    if (process.env.EYRIE_PAGE_PROFILE) await profileOneLoad(context, url, process.env.EYRIE_PAGE_PROFILE);
    const middle = medianLoad(times);
    console.log(`\nCampaign page, ${RUNS} runs charted and listed, headless Chromium, median of ${LOADS} loads after one warm-up`);
    console.log(`time to interactive (target ≤ 500 ms) ${describeLoads(times)}`);
    if (baselineTimes.length) {
      const baseline = medianLoad(baselineTimes);
      console.log(`baseline build (${baselineDist}), loads interleaved: ${describeLoads(baselineTimes)}`);
      console.log(
        `this build / baseline: ${(middle.tti / baseline.tti).toFixed(2)}× to interactive, ` +
          `${(medianOf(times, 'mainThreadCpuMs') / medianOf(baselineTimes, 'mainThreadCpuMs')).toFixed(2)}× main-thread CPU`,
      );
    }
    recordFigure('campaignPageMs', middle.tti, 0);
  } finally {
    if (baselineServer) {
      const server = baselineServer;
      await new Promise<void>((resolve) => server.close(() => resolve()));
    }
    await browser.close();
    await provider.close();
    if (projectId) await knex('projects').where({ id: projectId }).delete();
    await knex('users').where({ login: identity.login }).delete();
    await knex.destroy();
  }
}

export const campaignPageBenchSuite: BenchSuite = { name: 'campaign-page', run };
