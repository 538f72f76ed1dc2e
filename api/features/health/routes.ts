import { Router } from 'express';
import type { Knex } from 'knex';
import { RETRY_AFTER_SECONDS } from '../../lib/problem';

/** The health check gives up on the database after this long, whatever the pool's own limits. */
export const HEALTH_DB_TIMEOUT_MS = 2_000;

/** `select 1`, or false once `timeoutMs` has passed (a frozen server never answers, so do not wait for it). */
async function databaseAnswers(knex: Knex, timeoutMs: number): Promise<boolean> {
  let timer: NodeJS.Timeout | undefined;
  const late = new Promise<false>((resolve) => {
    timer = setTimeout(() => resolve(false), timeoutMs);
  });
  try {
    return await Promise.race([
      knex.raw('select 1').then(
        () => true,
        () => false,
      ),
      late,
    ]);
  } finally {
    clearTimeout(timer);
  }
}

export function healthRouter(deps: { knex: Knex; version: string; timeoutMs?: number }): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    const ok = await databaseAnswers(deps.knex, deps.timeoutMs ?? HEALTH_DB_TIMEOUT_MS);
    res.set('cache-control', 'no-store');
    if (!ok) res.set('retry-after', String(RETRY_AFTER_SECONDS));
    res.status(ok ? 200 : 503).json({ status: ok ? 'ok' : 'degraded', database: ok ? 'ok' : 'down', version: deps.version });
  });
  return router;
}
