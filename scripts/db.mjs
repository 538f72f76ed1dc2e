// `npm run db:migrate | db:rollback | db:seed` against DATABASE_URL or the local cluster.
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { ensureDependencies, root } from './lib/deps.mjs';

ensureDependencies();
const { useLocalCluster, FriendlyError } = await import('./lib/pg.mjs');
const command = process.argv[2];
let cluster = null;
try {
  let url = process.env.DATABASE_URL;
  if (!url) {
    cluster = await useLocalCluster({
      dataDir: path.join(root, '.data', 'postgres'),
      port: Number(process.env.EYRIE_PG_PORT ?? 54329),
      database: 'eyrie',
    });
    url = cluster.url;
  }
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
