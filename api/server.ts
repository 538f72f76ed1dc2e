import './db/pg-types';
import type { Server } from 'node:http';
import { createApp } from './app';
import { loadConfig } from './config';
import { bindModels, createKnex } from './db/knex';
import { createLogger } from './lib/logger';

const config = loadConfig();
const logger = createLogger();
const knex = createKnex(config.databaseUrl);
bindModels(knex);
const app = createApp({ knex, config, logger });

const server: Server = app.listen(config.port, config.host);
server.on('listening', () => {
  logger.info({ url: config.publicUrl }, 'Eyrie is listening');
  process.send?.({ type: 'ready', url: config.publicUrl });
});
server.on('error', (err: NodeJS.ErrnoException) => {
  if (err.code === 'EADDRINUSE') {
    console.error(`Port ${config.port} on ${config.host} is already in use. Stop the other program or start Eyrie with PORT=<another port>.`);
  } else {
    console.error(`Eyrie could not listen on ${config.host}:${config.port}: ${err.message}`);
  }
  process.exit(2);
});

let closing = false;
async function shutdown(signal: string) {
  if (closing) return;
  closing = true;
  logger.info({ signal }, 'shutting down');
  const force = setTimeout(() => process.exit(1), 10_000);
  force.unref();
  server.close(async () => {
    await knex.destroy();
    process.exit(0);
  });
  server.closeIdleConnections();
}
process.on('SIGINT', () => void shutdown('SIGINT'));
process.on('SIGTERM', () => void shutdown('SIGTERM'));
