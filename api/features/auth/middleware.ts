import type { Request, RequestHandler } from 'express';
import type { Knex } from 'knex';
import { csrfSync } from 'csrf-sync';
import { ForbiddenError, UnauthenticatedError } from '../../lib/errors';
import { userForToken } from '../tokens/service';

/** 401 unless a session user or a valid bearer token identified the caller. */
export const requireUser: RequestHandler = (req, _res, next) => {
  if (!req.user) throw new UnauthenticatedError();
  next();
};

/** Routes that only make sense in a browser session, such as managing tokens themselves. */
export const requireSessionUser: RequestHandler = (req, _res, next) => {
  if (!req.user) throw new UnauthenticatedError();
  if (req.authMethod !== 'session') {
    throw new ForbiddenError('API tokens cannot manage API tokens; sign in to the web app to do this.');
  }
  next();
};

const BEARER = /^Bearer\s+(\S+)\s*$/i;

export const hasBearer = (header: string | undefined) => typeof header === 'string' && /^Bearer\b/i.test(header);

/**
 * `Authorization: Bearer <token>` signs the request in as the token's owner,
 * with exactly the owner's roles. A bad, expired or revoked token is a 401
 * even on routes that need no sign-in: the caller meant to be someone.
 */
export function bearerAuth(db: Knex): RequestHandler {
  return async (req, _res, next) => {
    const header = req.headers.authorization;
    if (!hasBearer(header)) return next();
    const secret = BEARER.exec(header!)?.[1];
    const found = secret ? await userForToken(db, secret) : null;
    if (!found) throw new UnauthenticatedError('The API token is not valid: it may be mistyped, expired or revoked.');
    req.user = found.user;
    req.authMethod = 'token';
    req.apiTokenId = found.tokenId;
    next();
  };
}

const csrf = csrfSync({ getTokenFromRequest: (req) => req.get('x-csrf-token') });

/** The CSRF token of the current session, created on first use. */
export const csrfTokenFor = csrf.generateToken;

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Why a request looks cross-site, or null. Browsers send Sec-Fetch-Site and Origin on writes; a page on
 * another site cannot forge them. Requests without either (scripts, old browsers) pass to the token check.
 */
export function crossSiteReason(req: Request, allowedOrigins: readonly string[]): string | null {
  const site = req.get('sec-fetch-site');
  if (site !== undefined && site !== 'same-origin' && site !== 'none') return `the browser marked it as ${site} (Sec-Fetch-Site)`;
  const origin = req.get('origin');
  if (origin === undefined) return null;
  if (origin === `${req.protocol}://${req.get('host')}` || allowedOrigins.includes(origin)) return null;
  return `it came from ${origin === 'null' ? 'an opaque origin' : origin} (Origin)`;
}

/**
 * Every state-changing request authenticated by the session cookie must come from our own origin (Origin /
 * Sec-Fetch-Site, a second layer) and carry the session's CSRF token in X-CSRF-Token. Token-authenticated
 * requests carry no cookie credentials, so a cross-site page cannot forge them.
 */
export function csrfGuard(allowedOrigins: readonly string[] = []): RequestHandler {
  return (req, _res, next) => {
    if (SAFE.has(req.method) || req.authMethod !== 'session') return next();
    const crossSite = crossSiteReason(req, allowedOrigins);
    if (crossSite)
      throw new ForbiddenError(`The request was refused because ${crossSite}; changes are accepted only from Eyrie's own pages.`);
    if (!csrf.isRequestValid(req)) {
      throw new ForbiddenError('The request did not carry a valid CSRF token (X-CSRF-Token). Reload the page and try again.');
    }
    next();
  };
}
