import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import { chmodSync, mkdtempSync, readFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { freePort, removeDir, startCluster } from '../../scripts/lib/pg.mjs';

/**
 * A PostgreSQL cluster of the test's own (never the shared test cluster), for tests that freeze or stop
 * the database. fsync is off; the folder is removed by close().
 */
export async function startOwnCluster(database = 'eyrie_outage_test') {
  const base = process.env.EYRIE_TEST_TMP || os.tmpdir();
  const dir = mkdtempSync(path.join(base, 'own-pg-'));
  chmodSync(dir, 0o711);
  const dataDir = path.join(dir, 'pgdata');
  const port = await freePort();
  let cluster = await startCluster({ dataDir, port, database, durable: false, quiet: true });
  const postmasterPid = () => Number(readFileSync(path.join(dataDir, 'postmaster.pid'), 'utf8').split('\n')[0]);
  /** The postmaster and every backend it has forked. */
  const serverPids = () => {
    const pid = postmasterPid();
    const children = execFileSync('ps', ['-o', 'pid=', '--ppid', String(pid)], { encoding: 'utf8' })
      .split('\n')
      .map((s) => Number(s.trim()))
      .filter((n) => n > 0);
    return [pid, ...children];
  };
  let frozen: number[] = [];
  return {
    url: cluster.url,
    /** SIGSTOP: the server keeps its sockets but answers nothing, like a hung host. */
    freeze() {
      frozen = serverPids();
      for (const pid of frozen) process.kill(pid, 'SIGSTOP');
    },
    thaw() {
      for (const pid of frozen) {
        try {
          process.kill(pid, 'SIGCONT');
        } catch {
          // a backend may have ended meanwhile
        }
      }
      frozen = [];
    },
    stop() {
      cluster.stop();
    },
    async restart() {
      cluster = await startCluster({ dataDir, port, database, durable: false, quiet: true });
    },
    close() {
      if (frozen.length) this.thaw();
      cluster.stop();
      removeDir(dir);
    },
  };
}
export type OwnCluster = Awaited<ReturnType<typeof startOwnCluster>>;

/** Lines a child process printed, kept for waiting on a pattern. */
export function collectOutput(child: ChildProcess) {
  let text = '';
  child.stdout?.on('data', (d: Buffer) => (text += d.toString()));
  child.stderr?.on('data', (d: Buffer) => (text += d.toString()));
  return {
    get text() {
      return text;
    },
    async waitFor(pattern: RegExp, timeoutMs: number): Promise<RegExpMatchArray> {
      const until = Date.now() + timeoutMs;
      for (;;) {
        const m = pattern.exec(text);
        if (m) return m;
        if (Date.now() > until) throw new Error(`timed out waiting for ${pattern} in:\n${text.slice(-3000)}`);
        await new Promise((r) => setTimeout(r, 100));
      }
    },
  };
}

/** Start `node <args>` in the repository with piped output. */
export function startNode(args: string[], env: NodeJS.ProcessEnv) {
  const child = spawn(process.execPath, args, {
    cwd: process.cwd(),
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe', 'ipc'],
  });
  return { child, output: collectOutput(child) };
}

/** Time a request (ms) and return its status, headers and JSON body; never waits longer than `timeoutMs`. */
export async function timedFetch(url: string, init: RequestInit = {}, timeoutMs = 20_000) {
  const started = Date.now();
  const res = await fetch(url, { ...init, signal: AbortSignal.timeout(timeoutMs) });
  const text = await res.text();
  let body: unknown = text;
  try {
    body = JSON.parse(text);
  } catch {
    // not JSON
  }
  return { status: res.status, headers: res.headers, body: body as Record<string, unknown>, ms: Date.now() - started };
}

export { freePort };
