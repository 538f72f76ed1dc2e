/**
 * Differential Eyring analysis of a temperature screen (DOMAIN §3).
 *
 * Regress y = ln r on x = 1/T: y = a + b·x, so ΔΔH‡ = R·b and ΔΔS‡ = −R·a
 * (from ln r = ΔΔH‡/RT − ΔΔS‡/R). The covariance of (a, b) is kept and used for every derived
 * quantity, because the two estimates are strongly correlated (Krug, Hunter & Grieger,
 * J. Phys. Chem. 1976, 80, 2341).
 */
import { GAS_CONSTANT_J_PER_MOL_K as R } from './constants';
import { DomainError, requireFinite, requireFiniteResult, requireTemperatureK, type Warning } from './errors';
import { zeroSelectivityTemperatureK } from './forecast';
import { fitLine, normalQuantile, predictLine, requireConfidenceLevel, studentTQuantile, type LineFit, type SigmaMode } from './regression';
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
  /** Temperatures at which to predict (same as calling predictEyring). */
  predictAtK?: readonly number[];
  /** Span of temperature below which the screen is called narrow; default 40 K [CP]. */
  narrowSpanK?: number;
}

export type { Warning };

export type PointFlag = 'outlier' | 'high-leverage' | 'influential';

/** Flag thresholds (documented for the UI). */
export const FLAG_RULES = {
  /** |externally studentized residual| above this → 'outlier' (≈ a 3-sigma event). */
  outlierStudentized: 3,
  /** leverage above 2p/n with p = 2 parameters → 'high-leverage' (Hoaglin & Welsch 1978 rule). */
  leverageFactor: 2,
  /** Cook's distance above 1 → 'influential' (Cook & Weisberg 1982 conventional cut-off). */
  cooksDistance: 1,
} as const;

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
  /** For censored points: the measured r is a lower (ee ≥ +limit) or upper (ee ≤ −limit) bound. */
  censoredBound: 'lower' | 'upper' | null;
  /** For censored points: whether the fitted line respects the bound. */
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
  ratio: number;
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

export interface EyringFit {
  convention: string;
  confidenceLevel: number;
  weighting: SigmaMode;
  nFitted: number;
  nExcluded: number;
  nCensored: number;
  distinctTemperatures: number;
  /** Range of fitted temperatures. */
  temperatureRangeK: { min: number; max: number };
  ddHJPerMol: number;
  ddSJPerMolK: number;
  ddHSeJPerMol: number | null;
  ddSSeJPerMolK: number | null;
  ddHCiJPerMol: [number, number] | null;
  ddSCiJPerMolK: [number, number] | null;
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
  /** False with fewer than 3 distinct temperatures (DOMAIN §3). */
  intervalsAvailable: boolean;
  points: EyringPointResult[];
  predictions: EyringPrediction[];
  warnings: Warning[];
  /** The underlying straight-line fit (x = 1/T, y = ln r), over fitted points only. */
  line: LineFit;
}

/** Default censoring limit in ee percent: the usual quantitation limit of chiral chromatography [CP]. */
export const DEFAULT_CENSOR_EE_PERCENT = 99.8;
/** Default span under which a screen is called narrow [CP, DOMAIN §8]. */
export const DEFAULT_NARROW_SPAN_K = 40;

const sameTemperature = (a: number, b: number) => Math.abs(a - b) <= 1e-6;

function countDistinct(sorted: ArrayLike<number>): number {
  let count = 0;
  for (let i = 0; i < sorted.length; i++) if (i === 0 || !sameTemperature(sorted[i]!, sorted[i - 1]!)) count++;
  return count;
}

/** ee (percent) from ln r: 100·tanh(y/2); %A from ln r: 100/(1 + e^(−y)). */
const eeFromLn = (y: number) => 100 * Math.tanh(y / 2);
const percentAFromLn = (y: number) => 100 / (1 + Math.exp(-y));
const ratioFromLn = (y: number) => requireFiniteResult(Math.exp(y), 'ratio');

function mapInterval(lo: number, hi: number): SelectivityInterval {
  return {
    lnRatio: [lo, hi],
    ratio: [ratioFromLn(lo), ratioFromLn(hi)],
    eePercent: [eeFromLn(lo), eeFromLn(hi)],
    percentA: [percentAFromLn(lo), percentAFromLn(hi)],
  };
}

/** Validated and classified measurements, shared with the two-branch fit. */
export interface PreparedMeasurement {
  index: number;
  measurement: EyringMeasurement;
  x: number;
  y: number;
  status: 'fitted' | 'excluded' | 'censored';
  censoredBound: 'lower' | 'upper' | null;
}

/** Validate measurements and split them into fitted, excluded and censored (|ee| ≥ limit). */
export function prepareMeasurements(
  measurements: readonly EyringMeasurement[],
  censorEePercent = DEFAULT_CENSOR_EE_PERCENT,
): PreparedMeasurement[] {
  if (!Array.isArray(measurements)) throw new DomainError('not-a-list', 'measurements must be a list', 'measurements');
  requireFinite(censorEePercent, 'censorEePercent');
  if (!(censorEePercent > 0 && censorEePercent < 100)) {
    throw new DomainError('censor-limit-out-of-range', 'censorEePercent must lie between 0 and 100', 'censorEePercent');
  }
  // r at the limit: (1 + e)/(1 − e); ee 99.8 % ↔ r = 999.
  const e = censorEePercent / 100;
  const lnLimit = Math.log1p(e) - Math.log1p(-e);
  return measurements.map((m, index) => {
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
    let status: PreparedMeasurement['status'] = 'fitted';
    let censoredBound: PreparedMeasurement['censoredBound'] = null;
    if (m.excluded) status = 'excluded';
    else if (m.atLeast) {
      status = 'censored';
      censoredBound = y >= 0 ? 'lower' : 'upper';
    } else if (y >= lnLimit * (1 - 1e-12)) {
      status = 'censored';
      censoredBound = 'lower';
    } else if (y <= -lnLimit * (1 - 1e-12)) {
      status = 'censored';
      censoredBound = 'upper';
    }
    return { index, measurement: m, x: 1 / m.temperatureK, y, status, censoredBound };
  });
}

/** Resolve the weighting rule for the points to be fitted; returns σ per point or undefined (OLS). */
export function resolveWeighting(
  fitted: readonly PreparedMeasurement[],
  weighting: EyringWeighting,
  warnings: Warning[],
): { mode: SigmaMode; sigma: number[] | undefined } {
  const withSigma = fitted.filter((p) => p.measurement.sigmaLnR !== undefined).length;
  if (weighting === 'none') return { mode: 'none', sigma: undefined };
  if (weighting === 'auto') {
    if (withSigma === fitted.length && withSigma > 0) {
      return { mode: 'relative', sigma: fitted.map((p) => p.measurement.sigmaLnR!) };
    }
    if (withSigma > 0) {
      warnings.push({
        code: 'partial-sigma-ignored',
        message: 'Only some runs carry an assay uncertainty, so the fit is unweighted; give σ for every run to weight it.',
      });
    }
    return { mode: 'none', sigma: undefined };
  }
  const missing = fitted.find((p) => p.measurement.sigmaLnR === undefined);
  if (missing) {
    throw new DomainError(
      'sigma-missing',
      `weighting '${weighting}' needs sigmaLnR on every fitted run`,
      `measurements[${missing.index}].sigmaLnR`,
    );
  }
  return { mode: weighting, sigma: fitted.map((p) => p.measurement.sigmaLnR!) };
}

function intervalQuantile(line: LineFit, level: number): number {
  const p = (1 + level) / 2;
  return line.sigmaMode === 'absolute' ? normalQuantile(p) : studentTQuantile(p, line.dof);
}

/**
 * Differential Eyring fit (DOMAIN §3): ln r = a + b/T by OLS or WLS; ΔΔH‡ = R·b, ΔΔS‡ = −R·a,
 * SE(ΔΔH‡) = R·SE(b), SE(ΔΔS‡) = R·SE(a), Cov(ΔΔH‡, ΔΔS‡) = −R²·Cov(a, b), CI = estimate ± t·SE.
 *
 * Rules: fewer than 2 distinct fitted temperatures → DomainError 'too-few-temperatures';
 * exactly 2 points → exact line and a warning; fewer than 3 distinct temperatures → no intervals;
 * fewer than 5 points → warning; |ee| ≥ censorEePercent → censored (lower/upper bound, not fitted);
 * excluded runs kept and marked; residual flags per FLAG_RULES, never dropped; span < 40 K → warning.
 */
export function fitEyring(measurements: readonly EyringMeasurement[], options: EyringFitOptions = {}): EyringFit {
  const confidenceLevel = requireConfidenceLevel(options.confidenceLevel ?? 0.95);
  const narrowSpanK = options.narrowSpanK ?? DEFAULT_NARROW_SPAN_K;
  const prepared = prepareMeasurements(measurements, options.censorEePercent ?? DEFAULT_CENSOR_EE_PERCENT);
  const warnings: Warning[] = [];
  const fitted = prepared.filter((p) => p.status === 'fitted');
  // A typed array sorts numerically in native code; a comparator closure is ~10× slower at 10⁶ runs.
  const temps = Float64Array.from(fitted, (p) => p.measurement.temperatureK).sort();
  const distinct = countDistinct(temps);
  if (distinct < 2) {
    const skipped = prepared.length - fitted.length;
    throw new DomainError(
      'too-few-temperatures',
      `a fit needs runs at two or more distinct temperatures${skipped > 0 ? ` (${runsWord(skipped)} excluded or censored)` : ''}`,
      'measurements',
    );
  }
  const { mode, sigma } = resolveWeighting(fitted, options.weighting ?? 'auto', warnings);
  const line = fitLine(
    fitted.map((p) => p.x),
    fitted.map((p) => p.y),
    sigma ? { sigma, sigmaMode: mode as 'relative' | 'absolute' } : {},
  );
  const n = fitted.length;
  const intervalsAvailable = distinct >= 3 && line.covariance !== null;
  const tMin = temps[0]!;
  const tMax = temps[temps.length - 1]!;

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
  if (tMax - tMin < narrowSpanK) {
    warnings.push({
      code: 'narrow-temperature-span',
      message: `The screen spans ${(tMax - tMin).toFixed(1)} K; below about ${narrowSpanK} K ΔΔH‡ and ΔΔS‡ are poorly determined and strongly correlated.`,
    });
  }

  // Per-point results.
  const slope = line.slope;
  const intercept = line.intercept;
  // Position of each run in the fitted arrays (−1: not fitted); a typed array, not a Map, for 10⁶ runs.
  const fittedIndex = new Int32Array(prepared.length).fill(-1);
  fitted.forEach((p, i) => (fittedIndex[p.index] = i));
  const leverageLimit = (FLAG_RULES.leverageFactor * 2) / n;
  let flagged = 0;
  let disagreeing = 0;
  const points: EyringPointResult[] = prepared.map((p) => {
    const m = p.measurement;
    const lineY = intercept + slope * p.x;
    const pos = fittedIndex[p.index]!;
    const k = pos < 0 ? undefined : pos;
    const flags: PointFlag[] = [];
    let boundConsistent: boolean | null = null;
    if (k !== undefined) {
      const ext = line.studentizedExternal[k] ?? null;
      const cook = line.cooksDistance[k] ?? null;
      if (ext !== null && Math.abs(ext) > FLAG_RULES.outlierStudentized) flags.push('outlier');
      if (n > 2 && line.leverages[k]! > leverageLimit) flags.push('high-leverage');
      if (cook !== null && cook > FLAG_RULES.cooksDistance) flags.push('influential');
      if (flags.length > 0) flagged++;
    }
    if (p.censoredBound === 'lower') boundConsistent = lineY >= p.y;
    if (p.censoredBound === 'upper') boundConsistent = lineY <= p.y;
    if (boundConsistent === false) disagreeing++;
    return {
      index: p.index,
      label: m.label ?? null,
      temperatureK: m.temperatureK,
      inverseTemperaturePerK: p.x,
      ratio: m.ratio,
      lnRatio: p.y,
      eePercent: eeFromLn(p.y),
      sigmaLnR: m.sigmaLnR ?? null,
      status: p.status,
      exclusionReason: p.status === 'excluded' ? (m.exclusionReason ?? null) : null,
      lineLnRatio: lineY,
      residual: k === undefined ? null : line.residuals[k]!,
      leverage: k === undefined ? null : line.leverages[k]!,
      studentizedInternal: k === undefined ? null : (line.studentizedInternal[k] ?? null),
      studentizedExternal: k === undefined ? null : (line.studentizedExternal[k] ?? null),
      cooksDistance: k === undefined ? null : (line.cooksDistance[k] ?? null),
      flags,
      censoredBound: p.censoredBound,
      boundConsistent,
    };
  });

  const nExcluded = prepared.filter((p) => p.status === 'excluded').length;
  const nCensored = prepared.filter((p) => p.status === 'censored').length;
  if (nExcluded > 0) {
    warnings.push({ code: 'excluded-points', message: `${runsWord(nExcluded)} excluded by the user ${nExcluded === 1 ? 'is' : 'are'} shown but not fitted.` });
  }
  if (nCensored > 0) {
    warnings.push({
      code: 'censored-points',
      message: `${runsWord(nCensored)} at or beyond the quantitation limit of the chiral assay (|ee| ≥ ${options.censorEePercent ?? DEFAULT_CENSOR_EE_PERCENT} %) ${nCensored === 1 ? 'is' : 'are'} treated as bounds, not exact values, and kept out of the least squares.`,
    });
  }
  if (disagreeing > 0) {
    warnings.push({
      code: 'censored-bound-disagrees',
      message: `The fitted line contradicts ${disagreeing} censored ${disagreeing === 1 ? 'run' : 'runs'}: the model may be wrong at those temperatures.`,
    });
  }
  if (flagged > 0) {
    warnings.push({
      code: 'flagged-points',
      message: `${runsWord(flagged)} ${flagged === 1 ? 'is' : 'are'} flagged by residual diagnostics (|studentized| > 3, leverage > 4/n or Cook's D > 1). They are still fitted; exclude one only with a reason.`,
    });
  }

  const ddHJPerMol = R * slope;
  const ddSJPerMolK = -R * intercept;
  let ddHSe: number | null = null;
  let ddSSe: number | null = null;
  let ddHCi: [number, number] | null = null;
  let ddSCi: [number, number] | null = null;
  let cov: number | null = null;
  let corr: number | null = null;
  if (intervalsAvailable && line.covariance) {
    ddHSe = R * Math.sqrt(line.covariance.slopeSlope);
    ddSSe = R * Math.sqrt(line.covariance.interceptIntercept);
    cov = -R * R * line.covariance.interceptSlope;
    corr = line.interceptSlopeCorrelation === null ? null : -line.interceptSlopeCorrelation;
    const q = intervalQuantile(line, confidenceLevel);
    ddHCi = [ddHJPerMol - q * ddHSe, ddHJPerMol + q * ddHSe];
    ddSCi = [ddSJPerMolK - q * ddSSe, ddSJPerMolK + q * ddSSe];
  }
  const t0 = zeroSelectivityTemperatureK(ddHJPerMol, ddSJPerMolK);
  if (t0 !== null && (t0 < tMin || t0 > tMax)) {
    warnings.push({
      code: 'zero-selectivity-extrapolated',
      message: `Selectivity would vanish at T₀ ≈ ${t0.toFixed(0)} K, outside the screened ${tMin.toFixed(0)}–${tMax.toFixed(0)} K: a far extrapolation of a straight line.`,
    });
  }

  const fit: EyringFit = {
    convention: SIGN_CONVENTION,
    confidenceLevel,
    weighting: mode,
    nFitted: n,
    nExcluded,
    nCensored,
    distinctTemperatures: distinct,
    temperatureRangeK: { min: tMin, max: tMax },
    ddHJPerMol,
    ddSJPerMolK,
    ddHSeJPerMol: ddHSe,
    ddSSeJPerMolK: ddSSe,
    ddHCiJPerMol: ddHCi,
    ddSCiJPerMolK: ddSCi,
    ddHDdSCovariance: cov,
    ddHDdSCorrelation: corr,
    slopeK: slope,
    intercept,
    residualSdLnR: line.residualSd,
    rSquared: line.rSquared,
    dof: line.dof,
    zeroSelectivityTemperatureK: t0,
    intervalsAvailable,
    points,
    predictions: [],
    warnings,
    line,
  };
  if (options.predictAtK && options.predictAtK.length > 0) {
    fit.predictions = predictEyring(fit, options.predictAtK, confidenceLevel);
    const outside = fit.predictions.filter((p) => p.extrapolated).length;
    if (outside > 0) warnings.push(extrapolationWarning(fit, outside));
  }
  return fit;
}

function extrapolationWarning(fit: EyringFit, count: number): Warning {
  return {
    code: 'extrapolation',
    message: `${count} prediction(s) lie outside the screened ${describeTemperatureK(fit.temperatureRangeK.min)} to ${describeTemperatureK(fit.temperatureRangeK.max)}; they assume the same straight line continues, which a change of mechanism would break.`,
  };
}

/**
 * ΔΔG‡(T) = ΔΔH‡ − T·ΔΔS‡ = RT·ŷ(1/T), SE = RT·SE_mean(ŷ at 1/T) from the full covariance (DOMAIN §3).
 */
export function ddGAtTemperature(
  fit: EyringFit,
  temperatureK: number,
  confidenceLevel = fit.confidenceLevel,
): { temperatureK: number; ddGJPerMol: number; seJPerMol: number | null; ciJPerMol: [number, number] | null } {
  requireTemperatureK(temperatureK, 'temperatureK');
  const pred = predictLine(fit.line, 1 / temperatureK, confidenceLevel);
  const rt = R * temperatureK;
  const usable = fit.intervalsAvailable && pred.seMean !== null && pred.meanInterval !== null;
  return {
    temperatureK,
    ddGJPerMol: rt * pred.yHat,
    seJPerMol: usable ? rt * pred.seMean! : null,
    ciJPerMol: usable ? [rt * pred.meanInterval![0], rt * pred.meanInterval![1]] : null,
  };
}

/**
 * Predict selectivity at each temperature with the CI of the mean line and the prediction
 * interval for a new run (DOMAIN §3), mapped to r = e^y, ee = tanh(y/2), %A = 100/(1 + e^(−y));
 * all three maps are increasing, so interval ends map to ends.
 */
export function predictEyring(fit: EyringFit, temperaturesK: readonly number[], confidenceLevel = fit.confidenceLevel): EyringPrediction[] {
  requireConfidenceLevel(confidenceLevel);
  const { min, max } = fit.temperatureRangeK;
  return temperaturesK.map((t, i) => {
    requireTemperatureK(t, `temperaturesK[${i}]`);
    const pred = predictLine(fit.line, 1 / t, confidenceLevel);
    const y = pred.yHat;
    const usable = fit.intervalsAvailable && pred.meanInterval !== null && pred.predictionInterval !== null;
    const rt = R * t;
    return {
      temperatureK: t,
      celsius: kelvinToCelsius(t),
      lnRatio: y,
      ratio: ratioFromLn(y),
      eePercent: eeFromLn(y),
      percentA: percentAFromLn(y),
      ddGJPerMol: rt * y,
      ddGSeJPerMol: usable ? rt * pred.seMean! : null,
      extrapolated: t < min - 1e-9 || t > max + 1e-9,
      meanInterval: usable ? mapInterval(pred.meanInterval![0], pred.meanInterval![1]) : null,
      predictionInterval: usable ? mapInterval(pred.predictionInterval![0], pred.predictionInterval![1]) : null,
    };
  });
}

/** "1 run", "3 runs". */
function runsWord(n: number): string {
  return `${n} ${n === 1 ? 'run' : 'runs'}`;
}
