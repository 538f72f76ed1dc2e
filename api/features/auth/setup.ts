import express, { type Express, type NextFunction, type Request, type RequestHandler, type Response } from 'express';
import session from 'express-session';
import type { Logger } from 'pino';
import connectPgSimple from 'connect-pg-simple';
import passport from 'passport';
import { Strategy as GitHubStrategy, type Profile, type StrategyOptions } from 'passport-github2';
import { ipKeyGenerator } from 'express-rate-limit';
import type { Knex } from 'knex';
import type { AppConfig } from '../../config';
import { rateLimited } from '../../lib/rate-limit';
import { User } from '../../models/user';
import { bearerAuth, csrfGuard, hasBearer } from './middleware';
import { upsertProviderUser } from './users';
import { CookieStateStore } from './oauth-state';
import { safeReturnTo } from './schemas';

/** Where passport-github2 sends people: the real GitHub, or the local fake provider. */
export interface OAuthSetup {
  provider: 'github' | 'local-demo';
  clientID: string;
  clientSecret: string;
  /** Absent for the real GitHub (the strategy's defaults). */
  endpoints?: { authorizationURL: string; tokenURL: string; userProfileURL: string; userEmailURL: string };
}

export const SESSION_COOKIE = 'eyrie.sid';
const SESSION_MAX_AGE_MS = 14 * 86_400_000;

/** connect-pg-simple needs only `query(text, params)`; lend it knex's pool instead of opening a second one. */
function knexPoolAdapter(knex: Knex) {
  return {
    async query(text: string, params: unknown[]) {
      const conn = await knex.client.acquireConnection();
      try {
        return await conn.query(text, params);
      } finally {
        await knex.client.releaseConnection(conn);
      }
    },
  };
}

/** A limit counted in PostgreSQL (shared by all instances): per user when `byUser` and signed in, else per client address. */
export function limiter(windowMs: number, limit: number, what: string, byUser = false): RequestHandler {
  return rateLimited({
    name: what.toLowerCase().replace(/[^a-z0-9]+/g, '-'),
    points: limit,
    windowMs,
    keyOf: (req) => (byUser && req.user ? `user:${req.user.id}` : ipKeyGenerator(req.ip ?? '')),
    message: `Too many ${what} requests from you; wait a few minutes and try again.`,
  });
}

/**
 * Everything that establishes who the caller is, in order: bearer tokens,
 * then the session cookie (PostgreSQL-backed), then the CSRF check for
 * cookie-authenticated writes. Also mounts the /auth sign-in routes.
 */
export function installAuth(app: Express, deps: { knex: Knex; config: AppConfig; oauth: OAuthSetup | null; logger?: Logger }) {
  const { knex, config, oauth } = deps;
  const PgStore = connectPgSimple(session);
  const sessionMiddleware = session({
    name: SESSION_COOKIE,
    secret: config.sessionSecret,
    store: new PgStore({
      pool: knexPoolAdapter(knex) as never,
      tableName: 'sessions',
      pruneSessionInterval: config.nodeEnv === 'test' ? false : 900,
    }),
    resave: false,
    saveUninitialized: false,
    // Secure when the request came over TLS (directly or via a trusted loopback proxy); plain http on 127.0.0.1 still works.
    cookie: { httpOnly: true, sameSite: 'lax', secure: 'auto', maxAge: SESSION_MAX_AGE_MS },
  });

  const authenticator = new passport.Passport();
  authenticator.serializeUser((user, done) => done(null, (user as User).id));
  authenticator.deserializeUser((id: string, done) => {
    User.query(knex)
      .findById(id)
      .then((user) => done(null, user ?? false), done);
  });
  if (oauth) {
    authenticator.use(
      'github',
      new GitHubStrategy(
        {
          clientID: oauth.clientID,
          clientSecret: oauth.clientSecret,
          // GitHub must see the registered public URL; the local provider accepts whatever loopback host the browser used.
          callbackURL: oauth.provider === 'github' ? `${config.publicUrl}/auth/github/callback` : '/auth/github/callback',
          scope: ['read:user', 'user:email'],
          // The OAuth state parameter is kept in a signed cookie and checked on the callback (login CSRF); no session until sign-in.
          store: new CookieStateStore(config.sessionSecret),
          ...(oauth.endpoints ?? {}),
        } as unknown as StrategyOptions,
        (_accessToken: string, _refreshToken: string, profile: Profile, done: (err: unknown, user?: User) => void) => {
          upsertProviderUser(knex, {
            provider: oauth.provider,
            providerUserId: profile.id,
            login: profile.username ?? profile.id,
            displayName: profile.displayName || null,
            email: profile.emails?.[0]?.value ?? null,
            avatarUrl: profile.photos?.[0]?.value ?? null,
          }).then((user) => done(null, user), done);
        },
      ),
    );
  }

  // Bearer requests never read or create a session. A write that carries no cookie cannot belong to a browser session, so none is loaded or
  // created for it: scripts calling the stateless calculators pay nothing for sessions.
  const sessionless = (req: Request) =>
    hasBearer(req.headers.authorization) || (!['GET', 'HEAD', 'OPTIONS'].includes(req.method) && !req.headers.cookie);
  const withSession =
    (mw: RequestHandler): RequestHandler =>
    (req, res, next) =>
      sessionless(req) ? next() : mw(req, res, next);
  const markSession: RequestHandler = (req, _res, next) => {
    if (req.user && !req.authMethod) req.authMethod = 'session';
    next();
  };
  const scoped = ['/api', '/auth', '/dev'];
  app.use(
    scoped,
    bearerAuth(knex),
    withSession(sessionMiddleware),
    authenticator.initialize(),
    withSession(authenticator.session()),
    markSession,
    csrfGuard([new URL(config.publicUrl).origin]),
  );

  const signInLimit = limiter(config.rateLimit.windowMs, config.rateLimit.signIn, 'sign-in');
  const router = express.Router();
  const signInFailed = (res: Response, reason: string) => res.redirect(303, `/sign-in?error=${encodeURIComponent(reason)}`);

  router.get('/auth/github', signInLimit, (req: Request, res: Response, next: NextFunction) => {
    if (!oauth) return void signInFailed(res, 'unavailable');
    const returnTo = safeReturnTo(req.query.returnTo);
    if (returnTo) req.oauthReturnTo = returnTo;
    authenticator.authenticate('github')(req, res, next);
  });

  router.get('/auth/github/callback', signInLimit, (req: Request, res: Response, next: NextFunction) => {
    if (!oauth) return void signInFailed(res, 'unavailable');
    if (typeof req.query.error === 'string') return void signInFailed(res, 'denied');
    authenticator.authenticate('github', (err: unknown, user: User | false) => {
      if (err || !user) {
        (req.log ?? deps.logger?.child({ reqId: req.id }))?.warn({ err }, 'sign-in failed');
        return void signInFailed(res, 'failed');
      }
      const returnTo = safeReturnTo(req.oauthReturnTo) ?? '/projects';
      // req.logIn regenerates the session: the id changes on sign-in (no fixation).
      req.logIn(user, (loginErr) => {
        if (loginErr) return next(loginErr);
        res.redirect(303, returnTo);
      });
    })(req, res, next);
  });

  app.use(router);
}
