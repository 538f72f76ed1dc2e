/**
 * The main reaction's rate across temperature from a campaign's own runs (conversion reached after
 * a time at a temperature): one rate constant per run, then the Eyring–Polanyi line
 * ln(k/T) = ln(k_B/h) + ΔS‡/R − ΔH‡/(R·T) fitted by least squares on 1/T
 * (Eyring, J. Chem. Phys. 1935, 3, 107), κ = 1.
 */
import { BOLTZMANN_OVER_PLANCK_PER_K_S, GAS_CONSTANT_J_PER_MOL_K as R } from './constants';
import { DomainError, requireFinite, type Warning } from './errors';
import { fitLine, studentTQuantile, type LineFit } from './regression';
import { rateConstantFromRun, timeToConversionS, type KineticRun, type KineticSetup } from './rate';

/** Runs below this conversion are flagged by default: their rate and selectivity may not represent the whole reaction [CP]. */
export const DEFAULT_LOW_CONVERSION = 0.1;

export interface RateRunResult {
  index: number;
  temperatureK: number;
  conversion: number;
  timeS: number;
  k: number;
  lowConversion: boolean;
}

export interface RateFit {
  setup: KineticSetup;
  n: number;
  dof: number;
  hJPerMol: number;
  sJPerMolK: number;
  hSeJPerMol: number | null;
  sSeJPerMolK: number | null;
  runs: RateRunResult[];
  line: LineFit;
  warnings: Warning[];
}

/**
 * Fit ΔH‡ and ΔS‡ of the main reaction from runs (first order by default; pseudo-first and second
 * order as in {@link rateConstantFromRun}). Needs runs at two or more distinct temperatures;
 * uncertainties need three or more runs. Errors name `field`[i].*.
 */
export function fitRateFromRuns(
  runs: readonly KineticRun[],
  setup: KineticSetup = { order: 'first' },
  options: { lowConversion?: number; field?: string } = {},
): RateFit {
  const field = options.field ?? 'runs';
  const low = options.lowConversion ?? DEFAULT_LOW_CONVERSION;
  requireFinite(low, 'lowConversion');
  if (!Array.isArray(runs) || runs.length < 2) throw new DomainError('too-few-runs', `${field} needs at least two runs`, field);
  const results = runs.map((run, index): RateRunResult => {
    const { k } = rateConstantFromRun(run, setup, `${field}[${index}]`);
    return { index, temperatureK: run.temperatureK, conversion: run.conversion, timeS: run.timeS, k, lowConversion: run.conversion < low };
  });
  const temps = new Set(results.map((r) => r.temperatureK.toFixed(6)));
  if (temps.size < 2) throw new DomainError('too-few-temperatures', `${field} must cover two or more distinct temperatures`, field);
  const x = results.map((r) => 1 / r.temperatureK);
  const y = results.map((r) => Math.log(r.k / r.temperatureK));
  const line = fitLine(x, y);
  const lnKbOverH = Math.log(BOLTZMANN_OVER_PLANCK_PER_K_S);
  const warnings: Warning[] = [];
  const flagged = results.filter((r) => r.lowConversion).length;
  if (flagged > 0) {
    warnings.push({
      code: 'low-conversion-runs',
      message: `${flagged} run(s) stopped below ${(low * 100).toFixed(0)} % conversion: their rate and selectivity may not represent the whole reaction.`,
    });
  }
  if (line.slopeSe === null) {
    warnings.push({
      code: 'rate-without-interval',
      message: 'Two runs define the rate line exactly: times are given without an interval.',
    });
  }
  return {
    setup,
    n: line.n,
    dof: line.dof,
    hJPerMol: -R * line.slope,
    sJPerMolK: R * (line.intercept - lnKbOverH),
    hSeJPerMol: line.slopeSe === null ? null : R * line.slopeSe,
    sSeJPerMolK: line.interceptSe === null ? null : R * line.interceptSe,
    runs: results,
    line,
    warnings,
  };
}

/** ln of the central time to the target conversion, in log space so that far temperatures never overflow. */
export function lnTimeToTarget(fit: RateFit, temperatureK: number, targetConversion: number): number {
  const line = fit.line;
  const lnK = Math.log(temperatureK) + line.yMean + line.slope * (1 / temperatureK - line.xMean);
  // t ∝ 1/k for every supported order: the time at k = 1 fixes the constant.
  return Math.log(timeToConversionS(1, targetConversion, fit.setup)) - lnK;
}

export interface TimeToTarget {
  temperatureK: number;
  /** Central estimate. */
  timeS: number;
  /** Confidence interval of the rate line mapped to time (null without scatter). */
  intervalS: [number, number] | null;
  /** SE of ln t from the line (the rate line's mean, not a single batch). */
  seLnTime: number | null;
  dof: number;
}

/**
 * Time to a target conversion at T from the fitted line. For every supported order t ∝ 1/k, so
 * ln t = ln t(k̂) − (ŷ(x₀) − ŷ) and its SE is that of the line at x₀ = 1/T:
 *   Var(ŷ₀) = s²[1/n + (x₀ − x̄)²/Sxx]; interval exp(ln t ± t(ν)·SE).
 */
export function timeToTargetAt(fit: RateFit, temperatureK: number, targetConversion: number, confidenceLevel = 0.95): TimeToTarget {
  const line = fit.line;
  const dx = 1 / temperatureK - line.xMean;
  const timeS = Math.exp(lnTimeToTarget(fit, temperatureK, targetConversion));
  if (line.varianceScale === null) return { temperatureK, timeS, intervalS: null, seLnTime: null, dof: line.dof };
  const se = Math.sqrt(line.varianceScale * (1 / line.sumWeights + (dx * dx) / line.sxx));
  const q = studentTQuantile((1 + confidenceLevel) / 2, line.dof);
  return { temperatureK, timeS, intervalS: [timeS * Math.exp(-q * se), timeS * Math.exp(q * se)], seLnTime: se, dof: line.dof };
}
