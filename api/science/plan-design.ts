/**
 * Which runs to make next: the temperatures that most shrink the prediction interval at one chosen
 * temperature (c-optimal design for the straight line ln r = a + b/T: Elfving, Ann. Math. Stat.
 * 1952, 23, 255).
 */
import { DomainError, requireTemperatureK } from './errors';
import type { EyringFit } from './eyring-fit';
import { studentTQuantile } from './regression';

/** Information matrix Σw·f·fᵀ of a line with f = (1, x), as [m00, m01, m11]. */
export type LineInformation = [number, number, number];

/** c'M⁻¹c for c = (1, x₀) and a symmetric 2 × 2 M (Infinity when M is singular). */
export function varianceFactor(m: LineInformation, x0: number): number {
  const det = m[0] * m[2] - m[1] * m[1];
  if (!(det > 0)) return Infinity;
  return (m[2] - 2 * x0 * m[1] + x0 * x0 * m[0]) / det;
}

const addRun = (m: LineInformation, x: number, w: number): LineInformation => [m[0] + w, m[1] + w * x, m[2] + w * x * x];

/**
 * Elfving's c-optimal design for estimating a + b·x₀ on [xLow, xHigh], per unit σ² and one run:
 * inside the interval all weight at x₀ (variance 1); outside it, the two ends, each weighted in
 * proportion to x₀'s distance from the other end, with variance ((|x₀ − xLow| + |x₀ − xHigh|)/(xHigh − xLow))².
 */
export function elfvingDesign(xLow: number, xHigh: number, x0: number): { points: { x: number; weight: number }[]; variance: number } {
  if (!(xHigh > xLow)) throw new DomainError('range-reversed', 'xHigh must exceed xLow', 'xHigh');
  if (x0 >= xLow && x0 <= xHigh) return { points: [{ x: x0, weight: 1 }], variance: 1 };
  const dLow = Math.abs(x0 - xLow);
  const dHigh = Math.abs(x0 - xHigh);
  const sum = dLow + dHigh;
  return {
    points: [
      { x: xLow, weight: dHigh / sum },
      { x: xHigh, weight: dLow / sum },
    ],
    variance: (sum / (xHigh - xLow)) ** 2,
  };
}

/**
 * Add `count` runs from `candidates` (x values) to the information `m0`, each with weight `w`, to
 * minimise c'M⁻¹c at x₀: greedy additions, then exchange passes until no single swap helps.
 */
export function cOptimalAdditions(m0: LineInformation, w: number, candidates: readonly number[], x0: number, count: number): number[] {
  const chosen: number[] = [];
  const infoOf = (xs: readonly number[]) => xs.reduce((m, x) => addRun(m, x, w), m0);
  for (let j = 0; j < count; j++) {
    const m = infoOf(chosen);
    let best = candidates[0]!;
    let bestV = Infinity;
    for (const x of candidates) {
      const v = varianceFactor(addRun(m, x, w), x0);
      if (v < bestV - 1e-15) {
        best = x;
        bestV = v;
      }
    }
    chosen.push(best);
  }
  for (let pass = 0; pass < 20; pass++) {
    let improved = false;
    for (let i = 0; i < chosen.length; i++) {
      const others = chosen.filter((_, j) => j !== i);
      const m = infoOf(others);
      let current = varianceFactor(addRun(m, chosen[i]!, w), x0);
      for (const x of candidates) {
        const v = varianceFactor(addRun(m, x, w), x0);
        if (v < current * (1 - 1e-12)) {
          chosen[i] = x;
          current = v;
          improved = true;
        }
      }
    }
    if (!improved) break;
  }
  return chosen;
}

export interface NextRunsResult {
  targetK: number;
  temperaturesK: number[];
  /** Half-width in ln r of the interval for one new run at the target, now and expected after the runs. */
  halfWidthBefore: number;
  halfWidthAfter: number;
  /** The same for the mean line (where the average of many runs would fall). */
  meanHalfWidthBefore: number;
  meanHalfWidthAfter: number;
  note: string;
}

/**
 * Suggest the next `count` runs within [fromK, toK] (candidates every `stepK`) that most shrink the
 * prediction interval at targetK, assuming the screen's present scatter and an average run's weight.
 */
export function suggestNextRuns(
  fit: EyringFit,
  options: { targetK: number; fromK: number; toK: number; count: number; stepK?: number; confidenceLevel?: number },
): NextRunsResult {
  const { targetK, fromK, toK, count } = options;
  requireTemperatureK(targetK, 'nextRuns.at');
  if (!(Number.isInteger(count) && count >= 1 && count <= 24)) {
    throw new DomainError('count-out-of-range', 'nextRuns.count must be a whole number from 1 to 24', 'nextRuns.count');
  }
  const line = fit.line;
  const c = line.varianceScale;
  if (!fit.intervalsAvailable || c === null) {
    throw new DomainError(
      'intervals-unavailable',
      'suggesting runs needs a screen with three or more distinct temperatures',
      'measurements',
    );
  }
  const stepK = options.stepK ?? 1;
  const nCand = Math.max(1, Math.floor((toK - fromK) / stepK + 1e-9));
  const temps = Array.from({ length: nCand + 1 }, (_, i) => fromK + i * stepK).filter((t) => t <= toK + 1e-9);
  if (temps[temps.length - 1]! < toK - 1e-9) temps.push(toK);
  const w = line.sumWeights / line.n;
  const m0: LineInformation = [line.sumWeights, line.sumWeights * line.xMean, line.sxx + line.sumWeights * line.xMean * line.xMean];
  const x0 = 1 / targetK;
  const chosenX = cOptimalAdditions(
    m0,
    w,
    temps.map((t) => 1 / t),
    x0,
    count,
  );
  const mAfter = chosenX.reduce((m, x) => addRun(m, x, w), m0);
  const vBefore = varianceFactor(m0, x0);
  const vAfter = varianceFactor(mAfter, x0);
  const level = options.confidenceLevel ?? 0.95;
  const qBefore = studentTQuantile((1 + level) / 2, line.dof);
  const qAfter = studentTQuantile((1 + level) / 2, line.dof + count);
  const sigma2Run = c / w;
  return {
    targetK,
    temperaturesK: chosenX.map((x) => 1 / x).sort((a, b) => a - b),
    halfWidthBefore: qBefore * Math.sqrt(c * vBefore + sigma2Run),
    halfWidthAfter: qAfter * Math.sqrt(c * vAfter + sigma2Run),
    meanHalfWidthBefore: qBefore * Math.sqrt(c * vBefore),
    meanHalfWidthAfter: qAfter * Math.sqrt(c * vAfter),
    note: "Expected widths assume the new runs scatter as the screen does now; a new run can never be predicted more closely than one run's own scatter.",
  };
}
