/**
 * Differential Eyring analysis of a temperature screen (api/science/README.md §3).
 *
 * Regress y = ln r on x = 1/T: y = a + b·x, so ΔΔH‡ = R·b and ΔΔS‡ = −R·a
 * (from ln r = ΔΔH‡/RT − ΔΔS‡/R). The covariance of (a, b) is kept and used for every derived
 * quantity, because the two estimates are strongly correlated (Krug, Hunter & Grieger,
 * J. Phys. Chem. 1976, 80, 2341).
 */
import { checkStatedPrecision, sigmaLnRatioAt, type AssayPrecision, type PrecisionCheck } from './assay-precision';
import { fitCensoredLine, type CensorKind } from './censored';
import { float64Columns, int32Column } from './columns';
import { GAS_CONSTANT_J_PER_MOL_K as R } from './constants';
import { DomainError, requireFinite, requireTemperatureK, type Warning } from './errors';
import { fiellerInterval } from './fieller';
import { FLAG_RULES, highLeverageLimit } from './flag-rules';
import { eeFromLnRatio, eeFromLnRatioAndRatio, percentAFromLnRatioAndRatio } from './quantities';
import { zeroSelectivityTemperatureK } from './forecast';
import { lineModelFromLeastSquares, newRunVariance, type LineModel } from './line-model';
import { fitLine, normalQuantile, requireConfidenceLevel, studentTQuantile, type LineFit, type SigmaMode } from './regression';
import { SIGN_CONVENTION } from './selectivity';
import { describeTemperatureK, kelvinToCelsius } from './units';

export { SIGN_CONVENTION as EYRING_CONVENTION };

export interface EyringMeasurement {
  temperatureK: number;
  /** Parsed selectivity r = [A]/[B] (see parseSelectivity). */
  ratio: number;
  /** Standard deviation of ln r (see sigmaLnRatio); optional. */
  sigmaLnR?: number;
  /** Excluded by the user: kept in the output, not fitted. */
  excluded?: boolean;
  exclusionReason?: string;
  /**
   * The assay reported only a bound ("at least this selective", e.g. ≥ 99.0 % ee): censored like a
   * run at the quantitation limit, whatever its value. A bound on r when ln r ≥ 0, else on 1/r.
   */
  atLeast?: boolean;
  /** Free label echoed back (run id, sample name). */
  label?: string;
}

/** Weighting: 'auto' = relative-σ WLS when every fitted run has σ(ln r), else OLS. */
export type EyringWeighting = 'auto' | 'none' | 'relative' | 'absolute';

export interface EyringFitOptions {
  /** Default 0.95. */
  confidenceLevel?: number;
  weighting?: EyringWeighting;
  /** |ee| at or above this percentage is censored (quantitation limit); default 99.8 [CP]. */
  censorEePercent?: number;
  /** The quantitation limit as |ln r| (any measure converted); overrides censorEePercent. */
  censorLnRatio?: number;
  /** Precision of the assay that will measure a new run; without it the screen's scatter is used. */
  newRun?: AssayPrecision;
  /** Temperatures the caller asked about (a forecast range); T₀ is a far extrapolation only outside these and the data. */
  requestedRangeK?: { min: number; max: number };
  /** Temperatures at which to predict (same as calling predictEyring). */
  predictAtK?: readonly number[];
  /** Span of temperature below which the screen is called narrow; default 40 K [CP]. */
  narrowSpanK?: number;
}

export type { Warning };
export { FLAG_RULES } from './flag-rules';

export type PointFlag = 'outlier' | 'high-leverage' | 'influential';

export interface EyringPointResult {
  index: number;
  label: string | null;
  temperatureK: number;
  inverseTemperaturePerK: number;
  ratio: number;
  lnRatio: number;
  eePercent: number;
  sigmaLnR: number | null;
  status: 'fitted' | 'excluded' | 'censored';
  exclusionReason: string | null;
  /** ln r on the fitted line at this temperature (all points). */
  lineLnRatio: number;
  /** Diagnostics, only for fitted points (null otherwise or when undefined). */
  residual: number | null;
  leverage: number | null;
  studentizedInternal: number | null;
  studentizedExternal: number | null;
  cooksDistance: number | null;
  flags: PointFlag[];
  /** One line saying why the run is flagged; null when it is not. */
  flagReason: string | null;
  /** |residual| / σ of the run's assay in ln r, when the precision is known. */
  residualInAssaySigmas: number | null;
  /** Whether the residual lies within FLAG_RULES.assaySigmas of the assay's precision (null: unknown). */
  withinAssayPrecision: boolean | null;
  /** For censored points: the measured r is a lower (ee ≥ +limit) or upper (ee ≤ −limit) bound. */
  censoredBound: 'lower' | 'upper' | null;
  /** For censored points: the censoring point in ln r (the quantitation limit, or a weaker bound as reported). */
  censorLnRatio: number | null;
  /** For censored points: whether the fitted line at this temperature lies beyond the censoring point. */
  boundConsistent: boolean | null;
}

/** An interval in ln r mapped monotonically onto r, ee and %A. */
export interface SelectivityInterval {
  lnRatio: [number, number];
  ratio: [number, number];
  eePercent: [number, number];
  percentA: [number, number];
}

export interface EyringPrediction {
  temperatureK: number;
  celsius: number;
  lnRatio: number;
  /** e^lnRatio; Infinity or 0 when beyond the representable range (then outOfRange is set). */
  ratio: number;
  /** r itself cannot be represented (|ln r| > ~709); ln r, ΔΔG‡ and the saturated ee still stand. */
  outOfRange: boolean;
  /** σ of ln r used for the new run's own measurement (assay propagated at the prediction), or null for the screen's scatter. */
  newRunSigmaLnR: number | null;
  eePercent: number;
  percentA: number;
  ddGJPerMol: number;
  ddGSeJPerMol: number | null;
  /** Outside the range of fitted temperatures. */
  extrapolated: boolean;
  /** CI of the mean line (where the average of many runs would fall). */
  meanInterval: SelectivityInterval | null;
  /** Prediction interval for a single new run. */
  predictionInterval: SelectivityInterval | null;
}

export interface EyringFit extends ActivationEstimates {
  convention: string;
  confidenceLevel: number;
  weighting: SigmaMode;
  nFitted: number;
  nExcluded: number;
  nCensored: number;
  distinctTemperatures: number;
  /** Range of fitted temperatures. */
  temperatureRangeK: { min: number; max: number };
  /** Cov(ΔΔH‡, ΔΔS‡) = −R²·Cov(b, a), in J²/(mol²·K). */
  ddHDdSCovariance: number | null;
  ddHDdSCorrelation: number | null;
  /** Slope b = ΔΔH‡/R in K and intercept a = −ΔΔS‡/R of ln r vs 1/T. */
  slopeK: number;
  intercept: number;
  residualSdLnR: number | null;
  rSquared: number | null;
  dof: number;
  zeroSelectivityTemperatureK: number | null;
  /** Fieller confidence set for T₀, restricted to T > 0; null when T₀ or intervals are unavailable. */
  zeroSelectivityInterval: ZeroSelectivityInterval | null;
  /** T₀ lies outside both the screened and the requested temperatures. */
  zeroSelectivityFar: boolean;
  /** False with fewer than 3 distinct temperatures (api/science/README.md §3). */
  intervalsAvailable: boolean;
  /** How ΔΔH‡, ΔΔS‡ and the predictions were estimated. */
  estimator: 'least-squares' | 'censored-ml';
  /** With censored-ml: the least-squares fit of the exact runs only (bounds dropped), for comparison. */
  leastSquaresWithoutBounds: LeastSquaresSummary | null;
  /** With censored-ml: details of the likelihood fit. */
  censoredFit: { logLikelihood: number; iterations: number; scale: number; nLower: number; nUpper: number } | null;
  /** Weighted fits: whether the scatter matches the stated precision (χ²/dof). */
  precisionCheck: PrecisionCheck | null;
  /** Where the new run's scatter in the prediction interval comes from. */
  newRunBasis: { source: 'assay'; precision: AssayPrecision } | { source: 'screen-scatter' };
  points: EyringPointResult[];
  predictions: EyringPrediction[];
  warnings: Warning[];
  /** The least-squares straight-line fit (x = 1/T, y = ln r) over exact fitted runs; diagnostics come from it. */
  line: LineFit;
  /** The line the estimates and predictions come from (least squares, or censored ML). */
  model: LineModel;
}

/** ΔΔH‡ and ΔΔS‡ of a line, with their standard errors and intervals (null where intervals are unavailable). */
export interface ActivationEstimates {
  ddHJPerMol: number;
  ddSJPerMolK: number;
  ddHSeJPerMol: number | null;
  ddSSeJPerMolK: number | null;
  ddHCiJPerMol: [number, number] | null;
  ddSCiJPerMolK: [number, number] | null;
}

export interface LeastSquaresSummary extends ActivationEstimates {
  nFitted: number;
}

/** Parts of the temperature axis (K) inside the Fieller set; null ends mean 0 K or no upper limit. */
export interface ZeroSelectivityInterval {
  ranges: { fromK: number | null; toK: number | null }[];
  bounded: boolean;
  message: string;
}

/** Default censoring limit in ee percent: the usual quantitation limit of chiral chromatography [CP]. */
export const DEFAULT_CENSOR_EE_PERCENT = 99.8;
/** Default span under which a screen is called narrow [CP, api/science/README.md §8]. */
export const DEFAULT_NARROW_SPAN_K = 40;

const sameTemperature = (a: number, b: number) => Math.abs(a - b) <= 1e-6;

function countDistinct(sorted: ArrayLike<number>): number {
  let count = 0;
  for (let i = 0; i < sorted.length; i++) if (i === 0 || !sameTemperature(sorted[i]!, sorted[i - 1]!)) count++;
  return count;
}

/** e^y; may be Infinity or 0 far outside the data, which callers report as out of range instead of failing. */
const ratioFromLn = (y: number) => Math.exp(y);
/** |ln r| at |ee| = limit %: ln((1 + e)/(1 − e)); 99.8 % ↔ ln 999. */
export const lnRatioLimitFromEe = (eePercent: number) => Math.log1p(eePercent / 100) - Math.log1p(-eePercent / 100);

function mapInterval(lo: number, hi: number): SelectivityInterval {
  const rLo = ratioFromLn(lo);
  const rHi = ratioFromLn(hi);
  return {
    lnRatio: [lo, hi],
    ratio: [rLo, rHi],
    eePercent: [eeFromLnRatioAndRatio(lo, rLo), eeFromLnRatioAndRatio(hi, rHi)],
    percentA: [percentAFromLnRatioAndRatio(lo, rLo), percentAFromLnRatioAndRatio(hi, rHi)],
  };
}

/** A validated and classified run as an object: what the censored fit reads (the rest of the engine reads columns). */
export interface PreparedMeasurement {
  index: number;
  measurement: EyringMeasurement;
  x: number;
  y: number;
  status: 'fitted' | 'excluded' | 'censored';
  censoredBound: 'lower' | 'upper' | null;
  /**
   * Censoring point in ln r: the quantitation limit for a value at or beyond it (the assay cannot
   * tell 99.9 from 99.8 % ee, so the bound is checked at the limit, not at the reported digits), or
   * the reported value for a weaker bound inside the limit ("≥ 99.0 %").
   */
  censorPoint: number | null;
}

const FITTED = 0;
const EXCLUDED = 1;
const CENSORED = 2;
const STATUS_NAMES = ['fitted', 'excluded', 'censored'] as const;

/**
 * The validated runs as columns, one typed array per field and no object per run: what fitEyring
 * reads, because at 10⁶ runs objects per run (and their garbage) cost more than the fit.
 */
interface PreparedColumns {
  x: Float64Array;
  y: Float64Array;
  /** FITTED, EXCLUDED or CENSORED. */
  status: Uint8Array;
  /** 1 lower bound, −1 upper bound, 0 not censored. */
  bound: Int8Array;
  /** Censoring point in ln r (see PreparedMeasurement.censorPoint); NaN when not censored. */
  censorPoint: Float64Array;
}

/**
 * Validate measurements and classify each as fitted, excluded or censored (|ee| ≥ limit).
 * `censorLnRatio`, when given, is the limit as |ln r| and takes precedence over `censorEePercent`.
 */
function prepareColumns(measurements: readonly EyringMeasurement[], censorEePercent: number, censorLnRatio?: number): PreparedColumns {
  if (!Array.isArray(measurements)) throw new DomainError('not-a-list', 'measurements must be a list', 'measurements');
  let lnLimit: number;
  if (censorLnRatio !== undefined) {
    requireFinite(censorLnRatio, 'censorLnRatio');
    if (!(censorLnRatio > 0))
      throw new DomainError('censor-limit-out-of-range', 'the quantitation limit must favour one isomer (|ln r| > 0)', 'censorLnRatio');
    lnLimit = censorLnRatio;
  } else {
    requireFinite(censorEePercent, 'censorEePercent');
    if (!(censorEePercent > 0 && censorEePercent < 100)) {
      throw new DomainError('censor-limit-out-of-range', 'censorEePercent must lie between 0 and 100', 'censorEePercent');
    }
    lnLimit = lnRatioLimitFromEe(censorEePercent);
  }
  const count = measurements.length;
  const [x, y, censorPoint] = float64Columns(count, 3);
  const columns: PreparedColumns = { x, y, status: new Uint8Array(count), bound: new Int8Array(count), censorPoint: censorPoint.fill(NaN) };
  for (let index = 0; index < count; index++) {
    const m = measurements[index]!;
    // Field paths are built only on the error path: at 10⁶ runs the strings alone cost more than the fit.
    const valid =
      Number.isFinite(m.temperatureK) &&
      m.temperatureK > 0 &&
      Number.isFinite(m.ratio) &&
      m.ratio > 0 &&
      (m.sigmaLnR === undefined || (Number.isFinite(m.sigmaLnR) && m.sigmaLnR > 0));
    if (!valid) {
      const base = `measurements[${index}]`;
      requireTemperatureK(m.temperatureK, `${base}.temperatureK`);
      requireFinite(m.ratio, `${base}.ratio`);
      if (m.ratio <= 0) throw new DomainError('ratio-not-positive', `${base}.ratio must be greater than zero`, `${base}.ratio`);
      if (m.sigmaLnR !== undefined) {
        requireFinite(m.sigmaLnR, `${base}.sigmaLnR`);
        if (m.sigmaLnR <= 0) throw new DomainError('sigma-not-positive', `${base}.sigmaLnR must be positive`, `${base}.sigmaLnR`);
      }
    }
    const y = Math.log(m.ratio);
    let status = FITTED;
    let bound = 0;
    if (m.excluded) status = EXCLUDED;
    else if (m.atLeast) {
      status = CENSORED;
      bound = y >= 0 ? 1 : -1;
    } else if (y >= lnLimit * (1 - 1e-12)) {
      status = CENSORED;
      bound = 1;
    } else if (y <= -lnLimit * (1 - 1e-12)) {
      status = CENSORED;
      bound = -1;
    }
    columns.x[index] = 1 / m.temperatureK;
    columns.y[index] = y;
    columns.status[index] = status;
    columns.bound[index] = bound;
    if (bound === 1) columns.censorPoint[index] = Math.min(y, lnLimit);
    else if (bound === -1) columns.censorPoint[index] = Math.max(y, -lnLimit);
  }
  return columns;
}

/** Run `index` of the columns as an object. */
function preparedAt(columns: PreparedColumns, measurements: readonly EyringMeasurement[], index: number): PreparedMeasurement {
  const bound = columns.bound[index]!;
  return {
    index,
    measurement: measurements[index]!,
    x: columns.x[index]!,
    y: columns.y[index]!,
    status: STATUS_NAMES[columns.status[index]!]!,
    censoredBound: bound === 1 ? 'lower' : bound === -1 ? 'upper' : null,
    censorPoint: bound === 0 ? null : columns.censorPoint[index]!,
  };
}

/**
 * The runs a fit uses (neither excluded nor censored), as columns in request order: each one's
 * position in the request, temperature and ln r. For the two-branch check, which needs no object per run.
 */
export function fittedRuns(
  measurements: readonly EyringMeasurement[],
  censorEePercent = DEFAULT_CENSOR_EE_PERCENT,
): { index: Int32Array; temperatureK: Float64Array; y: Float64Array } {
  const columns = prepareColumns(measurements, censorEePercent);
  const index = runsWithStatus(columns, FITTED);
  const [temperatureK, y] = float64Columns(index.length, 2);
  for (let k = 0; k < index.length; k++) {
    temperatureK[k] = measurements[index[k]!]!.temperatureK;
    y[k] = columns.y[index[k]!]!;
  }
  return { index, temperatureK, y };
}

/** Request positions of the runs with `status` (FITTED, EXCLUDED or CENSORED), in request order. */
function runsWithStatus(columns: PreparedColumns, status: number): Int32Array {
  let count = 0;
  for (let i = 0; i < columns.status.length; i++) if (columns.status[i] === status) count++;
  const positions = int32Column(count);
  for (let i = 0, k = 0; i < columns.status.length; i++) if (columns.status[i] === status) positions[k++] = i;
  return positions;
}

/** Resolve the weighting rule for the points to be fitted; returns σ per point or undefined (OLS). */
function resolveWeighting(
  fitted: readonly PreparedMeasurement[],
  weighting: EyringWeighting,
  warnings: Warning[],
): { mode: SigmaMode; sigma: number[] | undefined } {
  return resolveWeightingOf(
    fitted.length,
    (k) => fitted[k]!.measurement.sigmaLnR,
    (k) => fitted[k]!.index,
    weighting,
    warnings,
  );
}

/** resolveWeighting over `count` runs read through accessors (σ of the k-th, and its index in the request). */
export function resolveWeightingOf(
  count: number,
  sigmaOf: (k: number) => number | undefined,
  indexOf: (k: number) => number,
  weighting: EyringWeighting,
  warnings: Warning[],
): { mode: SigmaMode; sigma: number[] | undefined } {
  if (weighting === 'none') return { mode: 'none', sigma: undefined };
  let withSigma = 0;
  let firstMissing = -1;
  for (let k = 0; k < count; k++) {
    if (sigmaOf(k) !== undefined) withSigma++;
    else if (firstMissing < 0) firstMissing = k;
  }
  const sigmas = () => {
    const out = new Array<number>(count);
    for (let k = 0; k < count; k++) out[k] = sigmaOf(k)!;
    return out;
  };
  if (weighting === 'auto') {
    if (withSigma === count && withSigma > 0) {
      return { mode: 'relative', sigma: sigmas() };
    }
    if (withSigma > 0) {
      warnings.push({
        code: 'partial-sigma-ignored',
        message: 'Only some runs carry an assay uncertainty, so the fit is unweighted; give σ for every run to weight it.',
      });
    }
    return { mode: 'none', sigma: undefined };
  }
  if (firstMissing >= 0) {
    throw new DomainError(
      'sigma-missing',
      `weighting '${weighting}' needs sigmaLnR on every fitted run`,
      `measurements[${indexOf(firstMissing)}].sigmaLnR`,
    );
  }
  return { mode: weighting, sigma: sigmas() };
}

/** Two-sided quantile for a least-squares line: normal with absolute σ, else Student t on n − 2 dof. */
function leastSquaresQuantile(line: LineFit): (level: number) => number {
  return (level) => {
    const p = (1 + level) / 2;
    return line.sigmaMode === 'absolute' ? normalQuantile(p) : studentTQuantile(p, line.dof);
  };
}

/** ΔΔH‡, ΔΔS‡, their SEs and CIs from a line's (a, b) and covariance. */
function activationFromLine(intercept: number, slope: number, cov: LineModel['covariance'], q: number | null): ActivationEstimates {
  const ddHJPerMol = R * slope;
  const ddSJPerMolK = -R * intercept;
  if (!cov || q === null) {
    return { ddHJPerMol, ddSJPerMolK, ddHSeJPerMol: null, ddSSeJPerMolK: null, ddHCiJPerMol: null, ddSCiJPerMolK: null };
  }
  const ddHSeJPerMol = R * Math.sqrt(cov.slopeSlope);
  const ddSSeJPerMolK = R * Math.sqrt(cov.interceptIntercept);
  return {
    ddHJPerMol,
    ddSJPerMolK,
    ddHSeJPerMol,
    ddSSeJPerMolK,
    ddHCiJPerMol: [ddHJPerMol - q * ddHSeJPerMol, ddHJPerMol + q * ddHSeJPerMol],
    ddSCiJPerMolK: [ddSJPerMolK - q * ddSSeJPerMolK, ddSJPerMolK + q * ddSSeJPerMolK],
  };
}

/**
 * A value above its limit and the limit, written with the fewest significant digits (at least
 * `digits`) that show the value is the larger: on a screen of 500 runs the leverage limit 2p/n is
 * 0.008, which fixed decimals would print as 0.00 beside a flagged run's own 0.00.
 */
function aboveLimit(value: number, limit: number, digits = 2): [string, string] {
  for (let p = digits; p < 12; p++) {
    const shown = value.toPrecision(p);
    const shownLimit = limit.toPrecision(p);
    if (Number(shown) > Number(shownLimit)) return [shown, shownLimit];
  }
  return [String(value), String(limit)];
}

/** One line on why a run is flagged; it never recommends excluding the run. */
function flagReason(flags: PointFlag[], ext: number | null, leverage: number, limit: number, cook: number | null): string | null {
  if (flags.length === 0) return null;
  const parts: string[] = [];
  if (flags.includes('outlier')) {
    const [shown] = aboveLimit(Math.abs(ext!), FLAG_RULES.outlierStudentized);
    parts.push(`it sits ${shown} studentized residuals from the line (flagged above ${FLAG_RULES.outlierStudentized})`);
  }
  if (flags.includes('high-leverage')) {
    const [shown, shownLimit] = aboveLimit(leverage, limit);
    parts.push(`its temperature is far from the others, so it steers the slope (leverage ${shown} > ${shownLimit})`);
  }
  if (flags.includes('influential')) {
    const [shown] = aboveLimit(cook!, FLAG_RULES.cooksDistance);
    parts.push(`leaving it out would move the line noticeably (Cook's distance ${shown} > ${FLAG_RULES.cooksDistance})`);
  }
  const text = parts.join('; ');
  return `${text.charAt(0).toUpperCase()}${text.slice(1)}. Check its record (assay, temperature log) rather than drop it.`;
}

/**
 * Confidence set for T₀ = ΔΔH‡/ΔΔS‡ = b/(−a) by Fieller's theorem (Fieller 1954), with N = b,
 * D = −a, Var(N) = Var(b), Var(D) = Var(a), Cov(N, D) = −Cov(a, b); kept to T > 0.
 */
function zeroSelectivitySet(model: LineModel, q: number): ZeroSelectivityInterval | null {
  const cov = model.covariance;
  if (!cov) return null;
  const set = fiellerInterval(model.slope, -model.intercept, cov.slopeSlope, cov.interceptIntercept, -cov.interceptSlope, q);
  const positive = (lo: number | null, hi: number | null) =>
    hi !== null && hi <= 0 ? null : { fromK: lo === null || lo <= 0 ? null : lo, toK: hi };
  const ranges =
    set.kind === 'bounded'
      ? [positive(set.low, set.high)]
      : set.kind === 'outside'
        ? [positive(null, set.below), positive(set.above, null)]
        : [positive(null, null)];
  const kept = ranges.filter((r): r is { fromK: number | null; toK: number | null } => r !== null);
  const bounded = kept.length === 1 && kept[0]!.toK !== null;
  const k = (v: number) => `${v.toFixed(0)} K`;
  let message: string;
  if (set.kind === 'everything') message = 'The data put no limit on T₀ at all: selectivity may vanish at any temperature, or never.';
  else if (bounded) message = `T₀ lies between ${kept[0]!.fromK === null ? '0 K' : k(kept[0]!.fromK)} and ${k(kept[0]!.toK!)} (Fieller).`;
  else
    message = `The interval for T₀ is unbounded (Fieller): ${kept
      .map((r) => (r.toK === null ? `above ${r.fromK === null ? '0 K' : k(r.fromK)}` : `below ${k(r.toK)}`))
      .join(' or ')}; the data cannot rule out that selectivity never vanishes.`;
  return { ranges: kept, bounded, message };
}

/**
 * Differential Eyring fit (api/science/README.md §3): ln r = a + b/T by OLS or WLS; ΔΔH‡ = R·b, ΔΔS‡ = −R·a,
 * SE(ΔΔH‡) = R·SE(b), SE(ΔΔS‡) = R·SE(a), Cov(ΔΔH‡, ΔΔS‡) = −R²·Cov(a, b), CI = estimate ± t·SE.
 *
 * Rules: fewer than 2 distinct fitted temperatures → DomainError 'too-few-temperatures';
 * exactly 2 points → exact line and a warning; fewer than 3 distinct temperatures → no intervals;
 * fewer than 5 points → warning; |ee| ≥ limit or a reported bound → censored: fitted by
 * censored-normal maximum likelihood (censored.ts) with the least-squares fit of the exact runs
 * beside it; excluded runs kept and marked; residual flags per FLAG_RULES (none below 3 residual
 * dof), never dropped; span < 40 K → warning; T₀ with a Fieller interval.
 */
export function fitEyring(measurements: readonly EyringMeasurement[], options: EyringFitOptions = {}): EyringFit {
  const confidenceLevel = requireConfidenceLevel(options.confidenceLevel ?? 0.95);
  const narrowSpanK = options.narrowSpanK ?? DEFAULT_NARROW_SPAN_K;
  const columns = prepareColumns(measurements, options.censorEePercent ?? DEFAULT_CENSOR_EE_PERCENT, options.censorLnRatio);
  const warnings: Warning[] = [];
  const total = measurements.length;
  // Request positions of the fitted and the censored runs, in request order.
  const fitted = runsWithStatus(columns, FITTED);
  const censored = runsWithStatus(columns, CENSORED);
  // A typed array sorts numerically in native code; a comparator closure is ~10× slower at 10⁶ runs.
  // Filled by a loop: Float64Array.from with a map function goes through the iterator protocol.
  const [temps, xs, ys] = float64Columns(fitted.length, 3);
  for (let i = 0; i < fitted.length; i++) temps[i] = measurements[fitted[i]!]!.temperatureK;
  temps.sort();
  const distinct = countDistinct(temps);
  if (distinct < 2) {
    const skipped = total - fitted.length;
    throw new DomainError(
      'too-few-temperatures',
      `a fit needs runs at two or more distinct temperatures${skipped > 0 ? ` (${runsWord(skipped)} excluded or censored)` : ''}`,
      'measurements',
    );
  }
  const weighting = options.weighting ?? 'auto';
  const { mode, sigma } = resolveWeightingOf(
    fitted.length,
    (k) => measurements[fitted[k]!]!.sigmaLnR,
    (k) => fitted[k]!,
    weighting,
    warnings,
  );
  for (let i = 0; i < fitted.length; i++) {
    xs[i] = columns.x[fitted[i]!]!;
    ys[i] = columns.y[fitted[i]!]!;
  }
  const line = fitLine(xs, ys, sigma ? { sigma, sigmaMode: mode as 'relative' | 'absolute' } : {});
  const n = fitted.length;
  const intervalsAvailable = distinct >= 3 && line.covariance !== null;
  const tMin = temps[0]!;
  const tMax = temps[temps.length - 1]!;
  const lsModel = lineModelFromLeastSquares(line, leastSquaresQuantile(line));

  if (n === 2) {
    warnings.push({
      code: 'two-points-exact',
      message: 'Two runs define the line exactly: there is no estimate of scatter and no interval.',
    });
  }
  if (distinct < 3 && n > 2) {
    warnings.push({
      code: 'fewer-than-three-temperatures',
      message: 'Only two distinct temperatures: curvature cannot be checked, so no intervals are given.',
    });
  }
  if (n < 5) {
    warnings.push({
      code: 'few-points',
      message: `Only ${n} runs are fitted: intervals are wide and a single bad run can move the line a lot; 5 or more temperatures are advisable.`,
    });
  }
  // Compared with a tolerance: −40…0 °C is 40 K although 273.15 − 233.15 rounds to 39.99999999999997.
  if (tMax - tMin < narrowSpanK - 1e-6) {
    warnings.push({
      code: 'narrow-temperature-span',
      message: `The screen spans ${(tMax - tMin).toFixed(1)} K; below about ${narrowSpanK} K ΔΔH‡ and ΔΔS‡ are poorly determined and strongly correlated.`,
    });
  }

  // Censored runs: censored-normal maximum likelihood over exact runs and bounds together.
  let model: LineModel = lsModel;
  let estimator: EyringFit['estimator'] = 'least-squares';
  let censoredFit: EyringFit['censoredFit'] = null;
  if (censored.length > 0) {
    const used = [...fitted, ...censored].map((i) => preparedAt(columns, measurements, i));
    const tobitWeights = resolveWeighting(used, weighting, []);
    try {
      const tobit = fitCensoredLine(
        used.map((p) => p.x),
        used.map((p) => p.y),
        used.map((p): CensorKind => p.censoredBound ?? 'none'),
        used.map((p) => p.censorPoint ?? p.y),
        tobitWeights.sigma ? { sigma: tobitWeights.sigma, sigmaMode: tobitWeights.mode as 'relative' | 'absolute' } : {},
      );
      const scaleEstimated = tobitWeights.mode !== 'absolute';
      const s2 = tobit.scale * tobit.scale;
      const meanV2 = tobitWeights.sigma ? tobitWeights.sigma.reduce((acc, v) => acc + v * v, 0) / tobitWeights.sigma.length : 1;
      const cov = tobit.covariance;
      model = {
        intercept: tobit.intercept,
        slope: tobit.slope,
        covariance: intervalsAvailable ? cov : null,
        quantile: (level) => {
          if (!intervalsAvailable) return null;
          const p = (1 + level) / 2;
          return scaleEstimated ? studentTQuantile(p, tobit.nExact - 2) : normalQuantile(p);
        },
        screenRunVariance: intervalsAvailable ? s2 * meanV2 : null,
        assayVarianceScale: tobitWeights.mode === 'none' ? null : tobitWeights.mode === 'absolute' ? 1 : s2,
        varianceOfMean: (x0) =>
          intervalsAvailable ? Math.max(0, cov.interceptIntercept + 2 * x0 * cov.interceptSlope + x0 * x0 * cov.slopeSlope) : null,
      };
      estimator = 'censored-ml';
      censoredFit = {
        logLikelihood: tobit.logLikelihood,
        iterations: tobit.iterations,
        scale: tobit.scale,
        nLower: tobit.nLower,
        nUpper: tobit.nUpper,
      };
    } catch (err) {
      if (!(err instanceof DomainError)) throw err;
      warnings.push({
        code: 'censored-fit-unavailable',
        message: `The runs reported as bounds could not be fitted by censored maximum likelihood (${err.message}); the estimates use the exact runs only and are biased towards lower selectivity.`,
      });
    }
  }

  // Per-point results; diagnostics come from the least-squares fit of the exact runs.
  const slope = model.slope;
  const intercept = model.intercept;
  const leverageLimit = highLeverageLimit(n);
  const canFlag = line.dof >= FLAG_RULES.minimumDof;
  // Residual diagnostics of fitted run k as bits (no allocation: the warnings below count them for
  // every run, while the per-run objects are built only when read).
  const OUTLIER = 1;
  const HIGH_LEVERAGE = 2;
  const INFLUENTIAL = 4;
  const EXCUSED_BY_ASSAY = 8;
  const diagnose = (k: number, sigmaLnR: number | undefined): number =>
    diagnoseWith(k, sigmaLnR, line.studentizedExternalAt(k), line.cooksDistanceAt(k));
  const diagnoseWith = (k: number, sigmaLnR: number | undefined, ext: number | null, cook: number | null): number => {
    if (!canFlag) return 0;
    let bits = 0;
    if (ext !== null && Math.abs(ext) > FLAG_RULES.outlierStudentized) {
      const explainedByAssay = sigmaLnR !== undefined && Math.abs(line.residuals[k]!) / sigmaLnR <= FLAG_RULES.assaySigmas;
      bits |= explainedByAssay ? EXCUSED_BY_ASSAY : OUTLIER;
    }
    if (line.leverages[k]! > leverageLimit) bits |= HIGH_LEVERAGE;
    if (cook !== null && cook > FLAG_RULES.cooksDistance) bits |= INFLUENTIAL;
    return bits;
  };
  let flagged = 0;
  let disagreeing = 0;
  let withinAssay = 0;
  for (let k = 0; k < n; k++) {
    const bits = diagnose(k, measurements[fitted[k]!]!.sigmaLnR);
    if (bits & EXCUSED_BY_ASSAY) withinAssay++;
    if (bits & (OUTLIER | HIGH_LEVERAGE | INFLUENTIAL)) flagged++;
  }
  for (const i of censored) {
    const lineY = intercept + slope * columns.x[i]!;
    // Same test as each point's boundConsistent below: a lower bound agrees when the line reaches it, an upper one when it stays under.
    if (columns.bound[i] === 1 ? !(lineY >= columns.censorPoint[i]!) : !(lineY <= columns.censorPoint[i]!)) disagreeing++;
  }

  // Per-run results, built on first read: at 10⁶ runs these objects, not the fit, would dominate the
  // time and the garbage collector.
  const materialisePoints = (): EyringPointResult[] => {
    // Position of each run in the fitted arrays (−1: not fitted); a typed array, not a Map, for 10⁶ runs.
    const fittedIndex = int32Column(total).fill(-1);
    for (let i = 0; i < fitted.length; i++) fittedIndex[fitted[i]!] = i;
    // Read from the columns, each diagnostic computed once per run (no intermediate object per run).
    return measurements.map((m, index) => {
      const x = columns.x[index]!;
      const y = columns.y[index]!;
      const bound = columns.bound[index]!;
      const censorPoint = bound === 0 ? null : columns.censorPoint[index]!;
      const status = STATUS_NAMES[columns.status[index]!]!;
      const lineY = intercept + slope * x;
      const k = fittedIndex[index]!;
      const flags: PointFlag[] = [];
      let reason: string | null = null;
      let inAssaySigmas: number | null = null;
      let residual: number | null = null;
      let leverage: number | null = null;
      let internal: number | null = null;
      let ext: number | null = null;
      let cook: number | null = null;
      if (k >= 0) {
        residual = line.residuals[k]!;
        leverage = line.leverages[k]!;
        internal = line.studentizedInternalAt(k);
        ext = line.studentizedExternalAt(k);
        cook = line.cooksDistanceAt(k);
        const bits = diagnoseWith(k, m.sigmaLnR, ext, cook);
        if (bits & OUTLIER) flags.push('outlier');
        if (bits & HIGH_LEVERAGE) flags.push('high-leverage');
        if (bits & INFLUENTIAL) flags.push('influential');
        inAssaySigmas = m.sigmaLnR === undefined ? null : Math.abs(residual) / m.sigmaLnR;
        reason = flagReason(flags, ext, leverage, leverageLimit, cook);
      }
      return {
        index,
        label: m.label ?? null,
        temperatureK: m.temperatureK,
        inverseTemperaturePerK: x,
        ratio: m.ratio,
        lnRatio: y,
        eePercent: eeFromLnRatio(y),
        sigmaLnR: m.sigmaLnR ?? null,
        status,
        exclusionReason: status === 'excluded' ? (m.exclusionReason ?? null) : null,
        lineLnRatio: lineY,
        residual,
        leverage,
        studentizedInternal: internal,
        studentizedExternal: ext,
        cooksDistance: cook,
        flags,
        flagReason: reason,
        residualInAssaySigmas: inAssaySigmas,
        withinAssayPrecision: inAssaySigmas === null ? null : inAssaySigmas <= FLAG_RULES.assaySigmas,
        censoredBound: bound === 1 ? 'lower' : bound === -1 ? 'upper' : null,
        censorLnRatio: censorPoint,
        // A lower bound agrees when the line reaches it, an upper one when the line stays under it.
        boundConsistent: bound === 1 ? lineY >= censorPoint! : bound === -1 ? lineY <= censorPoint! : null,
      };
    });
  };

  const nExcluded = total - fitted.length - censored.length;
  const nCensored = censored.length;
  if (nExcluded > 0) {
    warnings.push({
      code: 'excluded-points',
      message: `${runsWord(nExcluded)} excluded by the user ${nExcluded === 1 ? 'is' : 'are'} shown but not fitted.`,
    });
  }
  if (nCensored > 0) {
    warnings.push({
      code: 'censored-points',
      message:
        estimator === 'censored-ml'
          ? `${runsWord(nCensored)} at or beyond the assay's quantitation limit ${nCensored === 1 ? 'is a bound, not an exact value' : 'are bounds, not exact values'}: the line is fitted by censored maximum likelihood (Tobit), with the least-squares fit of the exact runs shown beside it.`
          : `${runsWord(nCensored)} at or beyond the assay's quantitation limit ${nCensored === 1 ? 'is' : 'are'} treated as bounds, not exact values, and kept out of the fit.`,
    });
  }
  if (disagreeing > 0) {
    warnings.push({
      code: 'censored-bound-disagrees',
      message: `The fitted line falls short of the quantitation limit at ${runsWord(disagreeing)} reported beyond it: the model may be wrong at those temperatures.`,
    });
  }
  if (!canFlag && n > 2) {
    warnings.push({
      code: 'too-few-runs-to-flag',
      message: `With ${line.dof} residual ${line.dof === 1 ? 'degree' : 'degrees'} of freedom no run is flagged: too few runs to tell an odd run from ordinary scatter.`,
    });
  }
  if (withinAssay > 0) {
    warnings.push({
      code: 'residuals-within-assay',
      message: `${runsWord(withinAssay)} ${withinAssay === 1 ? 'stands' : 'stand'} out against the others' scatter but ${withinAssay === 1 ? 'lies' : 'lie'} within ${FLAG_RULES.assaySigmas} SDs of the assay's own precision, so ${withinAssay === 1 ? 'it is' : 'they are'} not called an outlier.`,
    });
  }
  if (flagged > 0) {
    warnings.push({
      code: 'flagged-points',
      message: `${runsWord(flagged)} ${flagged === 1 ? 'is' : 'are'} flagged by residual diagnostics (|studentized| > 3, leverage > 4/n or Cook's D > 1); each says why. They are still fitted: a flag asks for a second look at the run's record, not for its removal.`,
    });
  }

  // Weighted fits: does the scatter match the stated precision?
  const precisionCheck = line.sigmaMode === 'none' ? null : checkStatedPrecision(line.ssRes, line.dof, line.sigmaMode);
  if (precisionCheck && precisionCheck.verdict !== 'consistent') {
    warnings.push({ code: 'stated-precision-mismatch', message: precisionCheck.message });
  }

  const q = model.quantile(confidenceLevel);
  const act = activationFromLine(intercept, slope, intervalsAvailable ? model.covariance : null, q);
  const cov = intervalsAvailable && model.covariance ? -R * R * model.covariance.interceptSlope : null;
  const corrDenom = model.covariance ? Math.sqrt(model.covariance.slopeSlope * model.covariance.interceptIntercept) : 0;
  const corr = intervalsAvailable && model.covariance && corrDenom > 0 ? -model.covariance.interceptSlope / corrDenom : null;

  let leastSquaresWithoutBounds: LeastSquaresSummary | null = null;
  if (estimator === 'censored-ml') {
    const ls = activationFromLine(
      line.intercept,
      line.slope,
      intervalsAvailable ? line.covariance : null,
      lsModel.quantile(confidenceLevel),
    );
    leastSquaresWithoutBounds = { nFitted: n, ...ls };
  }

  const t0 = zeroSelectivityTemperatureK(act.ddHJPerMol, act.ddSJPerMolK);
  const t0Interval = t0 !== null && q !== null ? zeroSelectivitySet(model, q) : null;
  const requested = options.requestedRangeK ?? rangeOf(options.predictAtK);
  const outside = (t: number, r: { min: number; max: number } | null) => !r || t < r.min - 1e-9 || t > r.max + 1e-9;
  const zeroSelectivityFar = t0 !== null && outside(t0, { min: tMin, max: tMax }) && (requested === null || outside(t0, requested));
  if (t0 !== null && zeroSelectivityFar) {
    warnings.push({
      code: 'zero-selectivity-extrapolated',
      message: `Selectivity would vanish at T₀ ≈ ${t0.toFixed(0)} K, outside the screened ${tMin.toFixed(0)}–${tMax.toFixed(0)} K${requested ? ' and the temperatures asked about' : ''}: a far extrapolation of a straight line.`,
    });
  }
  if (t0Interval && !t0Interval.bounded) {
    warnings.push({ code: 'zero-selectivity-unbounded', message: t0Interval.message });
  }

  const fit = withLazyPoints(materialisePoints, {
    convention: SIGN_CONVENTION,
    confidenceLevel,
    weighting: mode,
    nFitted: n,
    nExcluded,
    nCensored,
    distinctTemperatures: distinct,
    temperatureRangeK: { min: tMin, max: tMax },
    ...act,
    ddHDdSCovariance: cov,
    ddHDdSCorrelation: corr,
    slopeK: slope,
    intercept,
    residualSdLnR: estimator === 'censored-ml' && line.sigmaMode === 'none' ? censoredFit!.scale : line.residualSd,
    rSquared: line.rSquared,
    dof: line.dof,
    zeroSelectivityTemperatureK: t0,
    zeroSelectivityInterval: t0Interval,
    zeroSelectivityFar,
    intervalsAvailable,
    estimator,
    leastSquaresWithoutBounds,
    censoredFit,
    precisionCheck,
    newRunBasis: options.newRun ? { source: 'assay', precision: options.newRun } : { source: 'screen-scatter' },
    predictions: [],
    warnings,
    line,
    model,
  });
  if (options.newRun) sigmaLnRatioAt(options.newRun, 0); // validate once, before any prediction
  if (options.predictAtK && options.predictAtK.length > 0) {
    fit.predictions = predictEyring(fit, options.predictAtK, confidenceLevel);
    const outsideCount = fit.predictions.filter((p) => p.extrapolated).length;
    if (outsideCount > 0) warnings.push(extrapolationWarning(fit, outsideCount));
    const lost = fit.predictions.filter((p) => p.outOfRange).length;
    if (lost > 0) {
      warnings.push({
        code: 'prediction-out-of-range',
        message: `${lost} ${lost === 1 ? 'prediction lies' : 'predictions lie'} so far from the data that r itself cannot be written as a number; ln r and ΔΔG‡ are given and ee is shown saturated. The rest of the fit is unaffected.`,
      });
    }
  }
  return fit;
}

const BUILD_POINTS = Symbol('build points');
const POINTS = Symbol('points');
interface PointsSource {
  [BUILD_POINTS]: () => EyringPointResult[];
  [POINTS]?: EyringPointResult[];
}
/**
 * The prototype of every fit: its per-run results, built on first read (or set). One accessor for
 * all fits; an object literal's own getter is an accessor pair that V8 allocates in the old
 * generation, and through its closure it kept each fit's columns, line and runs alive across every
 * young-generation collection until the next full one (about 35 kB promoted per fit of 50 runs).
 */
const lazyPoints = {
  get points(): EyringPointResult[] {
    const self = this as unknown as PointsSource;
    return (self[POINTS] ??= self[BUILD_POINTS]());
  },
  set points(value: EyringPointResult[]) {
    (this as unknown as PointsSource)[POINTS] = value;
  },
};

/**
 * A fit from its fields and the builder of its per-run results: the fields' own literal, given the
 * prototype above. Copying 34 fields onto a class instance (Object.assign) made every fit a
 * dictionary-mode object, whose every property read is a hash lookup.
 */
function withLazyPoints(build: () => EyringPointResult[], fields: Omit<EyringFit, 'points'>): EyringFit {
  (fields as Omit<EyringFit, 'points'> & PointsSource)[BUILD_POINTS] = build;
  return Object.setPrototypeOf(fields, lazyPoints) as EyringFit;
}

function rangeOf(values: readonly number[] | undefined): { min: number; max: number } | null {
  if (!values || values.length === 0) return null;
  let min = Infinity;
  let max = -Infinity;
  for (const v of values) {
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return Number.isFinite(min) && Number.isFinite(max) ? { min, max } : null;
}

function extrapolationWarning(fit: EyringFit, count: number): Warning {
  return {
    code: 'extrapolation',
    message: `${count} ${count === 1 ? 'prediction lies' : 'predictions lie'} outside the screened ${describeTemperatureK(fit.temperatureRangeK.min)} to ${describeTemperatureK(fit.temperatureRangeK.max)}; ${count === 1 ? 'it assumes' : 'they assume'} the same straight line continues, which a change of mechanism would break.`,
  };
}

/**
 * ΔΔG‡(T) = ΔΔH‡ − T·ΔΔS‡ = RT·ŷ(1/T), SE = RT·SE_mean(ŷ at 1/T) from the full covariance (api/science/README.md §3).
 */
export function ddGAtTemperature(
  fit: EyringFit,
  temperatureK: number,
  confidenceLevel = fit.confidenceLevel,
): { temperatureK: number; ddGJPerMol: number; seJPerMol: number | null; ciJPerMol: [number, number] | null } {
  requireTemperatureK(temperatureK, 'temperatureK');
  const x0 = 1 / temperatureK;
  const yHat = fit.model.intercept + fit.model.slope * x0;
  const rt = R * temperatureK;
  const v = fit.intervalsAvailable ? fit.model.varianceOfMean(x0) : null;
  const q = fit.intervalsAvailable ? fit.model.quantile(confidenceLevel) : null;
  const se = v === null ? null : Math.sqrt(v);
  return {
    temperatureK,
    ddGJPerMol: rt * yHat,
    seJPerMol: se === null ? null : rt * se,
    ciJPerMol: se === null || q === null ? null : [rt * (yHat - q * se), rt * (yHat + q * se)],
  };
}

/**
 * Predict selectivity at each temperature with the CI of the mean line and the prediction
 * interval for a new run (see line-model.ts: the fit's uncertainty plus the new run's own
 * measurement error, σ propagated at the predicted value when the assay's precision is known),
 * mapped to r = e^y, ee = tanh(y/2), %A = 100/(1 + e^(−y)); all three maps are increasing, so
 * interval ends map to ends. A temperature so far out that r overflows is marked outOfRange
 * rather than failing the whole fit.
 */
export function predictEyring(fit: EyringFit, temperaturesK: readonly number[], confidenceLevel = fit.confidenceLevel): EyringPrediction[] {
  requireConfidenceLevel(confidenceLevel);
  const { min, max } = fit.temperatureRangeK;
  const q = fit.intervalsAvailable ? fit.model.quantile(confidenceLevel) : null;
  const precision = fit.newRunBasis.source === 'assay' ? fit.newRunBasis.precision : null;
  return temperaturesK.map((t, i) => {
    // The field name is built only for an error (a template per temperature was a share of the allocations).
    if (!(t > 0 && Number.isFinite(t))) requireTemperatureK(t, `temperaturesK[${i}]`);
    const x0 = 1 / t;
    const y = fit.model.intercept + fit.model.slope * x0;
    const varMean = q === null ? null : fit.model.varianceOfMean(x0);
    const assaySigma = precision ? sigmaLnRatioAt(precision, y) : null;
    const varNew = q === null ? null : newRunVariance(fit.model, x0, assaySigma);
    const rt = R * t;
    const ratio = ratioFromLn(y);
    const seMean = varMean === null ? null : Math.sqrt(varMean);
    const seNew = varNew === null || !Number.isFinite(varNew) ? null : Math.sqrt(varNew);
    return {
      temperatureK: t,
      celsius: kelvinToCelsius(t),
      lnRatio: y,
      ratio,
      outOfRange: !(ratio > 0 && Number.isFinite(ratio)),
      newRunSigmaLnR: assaySigma !== null && Number.isFinite(assaySigma) ? assaySigma : null,
      eePercent: eeFromLnRatioAndRatio(y, ratio),
      percentA: percentAFromLnRatioAndRatio(y, ratio),
      ddGJPerMol: rt * y,
      ddGSeJPerMol: seMean === null ? null : rt * seMean,
      extrapolated: t < min - 1e-9 || t > max + 1e-9,
      meanInterval: seMean === null || q === null ? null : mapInterval(y - q * seMean, y + q * seMean),
      predictionInterval: seNew === null || q === null ? null : mapInterval(y - q * seNew, y + q * seNew),
    };
  });
}

/** "1 run", "3 runs". */
function runsWord(n: number): string {
  return `${n} ${n === 1 ? 'run' : 'runs'}`;
}
