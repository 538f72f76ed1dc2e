import express, { type Express, Router } from 'express';
import helmet from 'helmet';
import { pinoHttp } from 'pino-http';
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { AppConfig } from './config';
import { createLogger } from './lib/logger';
import { notFoundHandler, problemHandler } from './lib/problem';
import { NotFoundError, TooManyRequestsError } from './lib/errors';
import { healthRouter } from './features/health/routes';
import { installAuth, type OAuthSetup } from './features/auth/setup';
import { sessionRouter } from './features/auth/routes';
import type { FakeOAuthProvider } from './features/auth/fake-provider';
import { projectsRouter } from './features/projects/routes';
import { invitationsRouter } from './features/invitations/routes';
import { tokensRouter } from './features/tokens/routes';
import { Mailbox } from './features/mail/mailbox';
import { createInProcessMailer, createSmtpMailer, type Mailer } from './features/mail/mailer';
import { mailboxRouter } from './features/mail/routes';
import { rateLimit } from 'express-rate-limit';
import { computeRouter } from './features/compute/routes';
import { kineticsRouter } from './features/kinetics/routes';
import { planRouter } from './features/plan/routes';
import { planStoreRouter } from './features/plan/store-routes';
import { docsRouter } from './features/docs/routes';
import { campaignsRouter } from './features/campaigns/routes';

export interface AppDeps {
  knex: Knex;
  config: AppConfig;
  logger?: Logger;
  /** Folder of the built web app; served with an SPA fallback when it exists. */
  webDist?: string | null;
  /** Outgoing mail. Default: SMTP_URL when set, else straight into `mailbox`. */
  mailer?: Mailer;
  /** The development mailbox that the local SMTP sink fills (shown at /dev/mailbox when dev tools are on). */
  mailbox?: Mailbox;
  /** The local fake OAuth provider, used when GitHub credentials are not configured. */
  fakeOAuth?: FakeOAuthProvider | null;
}

/** Real GitHub when credentials are configured, else the local fake provider (dev tools only), else no sign-in. */
function oauthSetup(deps: AppDeps): OAuthSetup | null {
  const { github, devTools } = deps.config;
  if (github) return { provider: 'github', clientID: github.clientId, clientSecret: github.clientSecret };
  if (devTools && deps.fakeOAuth) {
    return { provider: 'local-demo', clientID: deps.fakeOAuth.clientId, clientSecret: deps.fakeOAuth.clientSecret, endpoints: deps.fakeOAuth.endpoints };
  }
  return null;
}

const defaultWebDist = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../dist/web');

/** Build the Express application. Never listens: `server.ts` and the tests do that. */
export function createApp(deps: AppDeps): Express {
  const logger = deps.logger ?? createLogger();
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", 'data:', 'https://avatars.githubusercontent.com'],
          fontSrc: ["'self'", 'data:'],
          connectSrc: ["'self'"],
          formAction: ["'self'", 'https://github.com'],
          upgradeInsecureRequests: null,
        },
      },
      crossOriginEmbedderPolicy: false,
    }),
  );
  // Request lines are logged at info; above that level the middleware would only allocate.
  if (logger.isLevelEnabled('info')) app.use(pinoHttp({ logger, autoLogging: { ignore: (req) => req.url === '/api/health' } }));
  app.use(express.json({ limit: '1mb' }));

  const mailbox = deps.mailbox ?? new Mailbox();
  const mailer = deps.mailer ?? (deps.config.smtpUrl ? createSmtpMailer(deps.config.smtpUrl, deps.config.mailFrom) : createInProcessMailer(mailbox, deps.config.mailFrom));
  installAuth(app, { knex: deps.knex, config: deps.config, oauth: oauthSetup(deps), logger });
  if (deps.config.devTools) app.use(mailboxRouter({ mailbox, realSmtp: Boolean(deps.config.smtpUrl) }));

  const api = Router();
  api.use(healthRouter({ knex: deps.knex, version: deps.config.version }));
  // Stateless calculators first: they are the hottest routes and need no project lookups.
  const computeLimit = rateLimit({
    windowMs: deps.config.rateLimit.windowMs,
    limit: deps.config.rateLimit.compute,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, _res, next) => next(new TooManyRequestsError('Too many calculations from this address; wait a few minutes.')),
  });
  api.use('/v1', computeRouter([computeLimit]));
  api.use('/v1', kineticsRouter([computeLimit]));
  api.use('/v1', planRouter([computeLimit]));
  api.use('/v1', docsRouter({ version: deps.config.version }));
  api.use('/v1', sessionRouter({ config: deps.config }));
  api.use('/v1', projectsRouter({ knex: deps.knex, config: deps.config, mailer }));
  api.use('/v1', invitationsRouter({ knex: deps.knex }));
  api.use('/v1', tokensRouter({ config: deps.config }));
  api.use('/v1', campaignsRouter({ knex: deps.knex, version: deps.config.version }));
  api.use('/v1', planStoreRouter({ knex: deps.knex }));
  api.use('/{*splat}', notFoundHandler);
  app.use('/api', api);

  const webDist = deps.webDist === undefined ? defaultWebDist : deps.webDist;
  if (webDist && existsSync(path.join(webDist, 'index.html'))) {
    app.use(express.static(webDist, { index: false, maxAge: '1h' }));
    // A missing build file is a 404, not the page: a stale tab asking for an old chunk must fail visibly.
    app.use('/assets', (_req, _res, next) => next(new NotFoundError('No such build file.')));
    app.get('/{*splat}', (_req, res) => {
      res.sendFile(path.join(webDist, 'index.html'), { maxAge: 0 });
    });
  }

  app.use(problemHandler(logger));
  return app;
}
