// Debian's Chromium for the browser tests, installed the way `npm start` installs PostgreSQL.
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { FriendlyError } from './pg.mjs';

const INSTALL = 'sudo apt-get update && sudo apt-get install -y chromium';

export function findChromium() {
  for (const name of ['chromium', 'chromium-browser']) {
    try {
      const p = execFileSync('which', [name], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'] }).trim();
      if (p) return p;
    } catch {
      // try the next name
    }
  }
  return existsSync('/usr/bin/chromium') ? '/usr/bin/chromium' : null;
}

/** Return Chromium's path; as root install Debian's package when it is missing, otherwise say how. */
export function ensureChromium(log) {
  const found = findChromium();
  if (found) return found;
  if (process.getuid?.() !== 0) {
    throw new FriendlyError(
      `the browser tests need Chromium, which is not installed. Install it with:  ${INSTALL}  (or run only other tests: npm test -- tests/unit tests/api)`,
    );
  }
  log('Chromium missing; installing Debian package "chromium" with apt-get for the browser tests…');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  execFileSync('apt-get', ['install', '-y', '-qq', 'chromium'], { stdio: 'inherit', env });
  const installed = findChromium();
  if (!installed) throw new FriendlyError('apt-get finished but no chromium binary appeared on PATH.');
  return installed;
}
