import { Router, type RequestHandler } from 'express';
import { planRequestSchema } from './schemas';
import { runPlan } from './service';
import { sendComputed } from '../../lib/json-body';
import { parseBody } from '../../lib/validation';

/** POST /plan: stateless like /fit, no sign-in. */
export function planRouter(guards: RequestHandler[] = []): Router {
  const router = Router();
  router.post('/plan', ...guards, (req, res) => {
    sendComputed(res, runPlan(parseBody(planRequestSchema, req.body)));
  });
  return router;
}
