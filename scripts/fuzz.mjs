// `npm run fuzz [runs] [seed]`: the long fuzz of every write and compute route (default 10 000
// cases) against a throwaway PostgreSQL, through the same test file `npm test` runs with 200.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { root } from './lib/deps.mjs';

const [runs = '10000', seed = '20261202'] = process.argv.slice(2);
const child = spawn(process.execPath, [path.join(root, 'scripts', 'test.mjs'), 'tests/api/fuzz.test.ts'], {
  cwd: root,
  stdio: 'inherit',
  env: { ...process.env, EYRIE_FUZZ_RUNS: runs, EYRIE_FUZZ_SEED: seed, LOG_LEVEL: 'silent' },
});
child.on('exit', (code) => process.exit(code ?? 1));
