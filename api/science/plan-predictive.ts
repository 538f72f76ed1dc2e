/**
 * The predictive distribution of the next run's ln r at a temperature, and the probability that it
 * meets a specification (the probability-of-success view of a design space: Peterson, J. Biopharm.
 * Stat. 2008, 18, 959).
 *
 * Everything the planner needs from a selectivity fit goes through {@link predictiveLnR}, so a
 * different model (e.g. a segmented fit) can be plugged in at this one place.
 */
import tCdf from '@stdlib/stats-base-dists-t-cdf';
import { DomainError, requireFinite, requireTemperatureK } from './errors';
import type { EyringFit } from './eyring-fit';

/** Degrees of freedom standing in for the normal distribution (the t cdf tends to it; ~1e-12 apart). */
export const NORMAL_DOF = 1e12;

/** Location–scale Student-t for ln r of a future result. */
export interface PredictiveLnR {
  /** Predicted ln r on the fitted line. */
  mean: number;
  /** Scale of the t distribution (the "standard error" of a new result). */
  scale: number;
  /** Degrees of freedom; {@link NORMAL_DOF} when the scale is known (absolute σ). */
  dof: number;
}

export interface PredictiveOptions {
  /** σ(ln r) of one new run, from the assay's precision; default: the fit's own scatter. */
  newRunSigma?: number;
  /** Mean of this many new runs (default 1). */
  runs?: number;
}

/**
 * Predictive distribution of ln r for the mean of k new runs at T from a straight-line fit
 * ln r = a + b/T (any regression text, e.g. Draper & Smith, Applied Regression Analysis):
 *   mean = ŷ(x₀), x₀ = 1/T
 *   scale² = c·[1/Σw + (x₀ − x̄)²/Sxx] + σ²_new/k
 * with c = s² (unweighted) and σ²_new = s² unless the new run's own assay σ is given, so that an
 * unweighted fit gives exactly s·√(1/k + 1/n + (x₀ − x̄)²/Sxx) on n − 2 degrees of freedom.
 * Weighted fits with relative σ use c = χ²/(n − 2) and a typical point's σ² = c·n/Σw; absolute σ
 * uses c = 1 and the normal distribution.
 * Throws `intervals-unavailable` when the fit has no estimate of scatter (fewer than three
 * distinct temperatures, or two runs).
 */
export function predictiveLnR(fit: EyringFit, temperatureK: number, options: PredictiveOptions = {}): PredictiveLnR {
  requireTemperatureK(temperatureK, 'temperatureK');
  const line = fit.line;
  const c = line.varianceScale;
  if (!fit.intervalsAvailable || c === null) {
    throw new DomainError(
      'intervals-unavailable',
      'the screen needs runs at three or more distinct temperatures before a probability can be given',
      'measurements',
    );
  }
  const k = options.runs ?? 1;
  if (!(Number.isInteger(k) && k >= 1)) throw new DomainError('runs-not-whole', 'runs must be a whole number of at least 1', 'runs');
  const x0 = 1 / temperatureK;
  const dx = x0 - line.xMean;
  const mean = line.yMean + line.slope * dx;
  const varMean = c * (1 / line.sumWeights + (dx * dx) / line.sxx);
  let varNew: number;
  if (options.newRunSigma !== undefined) {
    requireFinite(options.newRunSigma, 'newRunSigma');
    if (!(options.newRunSigma > 0)) throw new DomainError('sigma-not-positive', 'newRunSigma must be positive', 'newRunSigma');
    varNew = options.newRunSigma * options.newRunSigma;
  } else {
    varNew = (c * line.n) / line.sumWeights;
  }
  return {
    mean,
    scale: Math.sqrt(varMean + varNew / k),
    dof: line.sigmaMode === 'absolute' ? NORMAL_DOF : line.dof,
  };
}

/** P(T_ν ≤ z) for a standard Student t (normal when ν = NORMAL_DOF). */
export function studentTCdf(z: number, dof: number): number {
  return tCdf(z, dof);
}

/**
 * Probability that a future result from the predictive distribution reaches ln r_spec:
 * P(ln r_new ≥ ln r_spec) = F_ν((mean − ln r_spec)/scale), read from the lower tail at the
 * mirrored point so that tiny probabilities keep their digits.
 */
export function probabilityAtLeast(pred: PredictiveLnR, lnRatioSpec: number): number {
  return studentTCdf((pred.mean - lnRatioSpec) / pred.scale, pred.dof);
}

export const SPECIFICATION_MEASURES = ['ee', 'er', 'dr', 'percentA'] as const;
export type SpecificationMeasure = (typeof SPECIFICATION_MEASURES)[number];

export interface Specification {
  measure: SpecificationMeasure;
  /** ee: % (0–100); er and percentA: % of A (50–100); dr: r of r:1 (> 1). */
  minimum: number;
  /** Required probability, in (0.5, 0.999). */
  probability: number;
  /** The specification applies to the mean of this many runs (default 1). */
  runs?: number;
}

/** Smallest and largest required probability accepted [CP: below 0.5 is not "sure", above 0.999 is beyond any screen]. */
export const PROBABILITY_RANGE = { above: 0.5, upTo: 0.999 } as const;

/**
 * Validate a specification and return ln r_spec. ee must lie in (0, 100); er and percentA in
 * (50, 100) % of A; dr above 1 (1:1); probability in (0.5, 0.999]. Errors name `field`.*.
 */
export function specificationLnRatio(spec: Specification, field = 'specification'): number {
  const min = requireFinite(spec.minimum, `${field}.minimum`);
  const bad = (message: string) => new DomainError('specification-out-of-range', `${field}.minimum ${message}`, `${field}.minimum`);
  let ln: number;
  switch (spec.measure) {
    case 'ee':
      if (!(min > 0 && min < 100)) throw bad('must lie between 0 and 100 % ee (100 % cannot be forecast)');
      ln = Math.log1p(min / 100) - Math.log1p(-min / 100);
      break;
    case 'er':
    case 'percentA':
      if (!(min > 50 && min < 100)) throw bad('must lie between 50 and 100 % of the major isomer');
      ln = Math.log(min) - Math.log(100 - min);
      break;
    case 'dr':
      if (!(min > 1)) throw bad('must be above 1 (a dr of 1:1 is no selectivity)');
      ln = Math.log(min);
      break;
    default:
      throw new DomainError('unknown-measure', `${field}.measure must be one of ${SPECIFICATION_MEASURES.join(', ')}`, `${field}.measure`);
  }
  const p = requireFinite(spec.probability, `${field}.probability`);
  if (!(p > PROBABILITY_RANGE.above && p <= PROBABILITY_RANGE.upTo)) {
    throw new DomainError('probability-out-of-range', `${field}.probability must lie above 0.5 and at most 0.999`, `${field}.probability`);
  }
  if (spec.runs !== undefined && !(Number.isInteger(spec.runs) && spec.runs >= 1 && spec.runs <= 100)) {
    throw new DomainError('runs-not-whole', `${field}.runs must be a whole number from 1 to 100`, `${field}.runs`);
  }
  return ln;
}

/** A value of ln r expressed in a specification's measure (ee %, % of A, or dr r). */
export function lnRatioInMeasure(lnRatio: number, measure: SpecificationMeasure): number {
  switch (measure) {
    case 'ee':
      return 100 * Math.tanh(lnRatio / 2);
    case 'er':
    case 'percentA':
      return 100 / (1 + Math.exp(-lnRatio));
    case 'dr':
      return Math.exp(lnRatio);
  }
}

/**
 * σ(ln r) of one new run from the assay's precision σ in the measure's own units, propagated at the
 * predicted value: ee (points) σ_lnr = σ_ee·200/((100 − ee)(100 + ee)); % A or er (points)
 * σ_lnr = σ_p·100/(p(100 − p)); dr: σ is a relative SD of r, so σ_lnr = σ.
 */
export function newRunSigmaLnR(measure: SpecificationMeasure, uncertainty: number, predictedLnRatio: number): number {
  const r = Math.exp(Math.abs(predictedLnRatio));
  const spread = (1 + r) * (1 + 1 / r); // (1 + r)²/r, stable for large r
  switch (measure) {
    case 'ee':
      return ((uncertainty / 100) * spread) / 2;
    case 'er':
    case 'percentA':
      return (uncertainty / 100) * spread;
    case 'dr':
      return uncertainty;
  }
}
