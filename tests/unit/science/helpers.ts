import { expect } from 'vitest';
import { DomainError } from '../../../api/science/errors';

/** Assert that no number anywhere inside `value` is NaN or ±Infinity (JSON would hide them as null). */
export function expectAllFinite(value: unknown, path = '$'): void {
  if (typeof value === 'number') {
    expect(Number.isFinite(value), `${path} = ${value}`).toBe(true);
  } else if (Array.isArray(value) || ArrayBuffer.isView(value)) {
    Array.from(value as ArrayLike<unknown>).forEach((v, i) => expectAllFinite(v, `${path}[${i}]`));
  } else if (value !== null && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) expectAllFinite(v, `${path}.${k}`);
  }
}

/** Run `fn`, expect a DomainError, return its code and field. */
export function domainErrorOf(fn: () => unknown): { code: string; field?: string } {
  try {
    fn();
  } catch (e) {
    if (e instanceof DomainError) return { code: e.code, field: e.field };
    throw e;
  }
  throw new Error('expected a DomainError, got none');
}

/** Relative agreement to n significant figures (half a unit in the n-th digit). */
export function expectSigFigs(value: number, expected: number, n = 4): void {
  const rel = Math.abs(value - expected) / Math.abs(expected);
  expect(rel, `${value} vs ${expected} to ${n} s.f.`).toBeLessThan(0.5 * 10 ** (1 - n));
}
