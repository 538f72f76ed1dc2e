import { Router, type RequestHandler } from 'express';
import { parseBody } from '../../lib/validation';
import { distributionRequestSchema, erosionRequestSchema, rateRequestSchema } from './schemas';
import { computeDistribution, computeErosion, computeRate } from './service';

/** POST /distribution, /rate and /erosion: stateless, no sign-in; `guards` (e.g. a rate limit) run first. */
export function kineticsRouter(guards: RequestHandler[] = []): Router {
  const router = Router();

  router.post('/distribution', ...guards, (req, res) => {
    res.json(computeDistribution(parseBody(distributionRequestSchema, req.body)));
  });

  router.post('/rate', ...guards, (req, res) => {
    res.json(computeRate(parseBody(rateRequestSchema, req.body)));
  });

  router.post('/erosion', ...guards, (req, res) => {
    res.json(computeErosion(parseBody(erosionRequestSchema, req.body)));
  });

  return router;
}
