import { Router, type RequestHandler } from 'express';
import type { z } from 'zod';
import { sendComputed } from '../../lib/json-body';
import { checkDeclaredInTests } from '../../lib/response-check';
import { parseBody } from '../../lib/validation';
import { calculators, type Calculator } from './catalog';

/** One POST route: parse the body with the request schema, compute, answer as JSON (in tests, checked against the response schema). */
function post<Req extends z.ZodType, Res extends z.ZodType>(
  router: Router,
  path: string,
  guards: RequestHandler[],
  c: Calculator<Req, Res>,
) {
  router.post(path, ...guards, (req, res) => {
    const answer = c.run(parseBody(c.request, req.body));
    checkDeclaredInTests(c.response, answer);
    sendComputed(res, answer);
  });
}

/** POST /forecast, /fit, /distribution, /rate and /erosion: stateless, no sign-in; `guards` (e.g. a rate limit) run first. */
export function calculatorsRouter(guards: RequestHandler[] = []): Router {
  const router = Router();
  for (const [name, c] of Object.entries(calculators)) post(router, `/${name}`, guards, c as Calculator<z.ZodType, z.ZodType>);
  return router;
}
