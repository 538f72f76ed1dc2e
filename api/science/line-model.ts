/**
 * The fitted straight line as the predictions read it, whichever estimator produced it (least
 * squares on exact runs, or censored-normal maximum likelihood when some runs are bounds).
 *
 * Mean line at x₀: ŷ₀ = a + b·x₀, Var(ŷ₀) = Var(a) + 2x₀·Cov(a, b) + x₀²·Var(b) (the full covariance,
 * as Krug, Hunter & Grieger, J. Phys. Chem. 1976, 80, 2341, insist).
 *
 * A new run at x₀ adds its own scatter: Var_new = Var(ŷ₀) + σ²_run, where σ_run is
 *  - with a known assay precision σ_assay (propagated to ln r at the predicted ŷ₀):
 *      absolute weights: σ²_assay; relative weights: c·σ²_assay (c = the fitted variance scale);
 *      unweighted: max(s², σ²_assay), because the screen's residual variance s² describes runs at
 *      the screen's selectivities and a run cannot be more precise than its assay at the new one;
 *  - without one: the screen's own scatter of a typical run (s² unweighted, c/w̄ weighted).
 */
import { requireFinite } from './errors';
import { type LineCovariance, type LineFit } from './regression';

export interface LineModel {
  intercept: number;
  slope: number;
  covariance: LineCovariance | null;
  /** Two-sided quantile for the given level, or null when intervals are unavailable. */
  quantile: (level: number) => number | null;
  /** Variance of a typical run about the line, from the screen itself (ln r units). */
  screenRunVariance: number | null;
  /** Multiplier for a stated σ²_assay: 1 absolute, c relative, null unweighted (use the larger). */
  assayVarianceScale: number | null;
  /** Var(ŷ₀) at x₀ = 1/T. */
  varianceOfMean: (x0: number) => number | null;
}

/** Variance of a new run at x₀ given σ of its assay in ln r (or none known). */
export function newRunVariance(model: LineModel, x0: number, assaySigmaLnR: number | null): number | null {
  const vm = model.varianceOfMean(x0);
  if (vm === null || model.screenRunVariance === null) return null;
  if (assaySigmaLnR === null) return vm + model.screenRunVariance;
  const a2 = assaySigmaLnR * assaySigmaLnR;
  return vm + (model.assayVarianceScale === null ? Math.max(model.screenRunVariance, a2) : model.assayVarianceScale * a2);
}

/** The least-squares line as a LineModel; Var(ŷ₀) uses the centred form for its digits. */
export function lineModelFromLeastSquares(line: LineFit, quantile: (level: number) => number): LineModel {
  const c = line.varianceScale;
  return {
    intercept: line.intercept,
    slope: line.slope,
    covariance: line.covariance,
    quantile: (level) => (c === null ? null : quantile(level)),
    screenRunVariance: c === null ? null : (c * line.n) / line.sumWeights,
    assayVarianceScale: line.sigmaMode === 'none' ? null : line.sigmaMode === 'absolute' ? 1 : c,
    // predictLine's Var(ŷ₀) without its interval and quantile (called twice per prediction);
    // squared from its SE so the digits stay those of predictLine.
    varianceOfMean: (x0) => {
      if (c === null) return null;
      requireFinite(x0, 'x');
      const dx = x0 - line.xMean;
      const se = Math.sqrt(c * (1 / line.sumWeights + (dx * dx) / line.sxx));
      return se * se;
    },
  };
}
