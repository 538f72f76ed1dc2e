/**
 * Upper-tail probabilities computed directly, never as 1 − cdf: a p-value of 2.5e-40 must not
 * print as 0 because the cdf rounded to 1. Both come from the regularised incomplete functions
 * (@stdlib, after Boost), which evaluate the requested tail by its own series or continued fraction.
 *
 *   χ²:  P(X > x | k) = Q(k/2, x/2), the regularised upper incomplete gamma.
 *   F:   P(F > f | d₁, d₂) = I_{d₂/(d₂ + d₁f)}(d₂/2, d₁/2), the regularised incomplete beta
 *        (Abramowitz & Stegun 26.6.2), which needs no subtraction at all.
 *   t:   P(T > t | ν) = ½·I_{ν/(ν + t²)}(ν/2, ½) for t ≥ 0 (A&S 26.7.1).
 *   Normal: P(Z > z) = ½·erfc(z/√2).
 */
import betainc from '@stdlib/math-base-special-betainc';
import erfc from '@stdlib/math-base-special-erfc';
import gammainc from '@stdlib/math-base-special-gammainc';
import { DomainError, requireFinite } from './errors';

function requireDof(dof: number, field: string): void {
  requireFinite(dof, field);
  if (!(dof > 0)) throw new DomainError('dof-not-positive', `${field} must be positive`, field);
}

/** P(χ²_k > x): regularised upper incomplete gamma Q(k/2, x/2). */
export function chiSquareUpperTail(x: number, dof: number): number {
  requireDof(dof, 'dof');
  if (Number.isNaN(x)) throw new DomainError('not-finite', 'x must be a number', 'x');
  if (x <= 0) return 1;
  if (x === Infinity) return 0;
  return gammainc(x / 2, dof / 2, true, true);
}

/** P(χ²_k ≤ x): regularised lower incomplete gamma P(k/2, x/2) (its own series, no subtraction). */
export function chiSquareLowerTail(x: number, dof: number): number {
  requireDof(dof, 'dof');
  if (Number.isNaN(x)) throw new DomainError('not-finite', 'x must be a number', 'x');
  if (x <= 0) return 0;
  if (x === Infinity) return 1;
  return gammainc(x / 2, dof / 2, true, false);
}

/** P(F > f) for F with (d₁, d₂) degrees of freedom: I_{d₂/(d₂ + d₁f)}(d₂/2, d₁/2). */
export function fUpperTail(f: number, dof1: number, dof2: number): number {
  requireDof(dof1, 'dof1');
  requireDof(dof2, 'dof2');
  if (Number.isNaN(f)) throw new DomainError('not-finite', 'f must be a number', 'f');
  if (f <= 0) return 1;
  if (f === Infinity) return 0;
  return betainc(dof2 / (dof2 + dof1 * f), dof2 / 2, dof1 / 2, true, false);
}

/** P(T > t) for Student's t with ν degrees of freedom. */
export function studentTUpperTail(t: number, dof: number): number {
  requireDof(dof, 'dof');
  if (Number.isNaN(t)) throw new DomainError('not-finite', 't must be a number', 't');
  if (t === Infinity) return 0;
  if (t === -Infinity) return 1;
  const half = 0.5 * betainc(dof / (dof + t * t), dof / 2, 0.5, true, false);
  return t >= 0 ? half : 1 - half;
}

/** P(Z > z) for the standard normal: ½·erfc(z/√2). */
export function normalUpperTail(z: number): number {
  if (Number.isNaN(z)) throw new DomainError('not-finite', 'z must be a number', 'z');
  return 0.5 * erfc(z / Math.SQRT2);
}
