// `npm run db:migrate | db:rollback | db:seed` against DATABASE_URL or the local cluster.
import { spawnSync } from 'node:child_process';
import { ensureDependencies, root } from './lib/deps.mjs';

ensureDependencies();
const { databaseUrlOrLocalCluster, FriendlyError } = await import('./lib/pg.mjs');
const command = process.argv[2];
let cluster = null;
try {
  const database = await databaseUrlOrLocalCluster(root);
  cluster = database.cluster;
  const url = database.url;
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'api/cli.ts', command], {
    cwd: root,
    stdio: 'inherit',
    env: { ...process.env, DATABASE_URL: url },
  });
  process.exitCode = r.status ?? 1;
} catch (err) {
  console.error(`eyrie: ${err instanceof FriendlyError ? err.message : (err?.stack ?? err)}`);
  process.exitCode = 1;
} finally {
  cluster?.stop();
}
