import express, { type Request, type Response } from 'express';
import helmet from 'helmet';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { randomBytes } from 'node:crypto';
import { z } from 'zod';
import { DEMO_IDENTITIES, DEMO_COMPANY } from '../../db/demo';
import { escapeHtml, htmlPage } from '../../lib/html';

/**
 * A small OAuth 2 authorization server for local use, speaking the same
 * endpoints and JSON shapes the GitHub strategy expects. It runs on its own
 * loopback port so the server-to-server code exchange is a real HTTP call.
 */
export interface FakeOAuthProvider {
  url: string;
  clientId: string;
  clientSecret: string;
  /** Strategy options that point passport-github2 here. */
  endpoints: { authorizationURL: string; tokenURL: string; userProfileURL: string; userEmailURL: string };
  close(): Promise<void>;
}

export interface FakeIdentity {
  id: string;
  login: string;
  name: string;
  email: string;
}

/** Stable provider-side id for a typed-in login (demo logins keep their fixed ids). */
export function fakeProviderUserId(login: string): string {
  const demo = DEMO_IDENTITIES.find((d) => d.login === login.toLowerCase());
  return demo ? demo.id : `login:${login.toLowerCase()}`;
}

const identitySchema = z.object({
  login: z
    .string()
    .trim()
    .regex(/^[A-Za-z0-9](?:[A-Za-z0-9-]{0,37}[A-Za-z0-9])?$/, 'Use 1–39 letters, digits or inner hyphens.'),
  name: z.string().trim().min(1, 'Enter a display name.').max(100, 'Keep the name to 100 characters.'),
  email: z
    .string()
    .trim()
    .pipe(z.email({ error: 'Enter a valid e-mail address.' })),
});

const CODE_TTL_MS = 60_000;
const isLoopback = (u: URL) => ['127.0.0.1', 'localhost', '[::1]'].includes(u.hostname);

interface AuthorizeParams {
  clientId: string;
  redirectUri: string;
  state: string;
  scope: string;
}

export async function startFakeOAuthProvider(options: { host?: string; port?: number } = {}): Promise<FakeOAuthProvider> {
  const host = options.host ?? '127.0.0.1';
  const clientId = 'eyrie-local-client';
  const clientSecret = randomBytes(24).toString('hex');
  const codes = new Map<string, { identity: FakeIdentity; redirectUri: string; expires: number }>();
  const accessTokens = new Map<string, FakeIdentity>();

  const app = express();
  app.disable('x-powered-by');
  // The same security headers as the app. The form posts here and is redirected to the app's callback on another loopback port.
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'none'"],
          styleSrc: ["'self'", "'unsafe-inline'"],
          formAction: ["'self'", 'http://127.0.0.1:*', 'http://localhost:*', 'http://[::1]:*'],
          upgradeInsecureRequests: null,
        },
      },
      strictTransportSecurity: false,
    }),
  );
  app.use(express.urlencoded({ extended: false, limit: '16kb' }));

  function readAuthorize(source: Record<string, unknown>): AuthorizeParams | string {
    const clientIdIn = String(source.client_id ?? '');
    const redirectUri = String(source.redirect_uri ?? '');
    if (clientIdIn !== clientId) return 'Unknown client_id: this sign-in link was not made by this Eyrie server.';
    let parsed: URL;
    try {
      parsed = new URL(redirectUri);
    } catch {
      return 'redirect_uri is missing or not a URL.';
    }
    if (!isLoopback(parsed)) return 'redirect_uri must point at a loopback address; this provider is for local use only.';
    return { clientId, redirectUri, state: String(source.state ?? ''), scope: String(source.scope ?? '') };
  }

  function renderPicker(
    res: Response,
    params: AuthorizeParams,
    typed: Partial<Record<'login' | 'name' | 'email', string>> = {},
    errors: Record<string, string> = {},
  ) {
    const hidden = `<input type="hidden" name="client_id" value="${escapeHtml(params.clientId)}">
      <input type="hidden" name="redirect_uri" value="${escapeHtml(params.redirectUri)}">
      <input type="hidden" name="state" value="${escapeHtml(params.state)}">`;
    const demo = DEMO_IDENTITIES.map(
      (d) => `<li><form method="post" action="/login/oauth/authorize">${hidden}
        <input type="hidden" name="login" value="${escapeHtml(d.login)}"><input type="hidden" name="name" value="${escapeHtml(d.name)}">
        <input type="hidden" name="email" value="${escapeHtml(d.email)}">
        <button class="plain" type="submit" aria-label="Continue as ${escapeHtml(d.name)}"><strong>${escapeHtml(d.name)}</strong> · ${escapeHtml(d.login)}<br>
        <span class="note">${escapeHtml(d.blurb)} · ${escapeHtml(d.email)}</span></button></form></li>`,
    ).join('');
    const field = (key: 'login' | 'name' | 'email', label: string, type = 'text') => `
      <label for="f-${key}">${label}</label>
      <input id="f-${key}" name="${key}" type="${type}" value="${escapeHtml(typed[key] ?? '')}" ${errors[key] ? `aria-invalid="true" aria-describedby="e-${key}"` : ''} required>
      ${errors[key] ? `<p class="error" id="e-${key}">${escapeHtml(errors[key])}</p>` : ''}`;
    res
      .status(Object.keys(errors).length ? 400 : 200)
      .type('html')
      .send(
        htmlPage(
          'Local sign-in · Eyrie',
          `<h1>Local sign-in</h1>
          <p class="note">This page stands in for GitHub while Eyrie runs without GitHub credentials. Nothing leaves this computer.
          The people below belong to ${escapeHtml(DEMO_COMPANY)}.</p>
          <section aria-labelledby="demo-h"><h2 id="demo-h">Demo identities</h2><ul class="plain">${demo}</ul></section>
          <section aria-labelledby="own-h"><h2 id="own-h">Or type an identity</h2>
          <form method="post" action="/login/oauth/authorize" novalidate>${hidden}
          ${field('name', 'Display name')}${field('login', 'Login')}${field('email', 'E-mail', 'email')}
          <p><button type="submit">Continue</button></p></form></section>`,
          'local OAuth provider (development only)',
        ),
      );
  }

  app.get('/login/oauth/authorize', (req: Request, res: Response) => {
    const params = readAuthorize(req.query as Record<string, unknown>);
    if (typeof params === 'string')
      return void res
        .status(400)
        .type('html')
        .send(htmlPage('Sign-in failed', `<h1>Cannot sign in</h1><p>${escapeHtml(params)}</p>`));
    renderPicker(res, params);
  });

  app.post('/login/oauth/authorize', (req: Request, res: Response) => {
    const body = (req.body ?? {}) as Record<string, unknown>;
    const params = readAuthorize(body);
    if (typeof params === 'string')
      return void res
        .status(400)
        .type('html')
        .send(htmlPage('Sign-in failed', `<h1>Cannot sign in</h1><p>${escapeHtml(params)}</p>`));
    const parsed = identitySchema.safeParse({ login: body.login ?? '', name: body.name ?? '', email: body.email ?? '' });
    if (!parsed.success) {
      const errors: Record<string, string> = {};
      for (const issue of parsed.error.issues) errors[String(issue.path[0])] ??= issue.message;
      return renderPicker(
        res,
        params,
        { login: String(body.login ?? ''), name: String(body.name ?? ''), email: String(body.email ?? '') },
        errors,
      );
    }
    const identity: FakeIdentity = { id: fakeProviderUserId(parsed.data.login), ...parsed.data };
    const code = randomBytes(20).toString('hex');
    codes.set(code, { identity, redirectUri: params.redirectUri, expires: Date.now() + CODE_TTL_MS });
    const back = new URL(params.redirectUri);
    back.searchParams.set('code', code);
    if (params.state) back.searchParams.set('state', params.state);
    res.redirect(302, back.toString());
  });

  app.post('/login/oauth/access_token', (req: Request, res: Response) => {
    const body = (req.body ?? {}) as Record<string, string>;
    if (body.client_id !== clientId || body.client_secret !== clientSecret) {
      return void res.status(401).json({ error: 'incorrect_client_credentials', error_description: 'The client id or secret is wrong.' });
    }
    const grant = codes.get(body.code ?? '');
    codes.delete(body.code ?? ''); // single use, whatever happens next
    if (!grant || grant.expires < Date.now() || (body.redirect_uri && body.redirect_uri !== grant.redirectUri)) {
      return void res.status(400).json({ error: 'bad_verification_code', error_description: 'The code is unknown, used or expired.' });
    }
    const accessToken = randomBytes(20).toString('hex');
    accessTokens.set(accessToken, grant.identity);
    res.json({ access_token: accessToken, token_type: 'bearer', scope: 'read:user,user:email' });
  });

  const identityFor = (req: Request) => {
    const m = /^(?:Bearer|token)\s+(\S+)$/i.exec(req.get('authorization') ?? '');
    return m ? accessTokens.get(m[1]) : undefined;
  };

  app.get('/user', (req: Request, res: Response) => {
    const who = identityFor(req);
    if (!who) return void res.status(401).json({ message: 'Bad credentials' });
    res.json({ id: who.id, login: who.login, name: who.name, email: who.email, avatar_url: null, html_url: null });
  });

  app.get('/user/emails', (req: Request, res: Response) => {
    const who = identityFor(req);
    if (!who) return void res.status(401).json({ message: 'Bad credentials' });
    res.json([{ email: who.email, primary: true, verified: true, visibility: 'private' }]);
  });

  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(options.port ?? 0, host, () => resolve(s));
    s.once('error', reject);
  });
  const url = `http://${host}:${(server.address() as AddressInfo).port}`;
  return {
    url,
    clientId,
    clientSecret,
    endpoints: {
      authorizationURL: `${url}/login/oauth/authorize`,
      tokenURL: `${url}/login/oauth/access_token`,
      userProfileURL: `${url}/user`,
      userEmailURL: `${url}/user/emails`,
    },
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}
