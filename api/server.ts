import './db/pg-types';
import type { Server } from 'node:http';
import { createApp } from './app';
import { isLoopbackHost, loadConfig } from './config';
import { createKnex } from './db/knex';
import { createLogger } from './lib/logger';
import { Mailbox } from './features/mail/mailbox';
import { createSmtpMailer } from './features/mail/mailer';
import { startSmtpSink, type SmtpSink } from './features/mail/smtp-sink';
import { startFakeOAuthProvider, type FakeOAuthProvider } from './features/auth/fake-provider';
import { JobQueue, jobOptionsFromEnv } from './features/jobs/queue';
import { closeReadPool } from './features/imports/parse-pool';
import type { RateLimitStore } from './lib/rate-limit';

const config = loadConfig();
const logger = createLogger();

// The local sign-in page accepts any typed e-mail and the mailbox shows invitation links: on a reachable
// address that would let anyone become anyone. Development tools therefore run on loopback only.
if (config.devTools && !isLoopbackHost(config.host)) {
  console.error(
    `Development tools (EYRIE_DEV_TOOLS) are on, but HOST=${config.host} is not a loopback address. They let anyone sign in as anyone, ` +
      'so Eyrie refuses to start. Listen on 127.0.0.1 (and put a reverse proxy in front), or turn the tools off with EYRIE_DEV_TOOLS=0 and configure GitHub sign-in.',
  );
  process.exit(2);
}
if (config.devTools) logger.warn('development tools are ON: local sign-in page and /dev/mailbox (loopback only)');
const knex = createKnex(config.databaseUrl);

// Without SMTP_URL, mail goes to a loopback SMTP sink whose messages the dev mailbox shows.
const mailbox = new Mailbox();
let smtpSink: SmtpSink | null = null;
if (!config.smtpUrl) {
  smtpSink = await startSmtpSink(mailbox, { port: Number(process.env.EYRIE_SMTP_PORT ?? 0) });
  logger.info({ smtp: smtpSink.url }, 'local SMTP sink listening (messages at /dev/mailbox)');
}
const mailer = createSmtpMailer(config.smtpUrl ?? smtpSink!.url, config.mailFrom);

// Without GitHub credentials, sign-in goes through the local fake OAuth provider (dev tools only).
let fakeOAuth: FakeOAuthProvider | null = null;
if (!config.github && config.devTools) {
  fakeOAuth = await startFakeOAuthProvider({ port: Number(process.env.EYRIE_OAUTH_PORT ?? 0) });
  logger.info({ url: fakeOAuth.url }, 'local OAuth provider listening');
} else if (!config.github) {
  logger.warn('GITHUB_CLIENT_ID/GITHUB_CLIENT_SECRET are not set and dev tools are off: nobody can sign in');
}

const jobs = new JobQueue(knex, jobOptionsFromEnv(), logger);
const app = createApp({ knex, config, logger, mailer, mailbox, fakeOAuth, jobs });
// Every instance runs background jobs; pg-boss gives each job to one of them.
await (app.locals.startJobWorkers as () => Promise<void>)();

const server: Server = app.listen(config.port, config.host);
server.on('listening', () => {
  logger.info({ url: config.publicUrl }, 'Eyrie is listening');
  process.send?.({ type: 'ready', url: config.publicUrl });
});
server.on('error', (err: NodeJS.ErrnoException) => {
  if (err.code === 'EADDRINUSE') {
    console.error(
      `Port ${config.port} on ${config.host} is already in use. Stop the other program or start Eyrie with PORT=<another port>.`,
    );
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
  // Running jobs get a few seconds to finish; the rest go back to the queue for another instance.
  const jobsStopped = jobs.stop(5_000);
  server.close(async () => {
    await jobsStopped.catch((err) => logger.error({ err }, 'jobs did not stop cleanly'));
    await (app.locals.rateLimits as RateLimitStore).flush().catch(() => undefined);
    await Promise.allSettled([smtpSink?.close(), fakeOAuth?.close(), closeReadPool()]);
    await knex.destroy();
    process.exit(0);
  });
  server.closeIdleConnections();
}
process.on('SIGINT', () => void shutdown('SIGINT'));
process.on('SIGTERM', () => void shutdown('SIGTERM'));
