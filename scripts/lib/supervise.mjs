// Keep one child process running: restart it with growing pauses when it dies, and say why each time.
import { spawn } from 'node:child_process';

/** Pauses before restart n (1-based); the last one repeats. */
export const RESTART_BACKOFF_MS = [500, 1_000, 2_000, 5_000, 10_000, 30_000];
/** A child that stayed up this long counts as healthy again: the next crash waits the shortest pause. */
export const HEALTHY_UPTIME_MS = 30_000;

function describeExit(code, signal) {
  if (signal === 'SIGKILL') return 'it was killed (SIGKILL; out of memory or kill -9)';
  if (signal) return `it was stopped by ${signal}`;
  if (code === 0) return 'it exited on its own (exit code 0)';
  return `it exited with code ${code}`;
}

/**
 * Start `args` under `process.execPath` and keep it running until stop() is called. `onSpawn(child)` runs for
 * every start (to listen for its messages); `log` prints one line per event.
 */
export function supervise({
  name,
  args,
  cwd,
  env,
  log,
  onSpawn = () => {},
  backoffMs = RESTART_BACKOFF_MS,
  healthyUptimeMs = HEALTHY_UPTIME_MS,
  stdio = ['ignore', 'inherit', 'inherit', 'ipc'],
}) {
  let child = null;
  let stopping = false;
  let restarts = 0;
  let consecutive = 0;
  let timer = null;

  const start = () => {
    timer = null;
    const startedAt = Date.now();
    child = spawn(process.execPath, args, { cwd, env, stdio });
    log(`${name} started (pid ${child.pid})`);
    onSpawn(child);
    child.on('exit', (code, signal) => {
      if (stopping) return;
      if (Date.now() - startedAt >= healthyUptimeMs) consecutive = 0;
      const wait = backoffMs[Math.min(consecutive, backoffMs.length - 1)];
      consecutive += 1;
      restarts += 1;
      log(
        `${name} stopped: ${describeExit(code, signal)} after ${Math.round((Date.now() - startedAt) / 1000)} s; restarting in ${wait / 1000} s (restart ${restarts}; PostgreSQL keeps running)`,
      );
      timer = setTimeout(start, wait);
    });
  };
  start();

  return {
    get child() {
      return child;
    },
    get restarts() {
      return restarts;
    },
    /** Stop supervising and end the child (SIGTERM, then SIGKILL after `graceMs`). */
    stop(graceMs = 10_000) {
      stopping = true;
      if (timer) clearTimeout(timer);
      const c = child;
      return new Promise((resolve) => {
        if (!c || c.exitCode !== null || c.signalCode !== null) return resolve();
        c.once('exit', () => resolve());
        c.kill('SIGTERM');
        setTimeout(() => c.kill('SIGKILL'), graceMs).unref();
      });
    },
  };
}
