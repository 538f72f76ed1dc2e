import request from 'supertest';
import type { Express } from 'express';
import { createApp } from '../../api/app';
import { loadConfig, type AppConfig } from '../../api/config';
import { startFakeOAuthProvider, type FakeOAuthProvider } from '../../api/features/auth/fake-provider';
import { Mailbox } from '../../api/features/mail/mailbox';
import { createSmtpMailer, type Mailer } from '../../api/features/mail/mailer';
import { startSmtpSink, type SmtpSink } from '../../api/features/mail/smtp-sink';
import { testKnex } from './db';
import type { TestIdentity } from '../factories/users';

export interface AuthTestApp {
  app: Express;
  config: AppConfig;
  provider: FakeOAuthProvider;
  mailbox: Mailbox;
  sink: SmtpSink | null;
  close(): Promise<void>;
}

/**
 * The real app with the local fake OAuth provider on a loopback port and,
 * when asked, the loopback SMTP sink, exactly as server.ts wires them.
 */
export async function startAuthApp(
  options: { config?: Partial<AppConfig>; smtpSink?: boolean; mailer?: Mailer; webDist?: string | null } = {},
): Promise<AuthTestApp> {
  const config = loadConfig({ nodeEnv: 'test', devTools: true, databaseUrl: process.env.DATABASE_URL ?? '', ...options.config });
  const provider = await startFakeOAuthProvider();
  const mailbox = new Mailbox();
  const sink = options.smtpSink ? await startSmtpSink(mailbox) : null;
  const mailer = options.mailer ?? (sink ? createSmtpMailer(sink.url, config.mailFrom) : undefined);
  const app = createApp({
    knex: testKnex(),
    config,
    webDist: options.webDist === undefined ? null : options.webDist,
    fakeOAuth: provider,
    mailbox,
    mailer,
  });
  return {
    app,
    config,
    provider,
    mailbox,
    sink,
    async close() {
      await Promise.allSettled([provider.close(), sink?.close()]);
    },
  };
}

export const sessionCookie = (setCookie: string[] | string | undefined): string | undefined =>
  ([] as string[]).concat(setCookie ?? []).find((c) => c.startsWith('eyrie.sid='));

/** The whole OAuth round trip through the fake provider, as a browser would make it. */
export async function signIn(app: Express, identity: TestIdentity, returnTo?: string, existingAgent?: ReturnType<typeof request.agent>) {
  const agent = existingAgent ?? request.agent(app);
  // supertest serves each request on a new port; a browser keeps one origin, so pin the Host the OAuth redirect is built from.
  const host = '127.0.0.1:3000';
  const start = await agent
    .get(`/auth/github${returnTo ? `?returnTo=${encodeURIComponent(returnTo)}` : ''}`)
    .set('Host', host)
    .expect(302);
  const authorize = new URL(start.headers.location);
  const form = new URLSearchParams({
    client_id: authorize.searchParams.get('client_id') ?? '',
    redirect_uri: authorize.searchParams.get('redirect_uri') ?? '',
    state: authorize.searchParams.get('state') ?? '',
    ...identity,
  });
  const picked = await fetch(`${authorize.origin}${authorize.pathname}`, { method: 'POST', body: form, redirect: 'manual' });
  if (picked.status !== 302) throw new Error(`the fake provider answered ${picked.status}: ${await picked.text()}`);
  const callback = new URL(picked.headers.get('location')!);
  const done = await agent.get(callback.pathname + callback.search).set('Host', host);
  if (done.status !== 303 || String(done.headers.location).startsWith('/sign-in')) {
    throw new Error(`sign-in did not complete: ${done.status} → ${done.headers.location}`);
  }
  const session = await agent.get('/api/v1/session').expect(200);
  return {
    agent,
    csrfToken: session.body.csrfToken as string,
    user: session.body.user,
    landedOn: done.headers.location as string,
    start,
    picked,
    callback,
    done,
  };
}

/** Requests as one signed-in person; writes carry the session's CSRF token. */
export interface SignedInRequests {
  get: (url: string) => request.Test;
  post: (url: string) => request.Test;
  patch: (url: string) => request.Test;
  put: (url: string) => request.Test;
  delete: (url: string) => request.Test;
}

/** Sign each person in through the local provider; returns `as(who)` for requests in their session. */
export async function signInEach<W extends string>(
  app: Express,
  people: Record<W, { login: string; displayName?: string | null; email?: string | null }>,
): Promise<(who: W) => SignedInRequests> {
  const sessions = new Map<W, SignedInRequests>();
  for (const who of Object.keys(people) as W[]) {
    const u = people[who];
    const { agent, csrfToken } = await signIn(app, { login: u.login, name: u.displayName ?? u.login, email: u.email! });
    sessions.set(who, {
      get: (url) => agent.get(url),
      post: (url) => agent.post(url).set('X-CSRF-Token', csrfToken),
      patch: (url) => agent.patch(url).set('X-CSRF-Token', csrfToken),
      put: (url) => agent.put(url).set('X-CSRF-Token', csrfToken),
      delete: (url) => agent.delete(url).set('X-CSRF-Token', csrfToken),
    });
  }
  return (who) => sessions.get(who)!;
}

/** A supertest parser that keeps a binary body (a workbook, a PDF) as one Buffer. */
export const binaryBody = (r: request.Response, done: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = [];
  r.on('data', (d: Buffer) => chunks.push(d));
  r.on('end', () => done(null, Buffer.concat(chunks)));
};
