/**
 * Straight-line least squares, y = a + b·x, ordinary or weighted, with the full covariance and
 * the usual case diagnostics. O(n) time and memory; x is centred on its (weighted) mean and the
 * mean is refined by a correction pass (corrected two-pass algorithm: Chan, Golub & LeVeque,
 * Am. Stat. 1983, 37, 242) so that data with a large offset keep their digits.
 *
 * Formulas (any regression text, e.g. Draper & Smith, Applied Regression Analysis, 3rd ed.):
 *   x̄ = Σwx/Σw, Sxx = Σw(x − x̄)², Sxy = Σw(x − x̄)(y − ȳ), b = Sxy/Sxx, a = ȳ − b·x̄
 *   Var(b) = c/Sxx, Var(a) = c(1/Σw + x̄²/Sxx), Cov(a, b) = −c·x̄/Sxx
 * where c = s² = SSres/(n − 2) for OLS (w = 1), c = χ²/(n − 2) for WLS with relative σ, c = 1 for
 * WLS with absolute σ (w = 1/σ²).
 */
import quantileT from '@stdlib/stats-base-dists-t-quantile';
import { DomainError, requireFinite } from './errors';

/** How per-point σ values are to be read: none (OLS), absolute (known scale) or relative (scale from the scatter). */
export type SigmaMode = 'none' | 'absolute' | 'relative';

export interface LineFitOptions {
  /** Per-point standard deviations of y; weights are w = 1/σ². Omit for ordinary least squares. */
  sigma?: ArrayLike<number>;
  /** Default 'relative' when `sigma` is given: the covariance is scaled by χ²/(n − 2). */
  sigmaMode?: Exclude<SigmaMode, 'none'>;
}

/** Covariance matrix of (intercept a, slope b). */
export interface LineCovariance {
  interceptIntercept: number;
  slopeSlope: number;
  interceptSlope: number;
}

export interface LineFit {
  n: number;
  /** Residual degrees of freedom n − 2. */
  dof: number;
  sigmaMode: SigmaMode;
  slope: number;
  intercept: number;
  /** Null when the scale cannot be estimated (n = 2 with OLS or relative σ). */
  slopeSe: number | null;
  interceptSe: number | null;
  covariance: LineCovariance | null;
  /** Correlation coefficient between intercept and slope estimates. */
  interceptSlopeCorrelation: number | null;
  /** Residual SD s = √(SSres/(n − 2)) (weighted: √(χ²/(n − 2))); null when n = 2. */
  residualSd: number | null;
  /** Residual sum of squares; weighted fits give χ² = Σw(y − ŷ)². */
  ssRes: number;
  /** Total (weighted) sum of squares about ȳ. */
  ssTot: number;
  /** 1 − SSres/SStot; null when all y are equal. */
  rSquared: number | null;
  /** Σw (= n for OLS). */
  sumWeights: number;
  /** (Weighted) means. */
  xMean: number;
  yMean: number;
  /** Σw(x − x̄)². */
  sxx: number;
  /** Variance scale c used in the covariance (see module doc); null when not estimable. */
  varianceScale: number | null;
  fitted: number[];
  /** Raw residuals y − ŷ. */
  residuals: number[];
  /** Hat values h = w(1/Σw + (x − x̄)²/Sxx); they sum to 2. */
  leverages: number[];
  /** √w·e/(s√(1 − h)); null when undefined (s = 0, h = 1 or n = 2). */
  studentizedInternal: (number | null)[];
  /** Deleted (externally) studentized residual r·√((n − 3)/(n − 2 − r²)); null when n < 4 or undefined. */
  studentizedExternal: (number | null)[];
  /** Cook's distance r²·h/(2(1 − h)). */
  cooksDistance: (number | null)[];
  /** The same diagnostics for one point, without building the arrays (which are filled on first read). */
  studentizedInternalAt(i: number): number | null;
  studentizedExternalAt(i: number): number | null;
  cooksDistanceAt(i: number): number | null;
}

/**
 * Quantiles already computed, by dof then p: a fit asks for the same one or two (the level's, the
 * normal's) once per prediction, and each costs an incomplete-beta inversion. Pure, so kept; bounded.
 */
const QUANTILE_MEMO_SIZE = 256;
const quantileMemo = new Map<number, Map<number, number>>();

/**
 * Two-sided Student-t quantile t(p, ν) from @stdlib (regularised incomplete beta inverse).
 * @param p probability in (0, 1), e.g. 0.975 for a 95 % two-sided interval
 * @param dof degrees of freedom ν > 0
 */
export function studentTQuantile(p: number, dof: number): number {
  requireFinite(p, 'p');
  requireFinite(dof, 'dof');
  if (!(p > 0 && p < 1)) throw new DomainError('probability-out-of-range', 'p must lie strictly between 0 and 1', 'p');
  if (!(dof > 0)) throw new DomainError('dof-not-positive', 'degrees of freedom must be positive', 'dof');
  let byP = quantileMemo.get(dof);
  if (byP === undefined) {
    if (quantileMemo.size >= QUANTILE_MEMO_SIZE) quantileMemo.clear();
    byP = new Map();
    quantileMemo.set(dof, byP);
  }
  let q = byP.get(p);
  if (q === undefined) {
    if (byP.size >= QUANTILE_MEMO_SIZE) byP.clear();
    q = quantileT(p, dof);
    byP.set(p, q);
  }
  return q;
}

/**
 * Standard normal quantile z(p), taken as the Student-t quantile with ν = 10¹² (the t distribution
 * tends to the normal; the difference is ~1e-12 relative), so that one audited library serves both.
 */
export function normalQuantile(p: number): number {
  return studentTQuantile(p, 1e12);
}

/** Neumaier-compensated accumulator. */
class Sum {
  private s = 0;
  private c = 0;
  add(v: number): void {
    const t = this.s + v;
    if (Math.abs(this.s) >= Math.abs(v)) this.c += this.s - t + v;
    else this.c += v - t + this.s;
    this.s = t;
  }
  get value(): number {
    return this.s + this.c;
  }
}

/**
 * Fit y = a + b·x by ordinary (no `sigma`) or weighted least squares (w = 1/σ²).
 * Throws DomainError for mismatched lengths, n < 2, non-finite values, σ ≤ 0, or all x equal.
 */
export function fitLine(x: ArrayLike<number>, y: ArrayLike<number>, options: LineFitOptions = {}): LineFit {
  const n = x.length;
  if (y.length !== n) throw new DomainError('length-mismatch', 'x and y must have the same length', 'y');
  if (n < 2) throw new DomainError('too-few-points', 'a straight line needs at least two points', 'x');
  const sigma = options.sigma;
  if (sigma && sigma.length !== n) throw new DomainError('length-mismatch', 'sigma must have one value per point', 'sigma');
  const sigmaMode: SigmaMode = sigma ? (options.sigmaMode ?? 'relative') : 'none';
  const w = (i: number): number => (sigma ? 1 / (sigma[i]! * sigma[i]!) : 1);

  // Pass 1: validate, weighted sums for the means.
  const sw = new Sum();
  const swx = new Sum();
  const swy = new Sum();
  let xMin = Infinity;
  let xMax = -Infinity;
  for (let i = 0; i < n; i++) {
    const xi = x[i]!;
    const yi = y[i]!;
    if (!Number.isFinite(xi)) throw new DomainError('not-finite', `x[${i}] must be finite`, `x[${i}]`);
    if (!Number.isFinite(yi)) throw new DomainError('not-finite', `y[${i}] must be finite`, `y[${i}]`);
    if (sigma) {
      const si = sigma[i]!;
      if (!Number.isFinite(si) || si <= 0)
        throw new DomainError('sigma-not-positive', `sigma[${i}] must be a positive finite number`, `sigma[${i}]`);
    }
    const wi = w(i);
    sw.add(wi);
    swx.add(wi * xi);
    swy.add(wi * yi);
    if (xi < xMin) xMin = xi;
    if (xi > xMax) xMax = xi;
  }
  if (xMin === xMax) throw new DomainError('x-not-distinct', 'at least two distinct x values are needed', 'x');
  const sumW = sw.value;
  let xMean = swx.value / sumW;
  let yMean = swy.value / sumW;

  // Pass 2: centred sums, with the first-order correction of the means.
  const cx = new Sum();
  const cy = new Sum();
  for (let i = 0; i < n; i++) {
    const wi = w(i);
    cx.add(wi * (x[i]! - xMean));
    cy.add(wi * (y[i]! - yMean));
  }
  xMean += cx.value / sumW;
  yMean += cy.value / sumW;
  const sxxS = new Sum();
  const sxyS = new Sum();
  const syyS = new Sum();
  for (let i = 0; i < n; i++) {
    const wi = w(i);
    const dx = x[i]! - xMean;
    const dy = y[i]! - yMean;
    sxxS.add(wi * dx * dx);
    sxyS.add(wi * dx * dy);
    syyS.add(wi * dy * dy);
  }
  const sxx = sxxS.value;
  if (!(sxx > 0)) throw new DomainError('x-not-distinct', 'the x values do not spread enough to fit a slope', 'x');
  const slope = sxyS.value / sxx;
  const intercept = yMean - slope * xMean;
  const ssTot = syyS.value;

  // Pass 3: fitted values, residuals, leverages.
  const fitted: number[] = new Array<number>(n);
  const residuals: number[] = new Array<number>(n);
  const leverages: number[] = new Array<number>(n);
  const ss = new Sum();
  for (let i = 0; i < n; i++) {
    const dx = x[i]! - xMean;
    const yHat = yMean + slope * dx;
    const e = y[i]! - yHat;
    const wi = w(i);
    fitted[i] = yHat;
    residuals[i] = e;
    leverages[i] = Math.min(1, wi * (1 / sumW + (dx * dx) / sxx));
    ss.add(wi * e * e);
  }
  const ssRes = ss.value;
  const dof = n - 2;
  const residualVariance = dof > 0 ? ssRes / dof : null;
  const residualSd = residualVariance === null ? null : Math.sqrt(residualVariance);
  const varianceScale = sigmaMode === 'absolute' ? 1 : residualVariance;

  let covariance: LineCovariance | null = null;
  let interceptSlopeCorrelation: number | null = null;
  if (varianceScale !== null) {
    covariance = {
      slopeSlope: varianceScale / sxx,
      interceptIntercept: varianceScale * (1 / sumW + (xMean * xMean) / sxx),
      interceptSlope: (-varianceScale * xMean) / sxx,
    };
    const denom = Math.sqrt(covariance.slopeSlope * covariance.interceptIntercept);
    interceptSlopeCorrelation = denom > 0 ? covariance.interceptSlope / denom : null;
  }

  // Per-point diagnostics are computed when asked for: at 10⁶ points three arrays of boxed
  // numbers (null where undefined) cost more than the fit itself.
  const internalAt = (i: number): number | null => {
    const oneMinusH = 1 - leverages[i]!;
    if (residualSd !== null && residualSd > 0 && oneMinusH > 1e-12) {
      return (Math.sqrt(w(i)) * residuals[i]!) / (residualSd * Math.sqrt(oneMinusH));
    }
    return null;
  };
  const cookAt = (i: number): number | null => {
    const internal = internalAt(i);
    const h = leverages[i]!;
    return internal === null ? null : (internal * internal * h) / (2 * (1 - h));
  };
  const externalAt = (i: number): number | null => {
    const internal = internalAt(i);
    if (internal !== null && dof > 1) {
      const rest = dof - internal * internal;
      if (rest > 1e-12 * dof) return internal * Math.sqrt((dof - 1) / rest);
    }
    return null;
  };
  return Object.assign(new LineDiagnostics(n, internalAt, externalAt, cookAt), {
    n,
    dof,
    sigmaMode,
    slope,
    intercept,
    slopeSe: covariance ? Math.sqrt(covariance.slopeSlope) : null,
    interceptSe: covariance ? Math.sqrt(covariance.interceptIntercept) : null,
    covariance,
    interceptSlopeCorrelation,
    residualSd,
    ssRes,
    ssTot,
    rSquared: ssTot > 0 ? 1 - ssRes / ssTot : null,
    sumWeights: sumW,
    xMean,
    yMean,
    sxx,
    varianceScale,
    fitted,
    residuals,
    leverages,
  });
}

/**
 * The per-point diagnostics of a line fit: the functions, and the arrays built from them on first
 * read. The getters belong to this class, one accessor for every fit. An object literal's own getter
 * is an accessor pair that V8 allocates in the old generation, and through its closure it kept each
 * fit's arrays alive across every young-generation collection until the next full one.
 */
class LineDiagnostics {
  #internal: (number | null)[] | null = null;
  #external: (number | null)[] | null = null;
  #cook: (number | null)[] | null = null;
  readonly #count: number;

  constructor(
    count: number,
    readonly studentizedInternalAt: (i: number) => number | null,
    readonly studentizedExternalAt: (i: number) => number | null,
    readonly cooksDistanceAt: (i: number) => number | null,
  ) {
    this.#count = count;
  }

  get studentizedInternal(): (number | null)[] {
    return (this.#internal ??= everyPoint(this.#count, this.studentizedInternalAt));
  }

  get studentizedExternal(): (number | null)[] {
    return (this.#external ??= everyPoint(this.#count, this.studentizedExternalAt));
  }

  get cooksDistance(): (number | null)[] {
    return (this.#cook ??= everyPoint(this.#count, this.cooksDistanceAt));
  }
}

function everyPoint(n: number, at: (i: number) => number | null): (number | null)[] {
  const out = new Array<number | null>(n);
  for (let i = 0; i < n; i++) out[i] = at(i);
  return out;
}

export interface LinePrediction {
  x: number;
  yHat: number;
  /** SE of the mean line at x₀; null when the scale is not estimable. */
  seMean: number | null;
  /** SE for one new observation at x₀. */
  seNew: number | null;
  /** Quantile used: Student-t with n − 2 dof, or the normal quantile when σ is absolute. */
  quantile: number | null;
  meanInterval: [number, number] | null;
  predictionInterval: [number, number] | null;
}

export interface PredictOptions {
  /**
   * σ of the new observation (same meaning as the fit's σ). Default: the scatter of a typical
   * point, i.e. 1/w̄ with w̄ = Σw/n (OLS: s² itself).
   */
  sigmaNew?: number;
}

/**
 * Mean-line and new-observation prediction at x₀ using the full covariance (api/science/README.md §3):
 *   ŷ₀ = ȳ + b(x₀ − x̄),  Var(ŷ₀) = c[1/Σw + (x₀ − x̄)²/Sxx] = Var(a) + 2x₀Cov(a, b) + x₀²Var(b),
 *   SE_new² = c·σ₀² + Var(ŷ₀)  (OLS: s² + Var(ŷ₀)),
 * interval ŷ₀ ± q·SE with q = t((1 + level)/2, n − 2) (normal quantile when σ is absolute).
 */
export function predictLine(fit: LineFit, x0: number, confidenceLevel = 0.95, options: PredictOptions = {}): LinePrediction {
  requireFinite(x0, 'x');
  requireConfidenceLevel(confidenceLevel);
  const dx = x0 - fit.xMean;
  const yHat = fit.yMean + fit.slope * dx;
  const c = fit.varianceScale;
  if (c === null) return { x: x0, yHat, seMean: null, seNew: null, quantile: null, meanInterval: null, predictionInterval: null };
  let sigmaNew2: number;
  if (options.sigmaNew !== undefined) {
    requireFinite(options.sigmaNew, 'sigmaNew');
    if (options.sigmaNew <= 0) throw new DomainError('sigma-not-positive', 'sigmaNew must be positive', 'sigmaNew');
    sigmaNew2 = options.sigmaNew * options.sigmaNew;
  } else {
    sigmaNew2 = fit.n / fit.sumWeights;
  }
  const varMean = c * (1 / fit.sumWeights + (dx * dx) / fit.sxx);
  const seMean = Math.sqrt(varMean);
  const seNew = Math.sqrt(varMean + c * sigmaNew2);
  const p = (1 + confidenceLevel) / 2;
  const q = fit.sigmaMode === 'absolute' ? normalQuantile(p) : studentTQuantile(p, fit.dof);
  return {
    x: x0,
    yHat,
    seMean,
    seNew,
    quantile: q,
    meanInterval: [yHat - q * seMean, yHat + q * seMean],
    predictionInterval: [yHat - q * seNew, yHat + q * seNew],
  };
}

/** Throws unless 0 < level < 1. */
export function requireConfidenceLevel(level: number): number {
  requireFinite(level, 'confidenceLevel');
  if (!(level > 0 && level < 1)) {
    throw new DomainError(
      'confidence-level-out-of-range',
      'confidenceLevel must lie strictly between 0 and 1 (e.g. 0.95)',
      'confidenceLevel',
    );
  }
  return level;
}
