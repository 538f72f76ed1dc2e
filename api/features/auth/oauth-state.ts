import type { Request } from 'express';
import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';

/** Cookie that carries the OAuth state (and where to go afterwards) between the sign-in start and the callback. */
export const OAUTH_STATE_COOKIE = 'eyrie.oauth';
const MAX_AGE_MS = 10 * 60_000;

declare module 'express-serve-static-core' {
  interface Request {
    /** The page to return to, read from the verified state cookie on the OAuth callback. */
    oauthReturnTo?: string;
  }
}

function readCookie(req: Request, name: string): string | undefined {
  for (const part of (req.headers.cookie ?? '').split(';')) {
    const eq = part.indexOf('=');
    if (eq > 0 && part.slice(0, eq).trim() === name) return decodeURIComponent(part.slice(eq + 1).trim());
  }
  return undefined;
}

/**
 * passport-oauth2's state store, kept in a short-lived signed cookie instead of the session: an anonymous
 * visit to the sign-in start writes no session row. The callback must present the same nonce in `state`
 * and in the cookie (login CSRF), and the cookie is spent on use.
 */
export class CookieStateStore {
  constructor(private readonly secret: string) {}

  private sign(payload: string): string {
    return createHmac('sha256', this.secret).update(`oauth-state:${payload}`).digest('base64url');
  }

  /** Called with (req, meta, callback) at the sign-in start; `req.oauthReturnTo` is kept alongside the nonce. */
  store(req: Request, _meta: unknown, callback: (err: Error | null, state?: string) => void): void {
    const nonce = randomBytes(24).toString('base64url');
    const payload = Buffer.from(JSON.stringify({ n: nonce, r: req.oauthReturnTo ?? null, t: Date.now() })).toString('base64url');
    req.res!.cookie(OAUTH_STATE_COOKIE, `${payload}.${this.sign(payload)}`, {
      httpOnly: true,
      sameSite: 'lax',
      secure: req.secure,
      path: '/auth',
      maxAge: MAX_AGE_MS,
    });
    callback(null, nonce);
  }

  verify(
    req: Request,
    providedState: unknown,
    _meta: unknown,
    callback: (err: Error | null, ok: boolean, info?: { message: string }) => void,
  ): void {
    const raw = readCookie(req, OAUTH_STATE_COOKIE);
    req.res?.clearCookie(OAUTH_STATE_COOKIE, { path: '/auth' });
    const refuse = (message: string) => callback(null, false, { message });
    if (!raw || typeof providedState !== 'string') return refuse('The sign-in started in another browser or expired; start again.');
    const [payload, mac] = raw.split('.');
    const expected = this.sign(payload ?? '');
    if (!payload || !mac || mac.length !== expected.length || !timingSafeEqual(Buffer.from(mac), Buffer.from(expected)))
      return refuse('The sign-in state was altered; start again.');
    const { n, r, t } = JSON.parse(Buffer.from(payload, 'base64url').toString('utf8')) as { n: string; r: string | null; t: number };
    if (Date.now() - t > MAX_AGE_MS) return refuse('The sign-in took too long; start again.');
    if (n.length !== providedState.length || !timingSafeEqual(Buffer.from(n), Buffer.from(providedState)))
      return refuse('The sign-in state does not match; start again.');
    if (r) req.oauthReturnTo = r;
    callback(null, true);
  }
}
