import { Router, type RequestHandler } from 'express';
import { memberWriters, sendComputed as answer } from '../../lib/json-body';
import { parseBody } from '../../lib/validation';
import { computeDistribution } from './distribution';
import { computeErosion } from './erosion';
import { runFit } from './fit';
import { runForecast } from './forecast';
import {
  distributionRequestSchema,
  distributionResponseSchema,
  erosionRequestSchema,
  erosionResponseSchema,
  rateRequestSchema,
  rateResponseSchema,
} from './kinetics-schemas';
import { computeRate } from './rate';
import { fitRequestSchema, fitResponseSchema, forecastRequestSchema, forecastResponseSchema } from './schemas';

// Compiled from the response schemas on first use (see memberWriters).
const forecastJson = memberWriters(forecastResponseSchema);
const fitJson = memberWriters(fitResponseSchema);
const distributionJson = memberWriters(distributionResponseSchema);
const rateJson = memberWriters(rateResponseSchema);
const erosionJson = memberWriters(erosionResponseSchema);

/** POST /forecast, /fit, /distribution, /rate and /erosion: stateless, no sign-in; `guards` (e.g. a rate limit) run first. */
export function calculatorsRouter(guards: RequestHandler[] = []): Router {
  const router = Router();
  router.post('/forecast', ...guards, (req, res) => {
    answer(res, runForecast(parseBody(forecastRequestSchema, req.body)), forecastJson);
  });
  router.post('/fit', ...guards, (req, res) => {
    answer(res, runFit(parseBody(fitRequestSchema, req.body)), fitJson);
  });
  router.post('/distribution', ...guards, (req, res) => {
    answer(res, computeDistribution(parseBody(distributionRequestSchema, req.body)), distributionJson);
  });
  router.post('/rate', ...guards, (req, res) => {
    answer(res, computeRate(parseBody(rateRequestSchema, req.body)), rateJson);
  });
  router.post('/erosion', ...guards, (req, res) => {
    answer(res, computeErosion(parseBody(erosionRequestSchema, req.body)), erosionJson);
  });
  return router;
}
