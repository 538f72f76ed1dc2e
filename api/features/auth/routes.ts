import { Router } from 'express';
import type { AppConfig } from '../../config';
import { SESSION_COOKIE } from './setup';
import { csrfTokenFor } from './middleware';
import { toUserView } from './users';

/** GET/DELETE /api/v1/session (mounted there): who is signed in (with the CSRF token for writes), and sign-out. */
export function sessionRouter(deps: { config: AppConfig }): Router {
  const router = Router();

  router.get('/', (req, res) => {
    const viaSession = req.user && req.authMethod === 'session';
    res.set('cache-control', 'no-store').json({
      user: req.user ? toUserView(req.user) : null,
      csrfToken: viaSession ? csrfTokenFor(req) : null,
      devTools: deps.config.devTools,
    });
  });

  // Sign-out: the session row is destroyed, not just emptied, and the cookie is cleared.
  router.delete('/', (req, res, next) => {
    if (req.authMethod !== 'session' || !req.session) return void res.status(204).end();
    req.logout({ keepSessionInfo: false }, (err) => {
      if (err) return next(err);
      req.session.destroy((destroyErr) => {
        if (destroyErr) return next(destroyErr);
        res.clearCookie(SESSION_COOKIE, { httpOnly: true, sameSite: 'lax', path: '/' });
        res.status(204).end();
      });
    });
  });

  return router;
}
