import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import objection from 'objection';
import type { Logger } from 'pino';
import { AppError, NotFoundError, ServiceUnavailableError, type FieldError } from './errors';
import { PROBLEM_TYPES, problemTypeUri, type ProblemTypeId } from './problem-types';

const {
  ValidationError,
  NotFoundError: ObjectionNotFound,
  UniqueViolationError,
  ForeignKeyViolationError,
  CheckViolationError,
  NotNullViolationError,
  DataError,
  DBError,
} = objection;

/** Seconds a client is asked to wait when the database is unavailable. */
export const RETRY_AFTER_SECONDS = 5;

/** The driver's error under Objection's wrapper, or the error itself. */
const nativeOf = (err: unknown): { code?: unknown; name?: unknown; message?: unknown } | null => {
  if (err instanceof DBError) return (err.nativeError ?? null) as { code?: unknown } | null;
  return err !== null && typeof err === 'object' ? (err as { code?: unknown }) : null;
};

// SQLSTATE classes and codes meaning "the database cannot serve this now", not "the request is wrong":
// connection exceptions (08), insufficient resources (53), operator intervention (57: shutdown, statement
// or lock timeout via query_canceled 57014) and idle-in-transaction session timeout (25P03).
const UNAVAILABLE_SQLSTATE = /^(08|53|57)|^25P03$|^55P03$/;
const UNAVAILABLE_NODE_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'EHOSTUNREACH', 'ENETUNREACH', 'EAI_AGAIN']);
const UNAVAILABLE_MESSAGES =
  /^timeout expired$|Connection terminated|Client has encountered a connection error|timeout exceeded when trying to connect|Knex: Timeout acquiring a connection|Query read timeout|Connection ended unexpectedly/i;

/** True when an error means the database is unreachable, frozen or shutting down (503, not 500). */
export function isDatabaseUnavailable(err: unknown): boolean {
  const native = nativeOf(err);
  if (!native) return false;
  if (native.name === 'KnexTimeoutError') return true;
  const code = typeof native.code === 'string' ? native.code : '';
  if (UNAVAILABLE_SQLSTATE.test(code) || UNAVAILABLE_NODE_CODES.has(code)) return true;
  return typeof native.message === 'string' && UNAVAILABLE_MESSAGES.test(native.message);
}

/** SQLSTATE class 22 (data exception): a value PostgreSQL will not store, such as text with a NUL character (22021). */
function isInvalidData(err: unknown): boolean {
  const code = nativeOf(err)?.code;
  return typeof code === 'string' && /^22[0-9A-Z]{3}$/.test(code);
}

/** RFC 9457 problem details, the one error body shape the API sends. */
export interface ProblemDetails {
  type: string;
  title: string;
  status: number;
  detail: string;
  instance?: string;
  errors?: FieldError[];
  [extension: string]: unknown;
}

/** A problem of a registered type; status and title come from the registry. */
export function problemOf(type: ProblemTypeId, detail: string, more: Record<string, unknown> = {}): ProblemDetails {
  const { status, title } = PROBLEM_TYPES[type];
  return { type: problemTypeUri(type), title, status, detail, ...more };
}

export function zodIssuesToFieldErrors(error: ZodError, prefix: (string | number)[] = []): FieldError[] {
  return error.issues.map((issue) => ({
    path: [...prefix, ...issue.path].map(String).join('.') || '(body)',
    message: issue.message,
  }));
}

interface DomainErrorLike extends Error {
  code: string;
  field?: string;
}
const isDomainError = (e: unknown): e is DomainErrorLike =>
  e instanceof Error && e.name === 'DomainError' && typeof (e as DomainErrorLike).code === 'string';

interface HttpLikeError extends Error {
  status?: number;
  statusCode?: number;
  type?: string;
  expose?: boolean;
}

/** Turn anything thrown into a problem-details object. Unknown errors become a bare 500. */
export function toProblem(err: unknown): ProblemDetails {
  if (err instanceof AppError) {
    return problemOf(err.type, err.message, { ...(err.errors.length ? { errors: err.errors } : {}), ...err.extra });
  }
  if (err instanceof ZodError) {
    const errors = zodIssuesToFieldErrors(err);
    return problemOf(
      'invalid-request',
      `${errors.length} field${errors.length === 1 ? '' : 's'} failed validation: ${errors
        .slice(0, 3)
        .map((e) => `${e.path}: ${e.message}`)
        .join('; ')}${errors.length > 3 ? '; …' : ''}`,
      { errors },
    );
  }
  if (isDomainError(err)) {
    return problemOf('cannot-compute', err.message, {
      code: err.code,
      errors: [{ path: err.field ? err.field.replace(/\[(\d+)\]/g, '.$1') : '(body)', message: err.message }],
    });
  }
  if (err instanceof ValidationError) {
    return problemOf('invalid-request', 'Some fields failed validation.', {
      errors: Object.entries(err.data ?? {}).flatMap(([path, list]) =>
        (list as { message: string }[]).map((e) => ({ path, message: e.message })),
      ),
    });
  }
  if (err instanceof ObjectionNotFound) return toProblem(new NotFoundError());
  if (err instanceof UniqueViolationError) {
    return problemOf('conflict', 'A record with the same unique value already exists.');
  }
  if (err instanceof ForeignKeyViolationError) {
    return problemOf('conflict', 'The record refers to, or is referred to by, another record.');
  }
  if (err instanceof CheckViolationError || err instanceof NotNullViolationError || err instanceof DataError || isInvalidData(err)) {
    return problemOf('invalid-request', 'A value is outside what the database accepts (for example text with a NUL character).');
  }
  if (isDatabaseUnavailable(err)) return toProblem(new ServiceUnavailableError());
  const http = err as HttpLikeError;
  const status = http?.status ?? http?.statusCode;
  if (typeof status === 'number' && status >= 400 && status < 500) {
    if (http.type === 'entity.too.large' || status === 413) {
      return problemOf('payload-too-large', 'The request body is larger than the server accepts.');
    }
    if (http.type === 'entity.parse.failed') {
      return problemOf('invalid-request', 'The request body is not valid JSON.', {
        errors: [{ path: '(body)', message: 'not valid JSON' }],
      });
    }
    const detail = http.expose && http.message ? http.message : 'The request was not accepted.';
    // Every other 4xx raised by a library (the body parser's charset, encoding and size checks) is one of two registered types.
    return problemOf(status === 415 ? 'unsupported-media-type' : 'invalid-request', detail);
  }
  return problemOf('internal', 'Something went wrong on the server. The error has been logged.');
}

export function sendProblem(res: Parameters<RequestHandler>[1], problem: ProblemDetails) {
  res.status(problem.status).type('application/problem+json').send(JSON.stringify(problem));
}

export const notFoundHandler: RequestHandler = (req, _res, next) => {
  next(new NotFoundError(`No API route matches ${req.method} ${req.originalUrl.split('?')[0]}.`));
};

export function problemHandler(logger: Logger): ErrorRequestHandler {
  return (err, req, res, next) => {
    if (res.headersSent) return next(err);
    const problem = toProblem(err);
    const log = req.log ?? logger.child({ reqId: req.id });
    if (problem.status === 503) {
      res.set('retry-after', String(err instanceof ServiceUnavailableError ? err.retryAfterSeconds : RETRY_AFTER_SECONDS));
      log.warn({ err, url: req.originalUrl }, 'database unavailable');
    } else if (problem.status >= 500) {
      log.error({ err, url: req.originalUrl }, 'request failed');
    }
    sendProblem(res, { ...problem, instance: req.originalUrl, ...(req.id !== undefined ? { requestId: String(req.id) } : {}) });
  };
}
