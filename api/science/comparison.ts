/**
 * Which of two screens is more selective, and where: the difference of the fitted lines at a
 * temperature with its interval, the probability that one beats the other there, a test of equal
 * slopes (extra sum of squares, any regression text, e.g. Draper & Smith, Applied Regression
 * Analysis) and the crossover temperature with Fieller's interval (Fieller, J. R. Stat. Soc. B 1954,
 * 16, 175). The two screens are independent, so their covariances add.
 */
import { GAS_CONSTANT_J_PER_MOL_K as R } from './constants';
import { DomainError, requireTemperatureK } from './errors';
import type { EyringFit } from './eyring-fit';
import { studentTCdf } from './plan-predictive';
import { studentTQuantile, type LineFit } from './regression';

export interface PairComparison {
  temperatureK: number;
  /** ln r(first) − ln r(second) of the mean lines at T, with its SE, Welch–Satterthwaite dof and interval. */
  differenceLnR: number;
  differenceSe: number;
  dof: number;
  interval: [number, number];
  /** The same difference as ΔΔG‡(first) − ΔΔG‡(second) = RT·Δln r, in J/mol. */
  differenceDdGJPerMol: number;
  differenceDdGIntervalJPerMol: [number, number];
  /** Probability that the first screen's mean selectivity at T exceeds the second's (flat-prior reading of the t distribution). */
  probabilityFirstBetter: number;
  verdict: 'first' | 'second' | 'cannot-tell';
  equalSlopes: { F: number; dof1: number; dof2: number; p: number };
  crossover: Crossover | null;
  note: string;
}

export interface Crossover {
  temperatureK: number;
  /** Fieller interval in K; null ends when unbounded on that side. */
  intervalK: [number | null, number | null];
  bounded: boolean;
  note: string;
}

function lineVariance(line: LineFit, x0: number): number {
  const dx = x0 - line.xMean;
  return line.varianceScale! * (1 / line.sumWeights + (dx * dx) / line.sxx);
}

/** Two-sided upper-tail p of F(1, ν) read directly from the t distribution: p = 2·F_t(−√F). */
function pFromF1(F: number, dof: number): number {
  return 2 * studentTCdf(-Math.sqrt(Math.max(F, 0)), dof);
}

/**
 * Compare two fits at temperatureK. `sensibleK` bounds where a crossover is worth reporting
 * (default: both screens' temperatures widened by 50 K).
 */
export function compareFits(
  first: EyringFit,
  second: EyringFit,
  temperatureK: number,
  options: { confidenceLevel?: number; sensibleK?: [number, number] } = {},
): PairComparison {
  requireTemperatureK(temperatureK, 'temperature');
  const level = options.confidenceLevel ?? 0.95;
  const a = first.line;
  const b = second.line;
  if (a.varianceScale === null || b.varianceScale === null || !first.intervalsAvailable || !second.intervalsAvailable) {
    throw new DomainError(
      'intervals-unavailable',
      'each screen needs runs at three or more distinct temperatures to be compared',
      'campaignIds',
    );
  }
  const x0 = 1 / temperatureK;
  const d = a.yMean + a.slope * (x0 - a.xMean) - (b.yMean + b.slope * (x0 - b.xMean));
  const va = lineVariance(a, x0);
  const vb = lineVariance(b, x0);
  const se = Math.sqrt(va + vb);
  // Welch–Satterthwaite degrees of freedom for a sum of two independent variance estimates.
  const dof = (va + vb) ** 2 / ((va * va) / a.dof + (vb * vb) / b.dof);
  const q = studentTQuantile((1 + level) / 2, dof);
  const interval: [number, number] = [d - q * se, d + q * se];
  const rt = R * temperatureK;
  const probabilityFirstBetter = studentTCdf(d / se, dof);
  const verdict = interval[0] > 0 ? 'first' : interval[1] < 0 ? 'second' : 'cannot-tell';

  // Equal slopes: separate lines (4 parameters) against parallel lines (common slope, 3 parameters).
  const rssSeparate = a.ssRes + b.ssRes;
  const sxy = a.slope * a.sxx + b.slope * b.sxx;
  const rssCommon = a.ssTot + b.ssTot - (sxy * sxy) / (a.sxx + b.sxx);
  const dof2 = a.n + b.n - 4;
  const F = dof2 > 0 && rssSeparate > 0 ? (rssCommon - rssSeparate) / (rssSeparate / dof2) : Infinity;
  const equalSlopes = { F, dof1: 1, dof2, p: dof2 > 0 ? pFromF1(F, dof2) : Number.NaN };

  const crossover = crossoverOf(first, second, level, options.sensibleK);
  const note =
    verdict === 'cannot-tell'
      ? `The data cannot tell these two apart at this temperature: the ${Math.round(level * 100)} % interval of the difference includes zero.`
      : `The ${verdict === 'first' ? 'first' : 'second'} is more selective at this temperature (the ${Math.round(level * 100)} % interval of the difference excludes zero).`;
  return {
    temperatureK,
    differenceLnR: d,
    differenceSe: se,
    dof,
    interval,
    differenceDdGJPerMol: d * rt,
    differenceDdGIntervalJPerMol: [interval[0] * rt, interval[1] * rt],
    probabilityFirstBetter,
    verdict,
    equalSlopes,
    crossover,
    note,
  };
}

/**
 * Crossover x* = −Δa/Δb (x = 1/T) where the two lines meet. Fieller: the set of x with
 * (Δa + xΔb)² ≤ t²·(V_aa + 2xV_ab + x²V_bb), i.e. A x² + 2B x + C ≤ 0 with A = Δb² − t²V_bb,
 * B = ΔaΔb − t²V_ab, C = Δa² − t²V_aa. Bounded only when A > 0 (the slopes differ clearly).
 */
export function crossoverOf(first: EyringFit, second: EyringFit, level = 0.95, sensibleK?: [number, number]): Crossover | null {
  const a = first.line;
  const b = second.line;
  const da = a.intercept - b.intercept;
  const db = a.slope - b.slope;
  if (db === 0) return null;
  const x = -da / db;
  if (!(x > 0)) return null;
  const t = 1 / x;
  const range = sensibleK ?? [
    Math.min(first.temperatureRangeK.min, second.temperatureRangeK.min) - 50,
    Math.max(first.temperatureRangeK.max, second.temperatureRangeK.max) + 50,
  ];
  if (t < range[0] || t > range[1]) return null;
  const ca = a.covariance!;
  const cb = b.covariance!;
  const vaa = ca.interceptIntercept + cb.interceptIntercept;
  const vbb = ca.slopeSlope + cb.slopeSlope;
  const vab = ca.interceptSlope + cb.interceptSlope;
  const dof = a.dof + b.dof;
  const q = studentTQuantile((1 + level) / 2, dof);
  const q2 = q * q;
  const A = db * db - q2 * vbb;
  const B = da * db - q2 * vab;
  const C = da * da - q2 * vaa;
  const disc = B * B - A * C;
  if (A > 0 && disc >= 0) {
    const r = Math.sqrt(disc);
    const x1 = (-B - r) / A;
    const x2 = (-B + r) / A;
    const lo = Math.min(x1, x2);
    const hi = Math.max(x1, x2);
    if (lo > 0) {
      return {
        temperatureK: t,
        intervalK: [1 / hi, 1 / lo],
        bounded: true,
        note: `Fieller ${Math.round(level * 100)} % interval of the crossover temperature.`,
      };
    }
    return {
      temperatureK: t,
      intervalK: [1 / hi, null],
      bounded: false,
      note: 'The interval reaches beyond any real temperature on the warm side.',
    };
  }
  return {
    temperatureK: t,
    intervalK: [null, null],
    bounded: false,
    note: 'Unbounded interval: the slopes are not clearly different, so where the lines cross is not determined by these data.',
  };
}

/**
 * Runs to add at T to each of two screens before their difference there would be told apart with
 * the given power (two-sided test at 1 − level), assuming the present difference and scatter.
 * Adding m runs at x₀ changes c'M⁻¹c from v to v/(1 + m·w·v) (a rank-one update with f = c).
 */
export function runsToTellApart(
  first: EyringFit,
  second: EyringFit,
  temperatureK: number,
  options: { power?: number; level?: number; maxRuns?: number } = {},
): number | null {
  const level = options.level ?? 0.95;
  const power = options.power ?? 0.8;
  const maxRuns = options.maxRuns ?? 50;
  const cmp = compareFits(first, second, temperatureK, { confidenceLevel: level });
  const x0 = 1 / temperatureK;
  const factor = (line: LineFit) => {
    const dx = x0 - line.xMean;
    return { v: 1 / line.sumWeights + (dx * dx) / line.sxx, c: line.varianceScale!, w: line.sumWeights / line.n };
  };
  const fa = factor(first.line);
  const fb = factor(second.line);
  for (let m = 0; m <= maxRuns; m++) {
    const va = (fa.c * fa.v) / (1 + m * fa.w * fa.v);
    const vb = (fb.c * fb.v) / (1 + m * fb.w * fb.v);
    const dof = first.line.dof + second.line.dof + 2 * m;
    const need = studentTQuantile((1 + level) / 2, dof) + studentTQuantile(power, dof);
    if (Math.abs(cmp.differenceLnR) / Math.sqrt(va + vb) >= need) return m;
  }
  return null;
}
