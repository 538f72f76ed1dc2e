import { Router } from 'express';
import type { Knex } from 'knex';
import { requireUser } from '../auth/middleware';
import { acceptInvitation, describeInvitation } from './service';

/** The invitee's side, mounted at /api/v1/invitations: look at an invitation from its link, and accept it. Signing in is required. */
export function invitationsRouter(deps: { knex: Knex }): Router {
  const router = Router();

  router.get('/:token', requireUser, async (req, res) => {
    res.set('cache-control', 'no-store').json({ invitation: await describeInvitation(deps.knex, req.user!, String(req.params.token)) });
  });

  router.post('/:token/accept', requireUser, async (req, res) => {
    res.json(await acceptInvitation(deps.knex, req.user!, String(req.params.token)));
  });

  return router;
}
