import { Router, type RequestHandler } from 'express';
import { fitRequestSchema, forecastRequestSchema } from './schemas';
import { runFit, runForecast } from './service';

/** POST /forecast and /fit: stateless, no sign-in. */
export function computeRouter(guards: RequestHandler[] = []): Router {
  const router = Router();
  router.post('/forecast', ...guards, (req, res) => {
    res.json(runForecast(forecastRequestSchema.parse(req.body)));
  });
  router.post('/fit', ...guards, (req, res) => {
    res.json(runFit(fitRequestSchema.parse(req.body)));
  });
  return router;
}
