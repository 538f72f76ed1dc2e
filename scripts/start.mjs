// `npm start` (and `npm run dev` with --dev): dependencies, PostgreSQL, migrations,
// demo seed, web build, then one supervised server process (restarted with backoff
// when it dies, while PostgreSQL keeps running). Ctrl-C stops everything cleanly.
import { spawn, spawnSync } from 'node:child_process';
import path from 'node:path';
import { ensureDependencies, ensureWebBuild, log, root } from './lib/deps.mjs';
import { SERVER_NODE_FLAGS } from './lib/server-flags.mjs';
import { supervise } from './lib/supervise.mjs';

const dev = process.argv.includes('--dev');
ensureDependencies();
const { startCluster, portIsFree, FriendlyError } = await import('./lib/pg.mjs');

const port = Number(process.env.PORT ?? 3000);
const apiPort = dev ? Number(process.env.EYRIE_API_PORT ?? port + 1) : port;
const pgPort = Number(process.env.EYRIE_PG_PORT ?? 54329);

let cluster = null;
const children = [];
let api = null;
let stopping = false;
let announced = false;

async function main() {
  for (const p of dev ? [port, apiPort] : [port]) {
    if (!(await portIsFree(p))) {
      throw new FriendlyError(`Port ${p} on 127.0.0.1 is already in use. Stop the other program or start with PORT=<another port>.`);
    }
  }
  let databaseUrl = process.env.DATABASE_URL;
  if (databaseUrl) {
    log('using the PostgreSQL server in DATABASE_URL (no local cluster started)');
  } else {
    cluster = await startCluster({ dataDir: path.join(root, '.data', 'postgres'), port: pgPort, database: 'eyrie', durable: true });
    databaseUrl = cluster.url;
  }
  const env = { ...process.env, DATABASE_URL: databaseUrl, NODE_ENV: dev ? 'development' : (process.env.NODE_ENV ?? 'production') };
  if (!process.env.EYRIE_DEV_TOOLS) env.EYRIE_DEV_TOOLS = '1';

  log('migrating and seeding the demo scenario…');
  const prep = spawnSync(process.execPath, ['--import', 'tsx', 'api/cli.ts', 'prepare'], { cwd: root, env, stdio: 'inherit' });
  if (prep.status !== 0) throw new FriendlyError('database preparation failed; see the messages above.');

  if (!dev) ensureWebBuild();
  const publicUrl = process.env.PUBLIC_URL ?? `http://127.0.0.1:${port}`;
  // In development the watcher restarts on edits; otherwise the supervisor restarts the server when it dies.
  api = supervise({
    name: 'the API server',
    args: [...SERVER_NODE_FLAGS, '--import', 'tsx', ...(dev ? ['--watch'] : []), 'api/server.ts'],
    cwd: root,
    env: { ...env, PORT: String(apiPort), PUBLIC_URL: publicUrl, LOG_LEVEL: process.env.LOG_LEVEL ?? 'warn' },
    log,
    onSpawn: (child) =>
      child.on('message', (m) => {
        if (m?.type !== 'ready') return;
        if (!dev && !announced) announce(publicUrl, env.EYRIE_DEV_TOOLS === '1' || env.EYRIE_DEV_TOOLS === 'true');
        else if (announced) log(`the API server is answering again at ${publicUrl}`);
        announced = true;
      }),
  });
  if (dev) {
    const vite = spawn(process.execPath, [path.join(root, 'node_modules', 'vite', 'bin', 'vite.js')], {
      cwd: root,
      env: { ...env, PORT: String(port), EYRIE_API_PORT: String(apiPort) },
      stdio: 'inherit',
    });
    children.push(vite);
    vite.on('exit', () => !stopping && void shutdown(1));
    announce(publicUrl, env.EYRIE_DEV_TOOLS === '1' || env.EYRIE_DEV_TOOLS === 'true');
    announced = true;
  }
}

function announce(url, devTools) {
  const github = process.env.GITHUB_CLIENT_ID && process.env.GITHUB_CLIENT_SECRET;
  console.log('');
  console.log(`  Eyrie is ready:  ${url}`);
  console.log(
    github
      ? '  Sign in with GitHub (GITHUB_CLIENT_ID is set).'
      : '  Sign in: press "Sign in" and pick a demo identity on the local sign-in page\n  (Ada Pemberton = owner, Tomás Reyes = editor, Mina Okafor = viewer; all invented).',
  );
  console.log('  The calculators need no sign-in. Stop with Ctrl-C.');
  if (devTools) {
    console.log('  Development tools are ON (local sign-in page, mailbox at /dev/mailbox): anyone who can reach');
    console.log('  this port can sign in as anyone. They refuse to run unless the server listens on loopback only;');
    console.log('  set EYRIE_DEV_TOOLS=0 and GITHUB_CLIENT_ID/SECRET for a shared deployment.');
  }
  console.log('');
}

async function shutdown(code = 0) {
  if (stopping) return;
  stopping = true;
  await Promise.all([
    api?.stop(8000),
    ...children.map(
      (c) =>
        new Promise((resolve) => {
          if (c.exitCode !== null || c.signalCode !== null) return resolve();
          c.once('exit', resolve);
          c.kill('SIGTERM');
          setTimeout(() => c.kill('SIGKILL'), 8000).unref();
        }),
    ),
  ]);
  cluster?.stop();
  process.exit(code);
}

process.on('SIGINT', () => void shutdown(0));
process.on('SIGTERM', () => void shutdown(0));

main().catch((err) => {
  console.error(`eyrie: ${err instanceof FriendlyError ? err.message : (err?.stack ?? err)}`);
  void shutdown(1);
});
