import { Router, type RequestHandler } from 'express';
import { sendComputed as answer } from '../../lib/json-body';
import { parseBody } from '../../lib/validation';
import { computeDistribution } from './distribution';
import { computeErosion } from './erosion';
import { runFit } from './fit';
import { runForecast } from './forecast';
import { distributionRequestSchema, erosionRequestSchema, rateRequestSchema } from './kinetics-schemas';
import { computeRate } from './rate';
import { fitRequestSchema, forecastRequestSchema } from './schemas';

/** POST /forecast, /fit, /distribution, /rate and /erosion: stateless, no sign-in; `guards` (e.g. a rate limit) run first. */
export function calculatorsRouter(guards: RequestHandler[] = []): Router {
  const router = Router();
  router.post('/forecast', ...guards, (req, res) => {
    answer(res, runForecast(parseBody(forecastRequestSchema, req.body)));
  });
  router.post('/fit', ...guards, (req, res) => {
    answer(res, runFit(parseBody(fitRequestSchema, req.body)));
  });
  router.post('/distribution', ...guards, (req, res) => {
    answer(res, computeDistribution(parseBody(distributionRequestSchema, req.body)));
  });
  router.post('/rate', ...guards, (req, res) => {
    answer(res, computeRate(parseBody(rateRequestSchema, req.body)));
  });
  router.post('/erosion', ...guards, (req, res) => {
    answer(res, computeErosion(parseBody(erosionRequestSchema, req.body)));
  });
  return router;
}
