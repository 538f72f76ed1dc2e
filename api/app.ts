import express, { type Express, Router } from 'express';
import helmet from 'helmet';
import compression from 'compression';
import zlib from 'node:zlib';
import { COMPRESS_FROM_BYTES, ON_THE_FLY_BROTLI_QUALITY } from './lib/compress';
import { pinoHttp } from 'pino-http';
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { AppConfig } from './config';
import { createLogger } from './lib/logger';
import { notFoundHandler, problemHandler } from './lib/problem';
import { requestId } from './lib/request-id';
import { checkRequestText, markJsonTextFreeOfNul } from './lib/request-text';
import { NotFoundError } from './lib/errors';
import { RateLimitStore, rateLimited } from './lib/rate-limit';
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
import { ipKeyGenerator } from 'express-rate-limit';
import { calculatorsRouter } from './features/calculators/routes';
import { planRouter } from './features/plan/routes';
import { campaignPlanRouter, projectSpecificationRouter } from './features/plan/store-routes';
import { comparisonsRouter } from './features/plan/comparison-routes';
import { docsRouter } from './features/docs/routes';
import { campaignsRouter } from './features/campaigns/routes';
import { projectCampaignsRouter } from './features/campaigns/project-routes';
import { measurementsRouter } from './features/campaigns/measurement-routes';
import { forecastsRouter } from './features/campaigns/forecast-routes';
import { importFilesRouter } from './features/imports/file-routes';
import { JobQueue, jobOptionsFromEnv } from './features/jobs/queue';
import { abandonRunningJobs, jobHandlers } from './features/jobs/runner';
import { jobsRouter } from './features/jobs/routes';

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
  /** Background jobs; default a queue that can enqueue (workers start only when asked: `app.locals.startJobWorkers()`). */
  jobs?: JobQueue;
}

/** Real GitHub when credentials are configured, else the local fake provider (dev tools only), else no sign-in. */
function oauthSetup(deps: AppDeps): OAuthSetup | null {
  const { github, devTools } = deps.config;
  if (github) return { provider: 'github', clientID: github.clientId, clientSecret: github.clientSecret };
  if (devTools && deps.fakeOAuth) {
    return {
      provider: 'local-demo',
      clientID: deps.fakeOAuth.clientId,
      clientSecret: deps.fakeOAuth.clientSecret,
      endpoints: deps.fakeOAuth.endpoints,
    };
  }
  return null;
}

const defaultWebDist = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../dist/web');

/** Build the Express application. Never listens: `server.ts` and the tests do that. */
export function createApp(deps: AppDeps): Express {
  const logger = deps.logger ?? createLogger();
  const app = express();
  app.disable('x-powered-by');
  app.locals.rateLimits = new RateLimitStore(deps.knex, deps.config.rateLimit.keyPrefix);
  app.set('trust proxy', 'loopback');
  app.use(requestId);
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
      // Sent below, and only over HTTPS: on plain http it would mean nothing, and on 127.0.0.1 it would pin a developer's browser.
      strictTransportSecurity: false,
    }),
  );
  app.use((req, res, next) => {
    if (req.secure) res.set('strict-transport-security', 'max-age=31536000; includeSubDomains');
    next();
  });
  // Request lines are logged at info; above that level the middleware would only allocate.
  // Every line logged for a request (through req.log) carries its id as `reqId`.
  if (logger.isLevelEnabled('info')) {
    app.use(
      pinoHttp({ logger, genReqId: (req) => req.id, quietReqLogger: true, autoLogging: { ignore: (req) => req.url === '/api/health' } }),
    );
  }
  // Large answers travel compressed (brotli, else gzip, as the client accepts): a campaign of a
  // thousand runs answers about 0.8 MB of analysis and 0.5 MB of runs, a sixth of that compressed.
  // The fastest settings: a higher level saved a few percent more bytes for twice the server's time
  // (the cached campaign analysis keeps its own copy, compressed harder once).
  // Below the threshold the work would cost more than the bytes it saves: small answers (the session,
  // lists, most calculator answers) go as they are.
  // Without Accept-Encoding the middleware always sends identity, so such a request skips its hooks
  // (scripts calling the calculators in a loop paid for them on every answer).
  const compress = compression({
    threshold: COMPRESS_FROM_BYTES,
    level: 1,
    brotli: { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: ON_THE_FLY_BROTLI_QUALITY } },
  });
  app.use((req, res, next) => (req.headers['accept-encoding'] ? compress(req, res, next) : next()));
  app.use(express.json({ limit: '1mb', verify: markJsonTextFreeOfNul }));

  const mailbox = deps.mailbox ?? new Mailbox();
  const mailer =
    deps.mailer ??
    (deps.config.smtpUrl
      ? createSmtpMailer(deps.config.smtpUrl, deps.config.mailFrom)
      : createInProcessMailer(mailbox, deps.config.mailFrom));
  const jobs = deps.jobs ?? new JobQueue(deps.knex, jobOptionsFromEnv(), logger);
  app.locals.jobs = jobs;
  app.locals.startJobWorkers = () =>
    jobs.startWorkers(
      jobHandlers({ knex: deps.knex, mailer, version: deps.config.version, publicUrl: deps.config.publicUrl, logger }),
      abandonRunningJobs,
    );
  // Stateless calculators, mounted before sign-in: they read no user, so a call without credentials
  // skips sessions, passport and the CSRF check (a cross-site POST changes nothing). They keep
  // helmet, the request id, the shared text check and their rate limit, counted in memory and
  // written to PostgreSQL once a second (no database round trip per calculation). A call that sends
  // an Authorization header takes the signed-in path below, so a revoked token is still a 401.
  const computeLimit = rateLimited({
    name: 'compute',
    points: deps.config.rateLimit.compute,
    windowMs: deps.config.rateLimit.windowMs,
    keyOf: (req) => ipKeyGenerator(req.ip ?? ''),
    message: 'Too many calculations from this address; wait a few minutes.',
    batched: true,
  });
  const calculatorGuards = [checkRequestText, computeLimit];
  const calculators = Router();
  calculators.use((req, _res, next) => next(req.headers.authorization === undefined ? undefined : 'router'));
  calculators.use(calculatorsRouter(calculatorGuards), planRouter(calculatorGuards));
  app.use('/api/v1', calculators);

  installAuth(app, { knex: deps.knex, config: deps.config, oauth: oauthSetup(deps), logger });
  // Whatever an API route answers a signed-in caller (members lists carry e-mail addresses) stays out of caches.
  app.use('/api', (req, res, next) => {
    if (req.user) res.set('cache-control', 'no-store');
    next();
  });
  if (deps.config.devTools) app.use(mailboxRouter({ mailbox, realSmtp: Boolean(deps.config.smtpUrl), knex: deps.knex }));

  const api = Router();
  api.use(checkRequestText);
  api.use('/health', healthRouter({ knex: deps.knex, version: deps.config.version }));
  api.use('/v1', calculatorsRouter([computeLimit]));
  api.use('/v1', planRouter([computeLimit]));
  // A router that serves one resource is mounted at its prefix, so the URL names the file.
  api.use('/v1/openapi.json', docsRouter({ version: deps.config.version }));
  api.use('/v1/session', sessionRouter({ config: deps.config }));
  api.use('/v1/projects', projectsRouter({ knex: deps.knex, config: deps.config, mailer }));
  api.use('/v1/invitations', invitationsRouter({ knex: deps.knex }));
  api.use('/v1/tokens', tokensRouter({ knex: deps.knex, config: deps.config }));
  // Uploads and report builds read or write whole files: a per-user budget, counted across instances.
  const uploadLimit = rateLimited({
    name: 'uploads',
    points: deps.config.rateLimit.uploads,
    windowMs: deps.config.rateLimit.windowMs,
    keyOf: (req) => (req.user ? `user:${req.user.id}` : ipKeyGenerator(req.ip ?? '')),
    message: 'Too many file uploads or report builds from you; wait a few minutes and try again.',
  });
  api.use('/v1/projects/:projectId', projectCampaignsRouter({ knex: deps.knex }));
  api.use('/v1/projects/:projectId/specification', projectSpecificationRouter({ knex: deps.knex }));
  api.use(
    '/v1/campaigns',
    campaignsRouter({
      knex: deps.knex,
      version: deps.config.version,
      jobs,
      uploadLimit,
      importJobBytes: deps.config.importJobBytes,
      mailer,
    }),
  );
  api.use('/v1/campaigns/:campaignId', campaignPlanRouter({ knex: deps.knex }));
  api.use('/v1/measurements', measurementsRouter({ knex: deps.knex }));
  api.use('/v1/import-files', importFilesRouter({ knex: deps.knex }));
  api.use('/v1/forecasts', forecastsRouter({ knex: deps.knex }));
  api.use('/v1/comparisons', comparisonsRouter({ knex: deps.knex }));
  api.use('/v1/jobs', jobsRouter({ knex: deps.knex }));
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
