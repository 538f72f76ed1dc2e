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
import { healthRouter } from './features/health/routes';

export interface AppDeps {
  knex: Knex;
  config: AppConfig;
  logger?: Logger;
  /** Folder of the built web app; served with an SPA fallback when it exists. */
  webDist?: string | null;
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
  app.use(pinoHttp({ logger, autoLogging: { ignore: (req) => req.url === '/api/health' } }));
  app.use(express.json({ limit: '1mb' }));

  const api = Router();
  api.use(healthRouter({ knex: deps.knex, version: deps.config.version }));
  api.use('/{*splat}', notFoundHandler);
  app.use('/api', api);

  const webDist = deps.webDist === undefined ? defaultWebDist : deps.webDist;
  if (webDist && existsSync(path.join(webDist, 'index.html'))) {
    app.use(express.static(webDist, { index: false, maxAge: '1h' }));
    app.get('/{*splat}', (_req, res) => {
      res.sendFile(path.join(webDist, 'index.html'), { maxAge: 0 });
    });
  }

  app.use(problemHandler(logger));
  return app;
}
