// Dependency-free helpers: this file runs before node_modules exists.
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync, statSync, readdirSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import path from 'node:path';

export const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), '../..');

export function log(msg) {
  console.log(`eyrie: ${msg}`);
}

/** Run `npm ci` when node_modules is missing or was installed from another lock file. */
export function ensureDependencies() {
  const lock = path.join(root, 'package-lock.json');
  const stamp = path.join(root, 'node_modules', '.eyrie-lock-hash');
  const hash = createHash('sha256').update(readFileSync(lock)).digest('hex');
  if (existsSync(stamp) && readFileSync(stamp, 'utf8').trim() === hash) return;
  log(
    existsSync(path.join(root, 'node_modules'))
      ? 'package-lock.json changed; reinstalling dependencies (npm ci)…'
      : 'installing dependencies (npm ci)…',
  );
  const r = spawnSync('npm', ['ci', '--no-audit', '--no-fund', '--loglevel=error'], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) {
    console.error('eyrie: npm ci failed; see the messages above.');
    process.exit(r.status ?? 1);
  }
  writeFileSync(stamp, hash + '\n');
}

function newestMtime(p) {
  const st = statSync(p);
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = st.mtimeMs;
  for (const entry of readdirSync(p)) newest = Math.max(newest, newestMtime(path.join(p, entry)));
  return newest;
}

/** Build the web app when dist/web is missing or older than its sources. */
export function ensureWebBuild({ force = false } = {}) {
  const built = path.join(root, 'dist', 'web', 'index.html');
  const sources = ['web', 'vite.config.ts', 'package-lock.json', 'tsconfig.json'].map((p) => path.join(root, p)).filter(existsSync);
  const stale = force || !existsSync(built) || Math.max(...sources.map(newestMtime)) > statSync(built).mtimeMs;
  if (!stale) return;
  log('building the web app (vite build)…');
  const r = spawnSync(process.execPath, [path.join(root, 'node_modules', 'vite', 'bin', 'vite.js'), 'build', '--logLevel', 'warn'], {
    cwd: root,
    stdio: 'inherit',
  });
  if (r.status !== 0) {
    console.error('eyrie: the web build failed; see the messages above.');
    process.exit(r.status ?? 1);
  }
}
