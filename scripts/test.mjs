// `npm test`: the whole suite (unit, API on real PostgreSQL, browser end-to-end)
// against a throwaway cluster that is always torn down. Extra arguments go to vitest.
import { spawn, spawnSync } from 'node:child_process';
import { mkdirSync, readFileSync, existsSync, rmSync } from 'node:fs';
import path from 'node:path';
import { ensureDependencies, ensureWebBuild, log, root } from './lib/deps.mjs';

ensureDependencies();
const { startThrowawayCluster, FriendlyError, removeDir } = await import('./lib/pg.mjs');
const { ensureChromium } = await import('./lib/chromium.mjs');
const pg = (await import('pg')).default;

/** The browser tests run unless the arguments name only other files or folders. */
function wantsBrowserTests(args) {
  const paths = args.filter((a) => !a.startsWith('-'));
  return paths.length === 0 || paths.some((a) => a.includes('e2e'));
}

/**
 * The suite rebuilds its database from zero. A database given in DATABASE_URL is used only when its name
 * ends in "_test" or it holds the marker table (tests/global-setup.ts checks the same before touching it).
 */
async function refuseForeignDatabase(url) {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    const { rows } = await client.query("select current_database() as name, to_regclass('eyrie_test_marker') is not null as marked");
    if (rows[0].name.endsWith('_test') || rows[0].marked) return;
    throw new FriendlyError(
      `DATABASE_URL points at database "${rows[0].name}". The tests roll back every migration of their database, which would delete its data, so they stop here.\n` +
        '  To proceed: unset DATABASE_URL and `npm test` starts its own throwaway PostgreSQL;\n' +
        '  or point DATABASE_URL at an empty database whose name ends in "_test" (createdb eyrie_test);\n' +
        '  or, if this database may really be wiped, create the marker table in it: create table eyrie_test_marker ();',
    );
  } finally {
    await client.end();
  }
}

/** Type check, lint, formatting check and the OpenAPI lint, in that order; returns the names of those that failed. */
function runStaticChecks() {
  const bin = (name) => path.join(root, 'node_modules', '.bin', name);
  const checks = [
    ['typecheck', bin('tsc'), ['--noEmit', '-p', 'tsconfig.json']],
    ['lint', bin('eslint'), ['.']],
    ['format', bin('prettier'), ['--check', '--log-level', 'warn', '.']],
    // The generated API description against Redocly's recommended rules (scripts/lint-openapi.ts).
    ['openapi', bin('tsx'), ['scripts/lint-openapi.ts']],
  ];
  const failedChecks = [];
  for (const [name, cmd, args] of checks) {
    log(`${name}…`);
    const r = spawnSync(cmd, args, { cwd: root, stdio: 'inherit' });
    if (r.status !== 0) failedChecks.push(name);
  }
  return failedChecks;
}

let cluster = null;
let tempDir = null;
let exitCode = 1;

function cleanup() {
  try {
    cluster?.stop();
  } finally {
    if (tempDir) removeDir(tempDir);
    cluster = null;
    tempDir = null;
  }
}
process.on('SIGINT', () => {
  cleanup();
  process.exit(130);
});
process.on('SIGTERM', () => {
  cleanup();
  process.exit(143);
});

try {
  if (wantsBrowserTests(process.argv.slice(2))) ensureChromium(log);
  ensureWebBuild();
  // The whole suite (no file arguments) first checks types, lint and formatting: quick, and nothing untyped,
  // unlinted or unformatted lands. Each check that fails counts as one failed test in the closing line.
  const staticFailures = process.argv.length > 2 ? [] : runStaticChecks();
  let databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl) {
    ({ cluster, tempDir } = await startThrowawayCluster({ prefix: 'eyrie-test-', database: 'eyrie_test' }));
    databaseUrl = cluster.url;
    log('throwaway PostgreSQL cluster started for the tests');
  } else {
    await refuseForeignDatabase(databaseUrl);
    log('running the tests against the server in DATABASE_URL');
  }
  const outDir = path.join(root, '.tmp');
  mkdirSync(outDir, { recursive: true });
  const report = path.join(outDir, `vitest-report-${process.pid}.json`);
  rmSync(report, { force: true });
  const child = spawn(
    process.execPath,
    [
      path.join(root, 'node_modules', 'vitest', 'vitest.mjs'),
      'run',
      '--reporter=default',
      '--reporter=json',
      `--outputFile.json=${report}`,
      ...process.argv.slice(2),
    ],
    { cwd: root, stdio: 'inherit', env: { ...process.env, DATABASE_URL: databaseUrl, NODE_ENV: 'test', EYRIE_TEST_TMP: tempDir ?? '' } },
  );
  const code = await new Promise((resolve) => child.on('exit', (c, s) => resolve(c ?? (s ? 1 : 0))));
  let passed = 0;
  let failed = 0;
  if (existsSync(report)) {
    const r = JSON.parse(readFileSync(report, 'utf8'));
    passed = r.numPassedTests ?? 0;
    failed = r.numFailedTests ?? 0;
    // A test file that fails to load counts as a failure even though it has no tests.
    const brokenFiles = (r.testResults ?? []).filter(
      (f) => f.status === 'failed' && (f.assertionResults ?? []).every((a) => a.status !== 'failed'),
    ).length;
    failed += brokenFiles;
  } else {
    failed = 1;
    log('vitest wrote no report');
  }
  rmSync(report, { force: true });
  failed += staticFailures.length;
  if (staticFailures.length) log(`static checks failed: ${staticFailures.join(', ')} (see their output above)`);
  exitCode = code !== 0 || failed > 0 ? code || 1 : 0;
  cleanup();
  console.log(`tests: ${passed} passed, ${failed} failed`);
} catch (err) {
  console.error(`eyrie: ${err instanceof FriendlyError ? err.message : (err?.stack ?? err)}`);
  cleanup();
  exitCode = 1;
}
process.exit(exitCode);
