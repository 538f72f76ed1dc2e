import { Router, type RequestHandler } from 'express';
import type { z } from 'zod';
import { sendComputed } from '../../lib/json-body';
import { parseBody } from '../../lib/validation';
import { calculators, type Calculator } from './catalog';

/** One POST route: parse the body with the request schema, compute, answer as JSON. */
function post<Req extends z.ZodType, Res extends z.ZodType>(
  router: Router,
  path: string,
  guards: RequestHandler[],
  c: Calculator<Req, Res>,
) {
  router.post(path, ...guards, (req, res) => {
    sendComputed(res, c.run(parseBody(c.request, req.body)));
  });
}

/** POST /forecast, /fit, /distribution, /rate and /erosion: stateless, no sign-in; `guards` (e.g. a rate limit) run first. */
export function calculatorsRouter(guards: RequestHandler[] = []): Router {
  const router = Router();
  for (const [name, c] of Object.entries(calculators)) post(router, `/${name}`, guards, c as Calculator<z.ZodType, z.ZodType>);
  return router;
}
