// `npm run db:backup [-- file]` and `npm run db:restore -- file`: pg_dump / pg_restore from the same
// PostgreSQL install that runs the local cluster, against DATABASE_URL or the local cluster in .data/postgres.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { ensureDependencies, log, root } from './lib/deps.mjs';

ensureDependencies();
const { findPgBin, databaseUrlOrLocalCluster, FriendlyError } = await import('./lib/pg.mjs');

const [command, fileArg] = process.argv.slice(2);

/** The connection string without its password, which goes to the tools through PGPASSWORD (not the process list). */
function splitPassword(url) {
  const u = new URL(url);
  const password = decodeURIComponent(u.password);
  u.password = '';
  return { url: u.toString(), password };
}

function run(tool, args, url) {
  const { bin } = findPgBin();
  const conn = splitPassword(url);
  const r = spawnSync(path.join(bin, tool), [...args, `--dbname=${conn.url}`], {
    stdio: 'inherit',
    env: { ...process.env, PGPASSWORD: conn.password, PGCONNECT_TIMEOUT: '10' },
  });
  if (r.error) throw r.error;
  if (r.status !== 0) throw new FriendlyError(`${tool} failed (exit code ${r.status}); see the messages above.`);
}

/**
 * Restore `file` into the database at `url` in one transaction. pg_restore --clean cannot drop the job queue's
 * partitioned tables (their partitions' inherited constraints), so the dump's schemas are dropped whole first and the
 * dump's script then runs through psql with --single-transaction: a restore that fails leaves the database as it was.
 */
function restore(file, url) {
  const { bin } = findPgBin();
  const conn = splitPassword(url);
  const env = { ...process.env, PGPASSWORD: conn.password, PGCONNECT_TIMEOUT: '10' };
  const toc = spawnSync(path.join(bin, 'pg_restore'), ['--list', file], { encoding: 'utf8', maxBuffer: 1 << 28 });
  if (toc.status !== 0) throw new FriendlyError(`pg_restore could not read ${file}: ${(toc.stderr || '').trim()}`);
  const schemas = new Set(['public']);
  for (const m of toc.stdout.matchAll(/^\d+; \d+ \d+ SCHEMA - (\S+) /gm)) schemas.add(m[1]);
  const script = spawnSync(path.join(bin, 'pg_restore'), ['--no-owner', '--no-privileges', '--file=-', file], { maxBuffer: 1 << 30 });
  if (script.status !== 0) throw new FriendlyError(`pg_restore could not read ${file}: ${String(script.stderr).trim()}`);
  const prelude =
    [...schemas].map((s) => `DROP SCHEMA IF EXISTS "${s.replace(/"/g, '""')}" CASCADE;`).join('\n') +
    '\nCREATE SCHEMA IF NOT EXISTS public;\n';
  const r = spawnSync(path.join(bin, 'psql'), ['-X', '-q', '-v', 'ON_ERROR_STOP=1', '--single-transaction', `--dbname=${conn.url}`], {
    input: Buffer.concat([Buffer.from(prelude), script.stdout]),
    stdio: ['pipe', 'ignore', 'inherit'],
    env,
    maxBuffer: 1 << 30,
  });
  if (r.error) throw r.error;
  if (r.status !== 0)
    throw new FriendlyError(`the restore failed (psql exit code ${r.status}); see the messages above. The database was left as it was.`);
}

const stamp = () => new Date().toISOString().replace(/[-:]/g, '').replace('T', '-').slice(0, 15);

let cluster = null;
try {
  if (command !== 'backup' && command !== 'restore')
    throw new FriendlyError('usage: npm run db:backup [-- file.dump]  |  npm run db:restore -- file.dump');
  if (command === 'restore' && !fileArg)
    throw new FriendlyError('name the backup to restore: npm run db:restore -- .data/backups/eyrie-….dump');
  const database = await databaseUrlOrLocalCluster(root);
  cluster = database.cluster;
  const url = database.url;
  if (command === 'backup') {
    const file = path.resolve(fileArg ?? path.join(root, '.data', 'backups', `eyrie-${stamp()}.dump`));
    mkdirSync(path.dirname(file), { recursive: true });
    // Custom format: compressed, and pg_restore can restore it whole or in parts.
    run('pg_dump', ['--format=custom', '--no-owner', '--no-privileges', `--file=${file}`], url);
    log(
      `backup written: ${file} (${Math.round(statSync(file).size / 1024)} KiB). Restore it with: npm run db:restore -- ${path.relative(process.cwd(), file)}`,
    );
  } else {
    const file = path.resolve(fileArg);
    if (!existsSync(file)) throw new FriendlyError(`no backup at ${file}`);
    // One transaction: a restore that fails half-way leaves the database as it was.
    restore(file, url);
    log(`restored ${file}. Restart Eyrie (npm start) so no process keeps rows it read before the restore.`);
  }
} catch (err) {
  console.error(`eyrie: ${err instanceof FriendlyError ? err.message : (err?.stack ?? err)}`);
  process.exitCode = 1;
} finally {
  cluster?.stop();
}
