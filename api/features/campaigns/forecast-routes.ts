import { Router } from 'express';
import type { Knex } from 'knex';
import { authorizeProject } from '../projects/policy';
import { actorOf } from './route-helpers';
import { deleteSavedForecast, resolveSavedForecastProjectId } from './service';

/**
 * A saved forecast by id, mounted at /v1/forecasts (editors delete). Listing and saving go
 * through its campaign: /campaigns/:campaignId/forecasts.
 */
export function forecastsRouter(deps: { knex: Knex }): Router {
  const { knex } = deps;
  const router = Router();
  const byForecast = authorizeProject(knex, 'editor', (req) => resolveSavedForecastProjectId(knex, req.params.forecastId));

  router.delete('/:forecastId', byForecast, async (req, res) => {
    await deleteSavedForecast(knex, actorOf(req), String(req.params.forecastId));
    res.status(204).end();
  });

  return router;
}
