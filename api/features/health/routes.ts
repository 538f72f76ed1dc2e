import { Router } from 'express';
import type { Knex } from 'knex';

export function healthRouter(deps: { knex: Knex; version: string }): Router {
  const router = Router();
  router.get('/health', async (_req, res) => {
    let database: 'ok' | 'down' = 'ok';
    try {
      await deps.knex.raw('select 1');
    } catch {
      database = 'down';
    }
    res.status(database === 'ok' ? 200 : 503).json({ status: database === 'ok' ? 'ok' : 'degraded', database, version: deps.version });
  });
  return router;
}
