// `npm run bench`: throughput and latency of the computation API against a bare
// Express route, engine fit cost from 10³ to 10⁶ points, and (when present) the
// import and analysis benchmarks. Uses a throwaway PostgreSQL like `npm test`.
import { spawn } from 'node:child_process';
import { chmodSync, mkdtempSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { ensureDependencies, ensureWebBuild, root } from './lib/deps.mjs';

ensureDependencies();
// The bundle and browser suites read the built web app.
if (!process.argv[2] || ['bundle', 'campaign-page'].includes(process.argv[2])) ensureWebBuild();
const { startCluster, freePort, FriendlyError, removeDir } = await import('./lib/pg.mjs');

let cluster = null;
let tempDir = null;
let code = 1;
try {
  let url = process.env.DATABASE_URL;
  if (!url) {
    tempDir = mkdtempSync(path.join(os.tmpdir(), 'eyrie-bench-'));
    chmodSync(tempDir, 0o711); // the postgres user must traverse it when we run as root
    cluster = await startCluster({
      dataDir: path.join(tempDir, 'pgdata'),
      port: await freePort(),
      database: 'eyrie_bench',
      durable: false,
      quiet: true,
    });
    url = cluster.url;
  }
  const child = spawn(
    process.execPath,
    [
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
