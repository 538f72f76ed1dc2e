import { Router, type RequestHandler } from 'express';
import { fitRequestSchema, forecastRequestSchema } from './schemas';
import { runFit, runForecast } from './service';
import { parseBody } from '../../lib/validation';

/** POST /forecast and /fit: stateless, no sign-in. */
export function computeRouter(guards: RequestHandler[] = []): Router {
  const router = Router();
  router.post('/forecast', ...guards, (req, res) => {
    res.json(runForecast(parseBody(forecastRequestSchema, req.body)));
  });
  router.post('/fit', ...guards, (req, res) => {
    res.json(runFit(parseBody(fitRequestSchema, req.body)));
  });
  return router;
}
