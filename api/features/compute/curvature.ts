/**
 * The curvature check in the API's shape, and forecasts on the segmented model when it is
 * accepted (every forecast then says which branch covers its temperature).
 */
import {
  CELSIUS_OFFSET_K,
  GAS_CONSTANT_J_PER_MOL_K as R,
  THERMOCHEMICAL_CALORIE_J,
  kelvinToCelsius,
  predictiveLnRatio,
  studentTQuantile,
  type BreakCheck,
  type ScreenModel,
  type SegmentedBranch,
} from '../../science';
import type { FitResponse } from './schemas';

type Prediction = FitResponse['predictions'][number];

const kJ = (j: number) => j / 1000;
const kcal = (j: number) => j / (1000 * THERMOCHEMICAL_CALORIE_J);
const calK = (j: number) => j / THERMOCHEMICAL_CALORIE_J;
const describe = (k: number) => `${(k - CELSIUS_OFFSET_K).toFixed(0).replace('-', '−')} °C (${k.toFixed(0)} K)`;

function branchOut(b: SegmentedBranch) {
  return {
    fromKelvin: b.temperatureRangeK.min,
    toKelvin: b.temperatureRangeK.max,
    n: b.n,
    slope: b.slopeK,
    slopeSe: b.slopeSeK,
    intercept: b.intercept,
    ddH: { 'kJ/mol': kJ(b.ddHJPerMol), 'kcal/mol': kcal(b.ddHJPerMol), se: b.ddHSeJPerMol === null ? null : { 'kJ/mol': kJ(b.ddHSeJPerMol), 'kcal/mol': kcal(b.ddHSeJPerMol) } },
    ddS: { 'J/(mol*K)': b.ddSJPerMolK, 'cal/(mol*K)': calK(b.ddSJPerMolK) },
  };
}

export function curvatureOut(check: BreakCheck): FitResponse['twoBranch'] {
  const lackOfFit = check.lackOfFit
    ? { F: check.lackOfFit.fStatistic, dof1: check.lackOfFit.dofLackOfFit, dof2: check.lackOfFit.dofPureError, p: check.lackOfFit.pValue }
    : null;
  if (!check.checked) return { checked: false, preferred: 'one-line', claim: null, lackOfFit, note: check.reason };
  const accepted = check.preferred === 'two-branch';
  const t = check.breakTemperatureK;
  const label =
    check.claim === 'isoinversion'
      ? `Isoinversion temperature, where r passes through a ${check.extremum}: ${describe(t)}`
      : `Change of slope at ${describe(t)}`;
  return {
    checked: true,
    preferred: check.preferred,
    claim: check.claim,
    extremum: check.extremum,
    break: accepted
      ? {
          kelvin: t,
          celsius: kelvinToCelsius(t),
          ci: check.breakCiK
            ? {
                level: check.confidenceLevel,
                kelvin: check.breakCiK,
                celsius: [kelvinToCelsius(check.breakCiK[0]), check.breakCiK[1] === null ? null : kelvinToCelsius(check.breakCiK[1])],
              }
            : null,
          label,
        }
      : null,
    low: accepted ? branchOut(check.low) : null,
    high: accepted ? branchOut(check.high) : null,
    breakTest: { method: 'sup-F, parametric bootstrap', F: check.fStatistic, p: check.pValue, resamples: check.resamples, seed: check.seed, alpha: check.alpha },
    lackOfFit,
    note: [check.reason, ...check.notes].join(' '),
  };
}

const eeFromLn = (y: number) => 100 * Math.tanh(y / 2);
const percentAFromLn = (y: number) => 100 / (1 + Math.exp(-y));
/** r = e^y, held finite so one far prediction never breaks the answer (ee and % A saturate anyway). */
const ratioOf = (y: number) => Math.min(Math.exp(y), Number.MAX_VALUE);
const mapInterval = (lo: number, hi: number) => ({
  ratio: [ratioOf(lo), ratioOf(hi)] as [number, number],
  eePercent: [eeFromLn(lo), eeFromLn(hi)] as [number, number],
  percentA: [percentAFromLn(lo), percentAFromLn(hi)] as [number, number],
});

/** A forecast at T from the chosen model; the one-line answer is kept as it is. */
export function modelPrediction(model: ScreenModel, oneLine: Prediction, confidence: number): Prediction {
  if (model.kind === 'one-line') return { ...oneLine, model: 'one-line', branch: null };
  const t = oneLine.kelvin;
  const p = predictiveLnRatio(model, t);
  const y = p.mean;
  const rt = R * t;
  const q = studentTQuantile((1 + confidence) / 2, p.dof);
  const ddG = rt * y;
  return {
    kelvin: t,
    celsius: oneLine.celsius,
    ratio: ratioOf(y),
    eePercent: eeFromLn(y),
    percentA: percentAFromLn(y),
    ddG: { 'kJ/mol': kJ(ddG), 'kcal/mol': kcal(ddG) },
    ddGSe: p.sdMean === null ? null : { 'kJ/mol': kJ(rt * p.sdMean), 'kcal/mol': kcal(rt * p.sdMean) },
    extrapolated: p.extrapolated,
    model: 'segmented',
    branch: p.branch,
    confidenceInterval: p.sdMean === null ? null : mapInterval(y - q * p.sdMean, y + q * p.sdMean),
    predictionInterval: p.sdNewRun === null ? null : mapInterval(y - q * p.sdNewRun, y + q * p.sdNewRun),
  };
}
