import type { RequestHandler } from 'express';
import { randomUUID } from 'node:crypto';

/** An id a proxy may already have given the request; anything else is replaced by our own. */
const ACCEPTED = /^[A-Za-z0-9._:-]{8,100}$/;

/**
 * Give every request an id (the proxy's X-Request-Id when it looks sane, else a UUID), echo it in the
 * response header, and let the logger and problem details carry it, so one line in a log and the body a
 * user reports can be matched.
 */
export const requestId: RequestHandler = (req, res, next) => {
  const incoming = req.get('x-request-id');
  req.id = incoming && ACCEPTED.test(incoming) ? incoming : randomUUID();
  res.set('x-request-id', String(req.id));
  next();
};
