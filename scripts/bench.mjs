// `npm run bench`: throughput and latency of the computation API against a bare
// Express route, engine fit cost from 10³ to 10⁶ points, and (when present) the
// import and analysis benchmarks. Uses a throwaway PostgreSQL like `npm test`.
import { spawn } from 'node:child_process';
import { ensureDependencies, ensureWebBuild, root } from './lib/deps.mjs';
import { SERVER_NODE_FLAGS } from './lib/server-flags.mjs';

ensureDependencies();
// The bundle and browser suites read the built web app.
if (!process.argv[2] || process.argv[2].split(',').some((name) => ['bundle', 'campaign-page'].includes(name))) ensureWebBuild();
const { startThrowawayCluster, FriendlyError, removeDir } = await import('./lib/pg.mjs');

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
