import { PROBLEM_TYPES, type ProblemTypeId } from './problem-types';

/**
 * Typed errors thrown anywhere in the API. The error middleware maps each to
 * an RFC 9457 problem-details response; nothing else decides status codes.
 * Each error names its entry in the problem-type registry, which fixes its
 * status and title.
 */
export interface FieldError {
  /** Dotted path of the offending field, e.g. "measurements.3.temperature.value". */
  path: string;
  message: string;
}

export class AppError extends Error {
  readonly status: number;
  readonly title: string;
  constructor(
    readonly type: ProblemTypeId,
    detail: string,
    readonly errors: FieldError[] = [],
    readonly extra: Record<string, unknown> = {},
    options?: ErrorOptions,
  ) {
    super(detail, options);
    this.name = new.target.name;
    this.status = PROBLEM_TYPES[type].status;
    this.title = PROBLEM_TYPES[type].title;
  }
}

export class BadRequestError extends AppError {
  constructor(detail: string, errors: FieldError[] = []) {
    super('invalid-request', detail, errors);
  }
}

export class UnauthenticatedError extends AppError {
  constructor(detail = 'Sign in to continue.') {
    super('not-signed-in', detail);
  }
}

export class ForbiddenError extends AppError {
  constructor(detail = 'Your role does not allow this.') {
    super('not-allowed', detail);
  }
}

export class NotFoundError extends AppError {
  constructor(detail = 'Nothing was found at this address.') {
    super('not-found', detail);
  }
}

export class ConflictError extends AppError {
  constructor(detail: string, extra: Record<string, unknown> = {}) {
    super('conflict', detail, [], extra);
  }
}

export class PreconditionFailedError extends AppError {
  constructor(detail: string, extra: Record<string, unknown> = {}) {
    super('precondition-failed', detail, [], extra);
  }
}

export class PayloadTooLargeError extends AppError {
  constructor(detail: string) {
    super('payload-too-large', detail);
  }
}

export class UnprocessableError extends AppError {
  constructor(detail: string, errors: FieldError[] = []) {
    super('cannot-compute', detail, errors);
  }
}

export class TooManyRequestsError extends AppError {
  constructor(detail = 'Too many requests; wait a moment and try again.') {
    super('too-many-requests', detail);
  }
}

export class ServiceUnavailableError extends AppError {
  constructor(
    detail = 'The database is not answering; try again in a few seconds.',
    readonly retryAfterSeconds = 5,
  ) {
    super('service-unavailable', detail);
  }
}

/** The outgoing mail server failed. The detail is ours: the server's own reply never reaches the client (it is logged). */
export class MailNotSentError extends AppError {
  constructor(detail: string, cause?: unknown) {
    super('mail-not-sent', detail, [], {}, { cause });
  }
}
