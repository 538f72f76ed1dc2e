import { Router, type RequestHandler, type Response } from 'express';
import { parseBody } from '../../lib/validation';
import { computeDistribution } from './distribution';
import { computeErosion } from './erosion';
import { runFit } from './fit';
import { runForecast } from './forecast';
import { distributionRequestSchema, erosionRequestSchema, rateRequestSchema } from './kinetics-schemas';
import { computeRate } from './rate';
import { fitRequestSchema, forecastRequestSchema } from './schemas';

/**
 * A computed answer as JSON. No ETag: a POST answer is never revalidated, and hashing 40–70 kB
 * per call was a measurable share of a calculation's time (res.json hashes every body).
 */
function answer(res: Response, body: unknown): void {
  const bytes = Buffer.from(JSON.stringify(body), 'utf8');
  res.setHeader('content-type', 'application/json; charset=utf-8');
  res.setHeader('content-length', bytes.length);
  res.end(bytes);
}

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
