import { parseBody } from '../../lib/validation';
import { Router } from 'express';
import type { Knex } from 'knex';
import type { AppConfig } from '../../config';
import { NotFoundError } from '../../lib/errors';
import { requireSessionUser } from '../auth/middleware';
import { limiter } from '../auth/setup';
import { uuidSchema } from '../projects/schemas';
import { createTokenSchema } from './schemas';
import { createToken, listTokens, revokeToken } from './service';

/** Personal API tokens, mounted at /api/v1/tokens. Managed only from a signed-in browser session. */
export function tokensRouter(deps: { knex: Knex; config: AppConfig }): Router {
  const router = Router();
  // Counted after the session-only check, so a token refused here cannot use up its owner's budget.
  const limit = limiter(deps.config.rateLimit.windowMs, deps.config.rateLimit.tokens, 'API-token', true);

  router.get('/', requireSessionUser, limit, async (req, res) => {
    res.json({ tokens: await listTokens(deps.knex, req.user!.id) });
  });

  router.post('/', requireSessionUser, limit, async (req, res) => {
    const input = parseBody(createTokenSchema, req.body ?? {});
    const { token, secret } = await createToken(deps.knex, req.user!.id, input);
    res.status(201).set('cache-control', 'no-store').json({ token, secret });
  });

  router.delete('/:tokenId', requireSessionUser, limit, async (req, res) => {
    if (!uuidSchema.safeParse(req.params.tokenId).success) throw new NotFoundError('You have no token with this id.');
    await revokeToken(deps.knex, req.user!.id, String(req.params.tokenId));
    res.status(204).end();
  });

  return router;
}
