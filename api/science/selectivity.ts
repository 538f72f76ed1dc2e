/**
 * Conversions between the ways chemists write a stereoselectivity, and the free-energy gap.
 *
 * Sign convention (api/science/README.md §1): r = [A]/[B]; ΔΔG‡ = G‡(TS→B) − G‡(TS→A), so ΔΔG‡ > 0 favours A.
 *   r = exp(ΔΔG‡/RT),  ee = (r − 1)/(r + 1) = tanh(ΔΔG‡/2RT),  %A = 100·r/(1 + r).
 * These follow from transition-state theory for two competing pathways from a common
 * (or rapidly equilibrating) precursor, Curtin–Hammett conditions.
 */
import { GAS_CONSTANT_J_PER_MOL_K as R } from './constants';
import { DomainError, requireFinite, requireFiniteResult, requireTemperatureK } from './errors';
import { parseRatioPair, readDecimal, SELECTIVITY_MEASURES, type SelectivityMeasure } from './quantities';

/** The measures a user can report a selectivity in (defined with the shared grammar in quantities.ts). */
export { SELECTIVITY_MEASURES, type SelectivityMeasure };

/**
 * A reported selectivity. `ee` is signed percent (A positive); `percentA` is the percentage of A;
 * `er` is "a:b" (or a number = the A share of 100); `dr` and `ratio` are "a:b" or a number r (= r:1).
 */
export interface SelectivityInput {
  measure: SelectivityMeasure;
  value: number | string;
}

/** An A:B pair; `erFromRatio` normalises it to a + b = 100. */
export interface RatioPair {
  a: number;
  b: number;
}

/** The convention string shown beside any ΔΔH‡/ΔΔS‡/ΔΔG‡ value (api/science/README.md §1). */
export const SIGN_CONVENTION = 'ΔΔX‡ = X‡(TS→B) − X‡(TS→A); positive values favour A (the numerator of r = [A]/[B])';

function requireRatio(r: number, field: string): number {
  requireFinite(r, field);
  if (r <= 0) throw new DomainError('ratio-not-positive', `${field} must be a ratio greater than zero`, field);
  return r;
}

/**
 * Ratio from the free-energy gap: r = exp(ΔΔG‡/RT) (Eyring, api/science/README.md §1).
 * Throws `result-out-of-range` if r would overflow or underflow to 0.
 */
export function ratioFromDdG(ddGJPerMol: number, temperatureK: number): number {
  requireFinite(ddGJPerMol, 'ddGJPerMol');
  requireTemperatureK(temperatureK, 'temperatureK');
  const r = Math.exp(ddGJPerMol / (R * temperatureK));
  if (!(r > 0)) throw new DomainError('result-out-of-range', 'ratio underflows to zero', 'ddGJPerMol');
  return requireFiniteResult(r, 'ratio', 'ddGJPerMol');
}

/** Free-energy gap from a ratio: ΔΔG‡ = RT·ln r (api/science/README.md §1). */
export function ddGFromRatio(ratio: number, temperatureK: number): number {
  requireRatio(ratio, 'ratio');
  requireTemperatureK(temperatureK, 'temperatureK');
  return R * temperatureK * Math.log(ratio);
}

/** Signed ee in percent from a ratio: ee = (r − 1)/(r + 1), evaluated as tanh(ln r / 2) for accuracy. */
export function eeFromRatio(ratio: number): number {
  requireRatio(ratio, 'ratio');
  return 100 * Math.tanh(Math.log(ratio) / 2);
}

/** Signed ee in percent from the gap: ee = tanh(ΔΔG‡/2RT) (api/science/README.md §1). Never reaches ±100 exactly except by rounding. */
export function eeFromDdG(ddGJPerMol: number, temperatureK: number): number {
  requireFinite(ddGJPerMol, 'ddGJPerMol');
  requireTemperatureK(temperatureK, 'temperatureK');
  return 100 * Math.tanh(ddGJPerMol / (2 * R * temperatureK));
}

function requireEeFraction(eePercent: number, field: string): number {
  requireFinite(eePercent, field);
  if (Math.abs(eePercent) > 100) throw new DomainError('ee-out-of-range', `${field} must lie between −100 and 100 %`, field);
  if (Math.abs(eePercent) === 100) {
    throw new DomainError(
      'ee-at-limit',
      `${field} of ±100 % implies an infinite energy gap; report the detection limit instead (e.g. 99.8 %)`,
      field,
    );
  }
  return eePercent / 100;
}

/** ln r from signed ee: ln r = 2·artanh(ee) = ln(1 + ee) − ln(1 − ee), accurate near ±100 %. */
export function lnRatioFromEe(eePercent: number, field = 'ee'): number {
  const e = requireEeFraction(eePercent, field);
  return Math.log1p(e) - Math.log1p(-e);
}

/** Ratio from signed ee: r = (1 + ee)/(1 − ee). */
export function ratioFromEe(eePercent: number, field = 'ee'): number {
  return Math.exp(lnRatioFromEe(eePercent, field));
}

/** Free-energy gap from signed ee: ΔΔG‡ = 2RT·artanh(ee) (api/science/README.md §1). */
export function ddGFromEe(eePercent: number, temperatureK: number): number {
  requireTemperatureK(temperatureK, 'temperatureK');
  return R * temperatureK * lnRatioFromEe(eePercent);
}

/** Percentage of A from the ratio: %A = 100·r/(1 + r). */
export function percentAFromRatio(ratio: number): number {
  requireRatio(ratio, 'ratio');
  return ratio >= 1 ? 100 / (1 + 1 / ratio) : (100 * ratio) / (1 + ratio);
}

/** Ratio from the percentage of A: r = p/(100 − p); 0 and 100 are rejected (infinite gap). */
export function ratioFromPercentA(percentA: number, field = 'percentA'): number {
  requireFinite(percentA, field);
  if (percentA < 0 || percentA > 100) throw new DomainError('percent-a-out-of-range', `${field} must lie between 0 and 100`, field);
  if (percentA === 0 || percentA === 100) {
    throw new DomainError('percent-a-at-limit', `${field} of 0 or 100 % implies an infinite energy gap`, field);
  }
  return percentA / (100 - percentA);
}

/** Enantiomeric (or any A:B) ratio normalised to 100: a = 100·r/(1 + r), b = 100/(1 + r). */
export function erFromRatio(ratio: number): RatioPair {
  const a = percentAFromRatio(ratio);
  return { a, b: ratio >= 1 ? 100 / (1 + ratio) : 100 - a };
}

/** Ratio from an A:B pair: r = a/b; both parts must be > 0. */
export function ratioFromEr(a: number, b: number, field = 'er'): number {
  requireFinite(a, field);
  requireFinite(b, field);
  if (a < 0 || b < 0) throw new DomainError('ratio-not-positive', `${field} parts must not be negative`, field);
  if (a === 0 || b === 0) {
    throw new DomainError(
      'zero-minor-component',
      `${field} has a zero component, which implies an infinite energy gap; report the detection limit instead`,
      field,
    );
  }
  return requireRatio(a / b, field);
}

/** Diastereomeric ratio written r:1. */
export function drFromRatio(ratio: number): RatioPair {
  requireRatio(ratio, 'ratio');
  return { a: ratio, b: 1 };
}

function parsePair(text: string, field: string): number {
  const pair = parseRatioPair(text);
  if (!pair) throw new DomainError('bad-ratio-string', `${field} must look like "a:b", e.g. "95:5"`, field);
  return ratioFromEr(pair.a, pair.b, field);
}

/** A number, or a string that is a strict decimal (no "0x10", "0b1", "0o7", "Infinity"). */
function parseNumber(value: number | string, field: string, pairAllowed = false): number {
  if (typeof value === 'number') return requireFinite(value, field);
  const n = readDecimal(value, '.');
  if (n === null || !Number.isFinite(n)) {
    if (pairAllowed) throw new DomainError('bad-ratio-string', `${field} must be a number or look like "a:b", e.g. "95:5"`, field);
    throw new DomainError('not-finite', `${field} must be a number`, field);
  }
  return n;
}

/**
 * Parse a reported selectivity into r = [A]/[B].
 *
 * - `ee`: signed percent, |ee| < 100 → r = (1 + ee)/(1 − ee)
 * - `percentA`: 0 < p < 100 → r = p/(100 − p)
 * - `er`, `dr`, `ratio`: "a:b" → a/b; a number is r itself (er 19 ≡ 95:5, dr 12 ≡ 12:1)
 *
 * Numeric strings are accepted for numeric forms when they are strict decimals. Errors carry `field` = `${fieldPath}.value`.
 * Codes: not-finite, ee-out-of-range, ee-at-limit, percent-a-out-of-range, percent-a-at-limit,
 * zero-minor-component, bad-ratio-string, ratio-not-positive, unknown-measure.
 */
export function parseSelectivity(input: SelectivityInput, fieldPath = 'selectivity'): number {
  const field = `${fieldPath}.value`;
  const { measure, value } = input;
  switch (measure) {
    case 'ee':
      return ratioFromEe(parseNumber(value, field), field);
    case 'percentA':
      return ratioFromPercentA(parseNumber(value, field), field);
    case 'er':
    case 'dr':
    case 'ratio':
      if (typeof value === 'string' && value.includes(':')) return parsePair(value, field);
      return requireRatio(parseNumber(value, field, true), field);
    default:
      throw new DomainError('unknown-measure', `measure must be one of ${SELECTIVITY_MEASURES.join(', ')}`, `${fieldPath}.measure`);
  }
}

/**
 * Standard deviation of ln r propagated from the uncertainty of the reported measure (api/science/README.md §3,
 * first-order error propagation):
 * - `ee` (σ in ee percentage points): σ(ln r) = 2σ_ee/(1 − ee²), ee and σ as fractions;
 * - `percentA`, and `er` (σ in points of the A share of 100, whichever way er is written): σ(ln r) = σ_p/[p(1 − p)];
 * - `dr`, `ratio`: σ is a relative SD of r (0.05 = 5 %), so σ(ln r) ≈ σ_r/r = σ.
 * Using 1 − ee² = 4r/(1 + r)² and p(1 − p) = r/(1 + r)² keeps this accurate near the limits.
 */
export function sigmaLnRatio(input: SelectivityInput, uncertainty: number, fieldPath = 'selectivity'): number {
  const sigmaField = `${fieldPath}.uncertainty`;
  requireFinite(uncertainty, sigmaField);
  if (uncertainty < 0) throw new DomainError('uncertainty-negative', `${sigmaField} must not be negative`, sigmaField);
  const r = parseSelectivity(input, fieldPath);
  const spread = r >= 1 ? (1 + r) * (1 + 1 / r) : ((1 + r) * (1 + r)) / r; // (1 + r)²/r
  switch (input.measure) {
    case 'ee':
      return ((uncertainty / 100) * spread) / 2;
    case 'percentA':
    case 'er':
      return (uncertainty / 100) * spread;
    default:
      return uncertainty;
  }
}
