/**
 * The assay's precision as σ of ln r at a given selectivity, and the check of a weighted fit's
 * scatter against the precision it was given.
 *
 * Propagation (first order, d ln r / d value): with p the fraction of A and r = p/(1 − p),
 *   ee (%):        σ_lnr = σ_ee·200/((100 − ee)(100 + ee)) = σ_ee·cosh²(y/2)/50
 *   % A, er (%):   σ_lnr = σ_%·100/(%A·(100 − %A))        = σ_%·4cosh²(y/2)/100
 *   dr, ratio:     σ_lnr = the relative SD of r, the same at every level
 * where y = ln r. Written in y, the forms never subtract two numbers close to 100, so a predicted
 * 99.95 % ee keeps its digits. A new run is measured at the *predicted* selectivity, so its σ is
 * propagated there, not at the screen's average: near the quantitation limit an assay of ±0.2 % ee
 * is worth σ_lnr ≈ 0.4 at 99.5 % ee but only 0.004 at 90 % ee.
 */
import { DomainError, requireFinite } from './errors';
import type { SelectivityMeasure } from './selectivity';
import { chiSquareLowerTail, chiSquareUpperTail } from './tails';

/** An assay precision: the SD of a reported value, in that measure's own units. */
export interface AssayPrecision {
  measure: SelectivityMeasure;
  uncertainty: number;
}

/** σ of ln r for a run of the given precision measured at ln r = `lnRatio` (see module doc). */
export function sigmaLnRatioAt(precision: AssayPrecision, lnRatio: number, field = 'newRunUncertainty'): number {
  requireFinite(precision.uncertainty, field);
  if (!(precision.uncertainty > 0)) throw new DomainError('not-positive', `${field} must be greater than zero`, field);
  const c = Math.cosh(lnRatio / 2);
  switch (precision.measure) {
    case 'ee':
      return (precision.uncertainty * c * c) / 50;
    case 'percentA':
    case 'er':
      return (precision.uncertainty * 4 * c * c) / 100;
    default:
      return precision.uncertainty;
  }
}

/** The median of the given precisions (values only; all are read in the same measure). */
export function medianUncertainty(values: readonly number[]): number | null {
  const v = values.filter((u) => Number.isFinite(u) && u > 0).sort((a, b) => a - b);
  if (v.length === 0) return null;
  const mid = v.length >> 1;
  return v.length % 2 ? v[mid]! : (v[mid - 1]! + v[mid]!) / 2;
}

export type PrecisionVerdict = 'consistent' | 'scatter-larger' | 'scatter-smaller';

export interface PrecisionCheck {
  chiSquare: number;
  dof: number;
  /** χ²/dof: about 1 when the stated σ describe the scatter. */
  reducedChiSquare: number;
  /** P(χ² ≥ observed) and P(χ² ≤ observed) for dof degrees of freedom, each from its own tail. */
  pLarger: number;
  pSmaller: number;
  verdict: PrecisionVerdict;
  /** One plain sentence for the page. */
  message: string;
}

/**
 * Compare the weighted residual sum χ² = Σ(eᵢ/σᵢ)² with the χ² distribution on n − 2 dof
 * (two-sided at `alpha`). Absolute uncertainties are supported only when the scatter matches;
 * otherwise the relative reading (covariance scaled by χ²/dof) is the honest one.
 */
export function checkStatedPrecision(chiSquare: number, dof: number, mode: 'absolute' | 'relative', alpha = 0.05): PrecisionCheck | null {
  if (!(dof > 0) || !Number.isFinite(chiSquare)) return null;
  const reduced = chiSquare / dof;
  const pLarger = chiSquareUpperTail(chiSquare, dof);
  const pSmaller = chiSquareLowerTail(chiSquare, dof);
  const stat = `χ²/dof = ${reduced.toPrecision(3)} on ${dof} dof`;
  let verdict: PrecisionVerdict = 'consistent';
  let message: string;
  if (pLarger < alpha / 2) {
    verdict = 'scatter-larger';
    message = `The runs scatter more than their stated assay precision allows (${stat}, p = ${pLarger.toPrecision(2)}): something besides the assay varies between runs. ${
      mode === 'absolute'
        ? 'Intervals that take the uncertainties as absolute are too narrow; read them as relative (scaled by the scatter).'
        : 'The intervals are scaled by the scatter (relative uncertainties), which is the right reading here.'
    }`;
  } else if (pSmaller < alpha / 2) {
    verdict = 'scatter-smaller';
    message = `The runs agree more closely than their stated assay precision suggests (${stat}, p = ${pSmaller.toPrecision(2)}): the stated uncertainties may be too large. ${
      mode === 'absolute'
        ? 'Intervals that take them as absolute are wider than the data need.'
        : 'Scaling by the scatter (relative) narrows the intervals accordingly.'
    }`;
  } else {
    message = `The scatter matches the stated assay precision (${stat}): the uncertainties can be read as absolute.${
      mode === 'relative' ? ' They are being read as relative, which gives nearly the same intervals.' : ''
    }`;
  }
  return { chiSquare, dof, reducedChiSquare: reduced, pLarger, pSmaller, verdict, message };
}
