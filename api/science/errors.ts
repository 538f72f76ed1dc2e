/**
 * Error thrown for any physically or mathematically invalid input to the selectivity engine
 * (T ≤ 0 K, |ee| ≥ 100 % where a finite ΔΔG‡ is needed, non-positive ratios, non-finite numbers...).
 *
 * `code` is a stable machine string (kebab-case); `field` is an optional path to the offending
 * input, such as `measurements[3].temperatureK`, so an API layer can map it onto a form field.
 */
export class DomainError extends Error {
  readonly code: string;
  readonly field?: string;

  constructor(code: string, message: string, field?: string) {
    super(message);
    this.name = 'DomainError';
    this.code = code;
    if (field !== undefined) this.field = field;
  }
}

/** Throw `not-finite` unless `value` is a finite number; returns it for chaining. */
export function requireFinite(value: number, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new DomainError('not-finite', `${field} must be a finite number`, field);
  }
  return value;
}

/** Throw `temperature-not-positive` unless `temperatureK` is finite and above absolute zero. */
export function requireTemperatureK(temperatureK: number, field: string): number {
  requireFinite(temperatureK, field);
  if (temperatureK <= 0) {
    throw new DomainError('temperature-not-positive', `${field} must be above absolute zero (got ${temperatureK} K)`, field);
  }
  return temperatureK;
}

/** Throw `not-positive` unless `value` is finite and > 0. */
export function requirePositive(value: number, field: string): number {
  requireFinite(value, field);
  if (value <= 0) throw new DomainError('not-positive', `${field} must be greater than zero`, field);
  return value;
}

/** Throw `result-out-of-range` unless a computed value is finite (guards overflow in outputs). */
export function requireFiniteResult(value: number, what: string, field?: string): number {
  if (!Number.isFinite(value)) {
    throw new DomainError('result-out-of-range', `${what} is outside the representable range`, field);
  }
  return value;
}

/** A non-fatal caution attached to a result, with a stable machine code. */
export interface Warning {
  code: string;
  message: string;
}
