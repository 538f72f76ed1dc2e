import { Router, type RequestHandler } from 'express';
import { planRequestSchema, planResponseSchema } from './schemas';
import { runPlan } from './service';
import { sendComputed } from '../../lib/json-body';
import { checkDeclaredInTests } from '../../lib/response-check';
import { parseBody } from '../../lib/validation';

/** POST /plan: stateless like /fit, no sign-in. */
export function planRouter(guards: RequestHandler[] = []): Router {
  const router = Router();
  router.post('/plan', ...guards, (req, res) => {
    const answer = runPlan(parseBody(planRequestSchema, req.body));
    checkDeclaredInTests(planResponseSchema, answer);
    sendComputed(res, answer);
  });
  return router;
}
