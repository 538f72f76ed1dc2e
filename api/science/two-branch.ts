/**
 * Two-branch (isoinversion) analysis of a selectivity Eyring plot (api/science/README.md §4; isoinversion
 * principle: Buschmann, Scharf, Hoffmann & Esser, Angew. Chem. Int. Ed. Engl. 1991, 30, 477).
 *
 * Every break between consecutive distinct temperatures that leaves ≥ 3 runs (and ≥ 2 distinct
 * temperatures) on each side is tried; each side gets its own straight line ln r = a + b/T
 * (4 line parameters in total) and the break with the smallest total residual sum of squares wins.
 * It is compared with one line by the extra-sum-of-squares F test,
 *   F = [(SS₁ − SS₂)/2] / [SS₂/(n − 4)],  dof (2, n − 4),
 * (Draper & Smith, Applied Regression Analysis, §6) and by an information criterion.
 */
import fCdf from '@stdlib/stats-base-dists-f-cdf';
import { GAS_CONSTANT_J_PER_MOL_K as R } from './constants';
import {
  DEFAULT_CENSOR_EE_PERCENT,
  prepareMeasurements,
  resolveWeighting,
  type EyringMeasurement,
  type EyringWeighting,
  type PreparedMeasurement,
} from './eyring-fit';
import type { Warning } from './errors';
import { fitLine, type LineFit } from './regression';
import { SIGN_CONVENTION } from './selectivity';
import { describeTemperatureK } from './units';

export interface TwoBranchOptions {
  weighting?: EyringWeighting;
  censorEePercent?: number;
  /** Significance level for the F test; default 0.05. */
  alpha?: number;
}

export interface BranchSummary {
  n: number;
  temperatureRangeK: { min: number; max: number };
  slopeK: number;
  intercept: number;
  ddHJPerMol: number;
  ddSJPerMolK: number;
  ddHSeJPerMol: number | null;
  ddSSeJPerMolK: number | null;
  ssRes: number;
}

export interface ModelScore {
  ssRes: number;
  /** Number of estimated parameters counted (line coefficients, break, residual variance). */
  parameters: number;
  /** Small-sample AIC; null when n − k − 1 ≤ 0. */
  aicc: number | null;
  bic: number;
}

export interface TwoBranchFit {
  convention: string;
  n: number;
  /** Indexes (into the input) of the runs used, by branch. */
  lowBranchIndexes: number[];
  highBranchIndexes: number[];
  lowBranch: BranchSummary;
  highBranch: BranchSummary;
  oneLine: ModelScore & { ddHJPerMol: number; ddSJPerMolK: number };
  twoBranch: ModelScore;
  fStatistic: number;
  dof1: number;
  dof2: number;
  pValue: number;
  /** The criterion used in the rule: AICc when defined for both models, else BIC. */
  criterion: 'AICc' | 'BIC';
  isoinversionTemperatureK: number | null;
  isoinversionNote: string;
  preferred: 'one-line' | 'two-branch';
  reason: string;
  notes: string[];
  warnings: Warning[];
}

/** Smallest SS used in logarithms and ratios, so perfect synthetic fits stay finite. */
const SS_FLOOR = 1e-300;

function score(ss: number, n: number, k: number): ModelScore {
  const base = n * Math.log(Math.max(ss, SS_FLOOR) / n);
  const aicc = n - k - 1 > 0 ? base + 2 * k + (2 * k * (k + 1)) / (n - k - 1) : null;
  return { ssRes: ss, parameters: k, aicc, bic: base + k * Math.log(n) };
}

function summarise(points: PreparedMeasurement[], line: LineFit): BranchSummary {
  const temps = points.map((p) => p.measurement.temperatureK);
  return {
    n: points.length,
    temperatureRangeK: { min: Math.min(...temps), max: Math.max(...temps) },
    slopeK: line.slope,
    intercept: line.intercept,
    ddHJPerMol: R * line.slope,
    ddSJPerMolK: -R * line.intercept,
    ddHSeJPerMol: line.slopeSe === null ? null : R * line.slopeSe,
    ddSSeJPerMolK: line.interceptSe === null ? null : R * line.interceptSe,
    ssRes: line.ssRes,
  };
}

function fitSubset(points: PreparedMeasurement[], sigma: Map<number, number> | null): LineFit {
  const x = points.map((p) => p.x);
  const y = points.map((p) => p.y);
  if (!sigma) return fitLine(x, y);
  return fitLine(x, y, { sigma: points.map((p) => sigma.get(p.index)!), sigmaMode: 'relative' });
}

/**
 * Fit two straight Eyring branches and compare with one line. Returns null when fewer than 6
 * usable (not excluded, not censored) runs remain or no break leaves ≥ 3 runs and ≥ 2 distinct
 * temperatures per branch.
 *
 * Preferred model: 'two-branch' only if p < alpha (default 0.05) AND its AICc (BIC when AICc is
 * undefined for the sample size) is lower than one line's, counting the break as a parameter
 * (k = 6: two lines, break, σ²; one line k = 3). The F-test p-value ignores the search over breaks
 * and is therefore optimistic; the information criterion partly compensates.
 */
export function fitTwoBranch(measurements: readonly EyringMeasurement[], options: TwoBranchOptions = {}): TwoBranchFit | null {
  const alpha = options.alpha ?? 0.05;
  const prepared = prepareMeasurements(measurements, options.censorEePercent ?? DEFAULT_CENSOR_EE_PERCENT);
  const usable = prepared.filter((p) => p.status === 'fitted').sort((a, b) => a.measurement.temperatureK - b.measurement.temperatureK);
  const n = usable.length;
  if (n < 6) return null;
  const warnings: Warning[] = [];
  const { mode, sigma } = resolveWeighting(usable, options.weighting ?? 'auto', warnings);
  const sigmaByIndex = sigma ? new Map(usable.map((p, i) => [p.index, sigma[i]!])) : null;
  if (mode === 'absolute') {
    warnings.push({
      code: 'absolute-sigma-as-relative',
      message: 'The branch comparison treats σ as relative (scale estimated from the scatter), as the F test requires.',
    });
  }

  const oneLineFit = fitSubset(usable, sigmaByIndex);
  // Trial breaks are scored from prefix sums of weighted, centred moments, O(1) each, so the
  // search is O(n); only the chosen break is refitted in full (with its diagnostics).
  const weights = sigma ? sigma.map((sd) => 1 / (sd * sd)) : null;
  const w = (i: number) => (weights ? weights[i]! : 1);
  let sw = 0;
  let swx = 0;
  let swy = 0;
  usable.forEach((p, i) => {
    sw += w(i);
    swx += w(i) * p.x;
    swy += w(i) * p.y;
  });
  const xm = swx / sw;
  const ym = swy / sw;
  const prefix = { w: new Float64Array(n + 1), u: new Float64Array(n + 1), v: new Float64Array(n + 1), uu: new Float64Array(n + 1), uv: new Float64Array(n + 1), vv: new Float64Array(n + 1) };
  const distinctBefore = new Int32Array(n + 1);
  usable.forEach((p, i) => {
    const wi = w(i);
    const u = p.x - xm;
    const v = p.y - ym;
    prefix.w[i + 1] = prefix.w[i]! + wi;
    prefix.u[i + 1] = prefix.u[i]! + wi * u;
    prefix.v[i + 1] = prefix.v[i]! + wi * v;
    prefix.uu[i + 1] = prefix.uu[i]! + wi * u * u;
    prefix.uv[i + 1] = prefix.uv[i]! + wi * u * v;
    prefix.vv[i + 1] = prefix.vv[i]! + wi * v * v;
    const newTemperature = i === 0 || usable[i]!.measurement.temperatureK - usable[i - 1]!.measurement.temperatureK > 1e-6;
    distinctBefore[i + 1] = distinctBefore[i]! + (newTemperature ? 1 : 0);
  });
  const segmentSs = (a: number, b: number) => {
    const d = (arr: Float64Array) => arr[b]! - arr[a]!;
    const s0 = d(prefix.w);
    const su = d(prefix.u);
    const sv = d(prefix.v);
    const suu = d(prefix.uu) - (su * su) / s0;
    const suv = d(prefix.uv) - (su * sv) / s0;
    const svv = d(prefix.vv) - (sv * sv) / s0;
    return Math.max(0, suu > 0 ? svv - (suv * suv) / suu : svv);
  };
  const distinctTotal = distinctBefore[n]!;
  let bestSplit = -1;
  let bestTrialSs = Infinity;
  for (let split = 3; split <= n - 3; split++) {
    const tLeft = usable[split - 1]!.measurement.temperatureK;
    const tRight = usable[split]!.measurement.temperatureK;
    if (tRight - tLeft <= 1e-6) continue; // a break must fall between distinct temperatures
    const lowDistinct = distinctBefore[split]!;
    if (lowDistinct < 2 || distinctTotal - lowDistinct < 2) continue;
    const ss = segmentSs(0, split) + segmentSs(split, n);
    if (ss < bestTrialSs) {
      bestTrialSs = ss;
      bestSplit = split;
    }
  }
  if (bestSplit < 0) return null;
  const bestLow = fitSubset(usable.slice(0, bestSplit), sigmaByIndex);
  const bestHigh = fitSubset(usable.slice(bestSplit), sigmaByIndex);
  const best = { split: bestSplit, low: bestLow, high: bestHigh, ss: bestLow.ssRes + bestHigh.ssRes };

  const lowPts = usable.slice(0, best.split);
  const highPts = usable.slice(best.split);
  const ss1 = oneLineFit.ssRes;
  const ss2 = best.ss;
  const dof1 = 2;
  const dof2 = n - 4;
  const fStatistic = Math.max(0, (ss1 - ss2) / dof1) / (Math.max(ss2, SS_FLOOR) / dof2);
  const finiteF = Math.min(fStatistic, Number.MAX_VALUE);
  const pValue = Math.min(1, Math.max(0, 1 - fCdf(finiteF, dof1, dof2)));

  const oneScore = score(ss1, n, 3);
  const twoScore = score(ss2, n, 6);
  const criterion: 'AICc' | 'BIC' = oneScore.aicc !== null && twoScore.aicc !== null ? 'AICc' : 'BIC';
  const icOne = criterion === 'AICc' ? oneScore.aicc! : oneScore.bic;
  const icTwo = criterion === 'AICc' ? twoScore.aicc! : twoScore.bic;
  const significant = pValue < alpha;
  const icFavoursTwo = icTwo < icOne;
  const preferred = significant && icFavoursTwo ? 'two-branch' : 'one-line';
  const reason =
    preferred === 'two-branch'
      ? `Two branches: the F test gives p = ${pValue.toPrecision(2)} < ${alpha} and ${criterion} is lower by ${(icOne - icTwo).toFixed(1)}.`
      : `One line: ${significant ? '' : `the F test gives p = ${pValue.toPrecision(2)} ≥ ${alpha}`}${!significant && !icFavoursTwo ? ' and ' : ''}${
          icFavoursTwo ? '' : `${criterion} does not favour two branches (difference ${(icTwo - icOne).toFixed(1)})`
        }; the extra parameters are not justified.`;

  // Isoinversion: where the two branch lines cross, x* = (a₂ − a₁)/(b₁ − b₂), T* = 1/x*.
  const lowInnerT = lowPts[lowPts.length - 1]!.measurement.temperatureK;
  const highInnerT = highPts[0]!.measurement.temperatureK;
  const gap = highInnerT - lowInnerT;
  let isoinversionTemperatureK: number | null = null;
  let isoinversionNote: string;
  const db = best.low.slope - best.high.slope;
  const scaleB = Math.max(Math.abs(best.low.slope), Math.abs(best.high.slope), 1);
  if (Math.abs(db) <= 1e-9 * scaleB) {
    isoinversionNote = 'The two branch lines are parallel and do not cross: no isoinversion temperature.';
  } else {
    const xStar = (best.high.intercept - best.low.intercept) / db;
    const tStar = 1 / xStar;
    // Accept a crossing only between the innermost runs of the two branches, widened by one gap on each side.
    if (xStar > 0 && Number.isFinite(tStar) && tStar >= lowInnerT - gap && tStar <= highInnerT + gap) {
      isoinversionTemperatureK = tStar;
      isoinversionNote = `The branch lines cross at ${describeTemperatureK(tStar)}, between the branches (${lowInnerT.toFixed(1)}–${highInnerT.toFixed(1)} K): the isoinversion temperature, where selectivity has its extremum.`;
    } else {
      isoinversionNote = `The branch lines do not cross near the break (${lowInnerT.toFixed(1)}–${highInnerT.toFixed(1)} K)${
        xStar > 0 && Number.isFinite(tStar) ? `; their crossing at ${tStar.toFixed(0)} K is far from the break` : ''
      }, so no isoinversion temperature is reported.`;
    }
  }

  if (preferred === 'one-line' && isoinversionTemperatureK !== null) {
    // The crossing of two trial branches means nothing when the data do not support a break.
    isoinversionNote = `The trial branch lines would cross at ${describeTemperatureK(isoinversionTemperatureK)}, but one straight line describes the data as well, so no isoinversion temperature is claimed.`;
  }

  const notes = [
    'The break was chosen to minimise the residual sum of squares, so the F-test p-value is optimistic; the information criterion counts the break as a parameter.',
    'Never extrapolate either branch across the break: the selectivity-determining step differs between them.',
  ];
  if (lowPts.length < 4 || highPts.length < 4) {
    notes.push('A branch rests on only 3 runs; its slope is poorly determined.');
  }

  return {
    convention: SIGN_CONVENTION,
    n,
    lowBranchIndexes: lowPts.map((p) => p.index),
    highBranchIndexes: highPts.map((p) => p.index),
    lowBranch: summarise(lowPts, best.low),
    highBranch: summarise(highPts, best.high),
    oneLine: { ...oneScore, ddHJPerMol: R * oneLineFit.slope, ddSJPerMolK: -R * oneLineFit.intercept },
    twoBranch: twoScore,
    fStatistic: finiteF,
    dof1,
    dof2,
    pValue,
    criterion,
    isoinversionTemperatureK,
    isoinversionNote,
    preferred,
    reason,
    notes,
    warnings,
  };
}
