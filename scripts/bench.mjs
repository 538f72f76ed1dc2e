// `npm run bench`: throughput and latency of the computation API against a bare
// Express route, engine fit cost from 10³ to 10⁶ points, and (when present) the
// import and analysis benchmarks. Uses a throwaway PostgreSQL like `npm test`.
import { spawn } from 'node:child_process';
import { ensureDependencies, ensureWebBuild, log, root } from './lib/deps.mjs';
import { SERVER_NODE_FLAGS } from './lib/server-flags.mjs';

ensureDependencies();
const wants = (names) => !process.argv[2] || process.argv[2].split(',').some((name) => names.includes(name));
// The bundle and browser suites read the built web app.
if (wants(['bundle', 'campaign-page'])) ensureWebBuild();
const { startThrowawayCluster, FriendlyError, removeDir } = await import('./lib/pg.mjs');
// The browser suite needs Debian's Chromium, installed as `npm test` installs it (as root) or named otherwise.
if (wants(['campaign-page'])) {
  const { ensureChromium } = await import('./lib/chromium.mjs');
  try {
    ensureChromium(log);
  } catch (err) {
    console.error(`eyrie: ${err instanceof FriendlyError ? err.message : (err?.stack ?? err)}`);
  }
}

let cluster = null;
let tempDir = null;
let code = 1;
try {
  let url = process.env.DATABASE_URL;
  if (!url) {
    ({ cluster, tempDir } = await startThrowawayCluster({ prefix: 'eyrie-bench-', database: 'eyrie_bench' }));
    url = cluster.url;
  }
  const child = spawn(
    process.execPath,
    [
      // The app under test runs with the server's own flags (scripts/lib/server-flags.mjs).
      ...SERVER_NODE_FLAGS,
      ...(process.env.EYRIE_BENCH_PROF ? ['--cpu-prof', '--cpu-prof-dir=' + process.env.EYRIE_BENCH_PROF] : []),
      '--import',
      'tsx',
      'scripts/bench/run.ts',
      ...process.argv.slice(2),
    ],
    {
      cwd: root,
      stdio: 'inherit',
      env: { ...process.env, DATABASE_URL: url, NODE_ENV: 'production', LOG_LEVEL: 'silent', EYRIE_COMPUTE_LIMIT: '100000000' },
    },
  );
  code = await new Promise((resolve) => child.on('exit', (c) => resolve(c ?? 1)));
} catch (err) {
  console.error(`eyrie: ${err instanceof FriendlyError ? err.message : (err?.stack ?? err)}`);
} finally {
  cluster?.stop();
  if (tempDir) removeDir(tempDir);
}
process.exit(code);
