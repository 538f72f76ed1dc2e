/**
 * Typed errors thrown anywhere in the API. The error middleware maps each to
 * an RFC 9457 problem-details response; nothing else decides status codes.
 */
export interface FieldError {
  /** Dotted path of the offending field, e.g. "measurements.3.temperature.value". */
  path: string;
  message: string;
}

export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly title: string,
    detail: string,
    readonly errors: FieldError[] = [],
    readonly extra: Record<string, unknown> = {},
  ) {
    super(detail);
    this.name = new.target.name;
  }
}

export class BadRequestError extends AppError {
  constructor(detail: string, errors: FieldError[] = []) {
    super(400, 'Invalid request', detail, errors);
  }
}

export class UnauthenticatedError extends AppError {
  constructor(detail = 'Sign in to continue.') {
    super(401, 'Not signed in', detail);
  }
}

export class ForbiddenError extends AppError {
  constructor(detail = 'Your role does not allow this.') {
    super(403, 'Not allowed', detail);
  }
}

export class NotFoundError extends AppError {
  constructor(detail = 'Nothing was found at this address.') {
    super(404, 'Not found', detail);
  }
}

export class ConflictError extends AppError {
  constructor(detail: string, extra: Record<string, unknown> = {}) {
    super(409, 'Conflict', detail, [], extra);
  }
}

export class PreconditionFailedError extends AppError {
  constructor(detail: string, extra: Record<string, unknown> = {}) {
    super(412, 'Precondition failed', detail, [], extra);
  }
}

export class PayloadTooLargeError extends AppError {
  constructor(detail: string) {
    super(413, 'Payload too large', detail);
  }
}

export class UnprocessableError extends AppError {
  constructor(detail: string, errors: FieldError[] = []) {
    super(422, 'Cannot compute', detail, errors);
  }
}

export class TooManyRequestsError extends AppError {
  constructor(detail = 'Too many requests; wait a moment and try again.') {
    super(429, 'Too many requests', detail);
  }
}

export class ServiceUnavailableError extends AppError {
  constructor(
    detail = 'The database is not answering; try again in a few seconds.',
    readonly retryAfterSeconds = 5,
  ) {
    super(503, 'Service unavailable', detail);
  }
}
