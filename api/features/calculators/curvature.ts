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
import { sigmaLnRatioAt, type AssayPrecision } from '../../science/assay-precision';
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
    ddH: {
      'kJ/mol': kJ(b.ddHJPerMol),
      'kcal/mol': kcal(b.ddHJPerMol),
      se: b.ddHSeJPerMol === null ? null : { 'kJ/mol': kJ(b.ddHSeJPerMol), 'kcal/mol': kcal(b.ddHSeJPerMol) },
    },
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
    breakTest: {
      method: 'sup-F, parametric bootstrap',
      F: check.fStatistic,
      p: check.pValue,
      resamples: check.resamples,
      seed: check.seed,
      alpha: check.alpha,
    },
    lackOfFit,
    note: [check.reason, ...check.notes].join(' '),
  };
}

const eeFromLn = (y: number) => 100 * Math.tanh(y / 2);
const percentAFromLn = (y: number) => 100 / (1 + Math.exp(-y));
/** r = e^y, or null beyond the representable range (ln r, ee and % A still stand; ee saturates). */
const ratioOf = (y: number) => {
  const r = Math.exp(y);
  return Number.isFinite(r) && r > 0 ? r : null;
};
const mapInterval = (lo: number, hi: number) => ({
  lnRatio: [lo, hi] as [number, number],
  ratio: [ratioOf(lo), ratioOf(hi)] as [number | null, number | null],
  eePercent: [eeFromLn(lo), eeFromLn(hi)] as [number, number],
  percentA: [percentAFromLn(lo), percentAFromLn(hi)] as [number, number],
});

/**
 * A forecast at T from the chosen model; the one-line answer is kept as it is. On the segmented model a new run's
 * own assay error is propagated at the segmented prediction, and, as for one line, a new run never scatters less
 * than the screen's runs did about the fitted branches.
 */
export function modelPrediction(model: ScreenModel, oneLine: Prediction, confidence: number, newRun?: AssayPrecision | null): Prediction {
  if (model.kind === 'one-line')
    return oneLine.model === 'one-line' && oneLine.branch === null ? oneLine : { ...oneLine, model: 'one-line', branch: null };
  const t = oneLine.kelvin;
  const c = model.fit.coefficients;
  const center = predictiveLnRatio(model, t).mean;
  const assaySigma = newRun ? sigmaLnRatioAt(newRun, center) : null;
  const screenVariance = c.residualVariance * c.meanRelativeVariance;
  const sigmaNewLnR = assaySigma === null ? undefined : Math.sqrt(Math.max(screenVariance, assaySigma * assaySigma));
  const p = predictiveLnRatio(model, t, sigmaNewLnR === undefined ? {} : { sigmaNewLnR });
  const y = p.mean;
  const rt = R * t;
  const q = studentTQuantile((1 + confidence) / 2, p.dof);
  const ddG = rt * y;
  return {
    kelvin: t,
    celsius: oneLine.celsius,
    ratio: ratioOf(y),
    lnRatio: y,
    outOfRange: ratioOf(y) === null,
    newRunSigmaLnR: assaySigma,
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
