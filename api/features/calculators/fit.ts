/**
 * POST /api/v1/fit and the analysis every stored campaign shares: the Eyring fit, the two-branch
 * check and predictions of a screen, in the API's response shape.
 */
import {
  SIGN_CONVENTION,
  ddGAtTemperature,
  checkCurvature,
  chooseScreenModel,
  fitEyring,
  parseSelectivity,
  sigmaLnRatio,
  type EyringFit,
  type EyringMeasurement,
  type EyringPointResult,
  type SelectivityInput,
  type SelectivityInterval,
} from '../../science';
import { SELECTIVITY_CAUTION } from '../../lib/cautions';
import { BadRequestError } from '../../lib/errors';
import { medianUncertainty, type AssayPrecision } from '../../science/assay-precision';
import { lnRatioLimitFromEe } from '../../science/eyring-fit';
import { curvatureOut, modelPrediction } from './curvature';
import { calK, ddGOut, finiteConversion, kJ, kcal, pair, toK, withRequestPaths, zeroSelectivity } from './request-units';
import { kelvinLookingWarning } from './temperatures';
import type { FitRequest, FitResponse } from './schemas';

/** A run's flags in the answer: the diagnostics' own, then its bound and its exclusion (most runs have neither). */
function residualFlags(p: EyringPointResult): string[] {
  const flags: string[] = p.flags.slice();
  if (p.censoredBound) flags.push(`${p.censoredBound}-bound${p.boundConsistent === false ? '-disagrees' : ''}`);
  if (p.exclusionReason) flags.push(`excluded: ${p.exclusionReason}`);
  return flags;
}

/** Engine argument paths of a fit → request paths of POST /fit. */
export function fitRequestPath(field: string): string | null {
  const m = /^measurements\[(\d+)\]\.(temperatureK|ratio|sigmaLnR)$/.exec(field);
  if (m)
    return `measurements.${m[1]}.${{ temperatureK: 'temperature.value', ratio: 'selectivity.value', sigmaLnR: 'uncertainty' }[m[2] as 'ratio']}`;
  const t = /^temperaturesK\[(\d+)\]$/.exec(field);
  if (t) return `predict.${t[1]}.value`;
  if (field === 'censorLnRatio' || field === 'censorEePercent') return 'quantitationLimit.value';
  return null;
}

/** A range or a list of temperatures in kelvin, errors reported at their request path. */

/** Convert validated API measurements to the engine's SI form (errors name request paths). */
export function toEyringMeasurements(measurements: FitRequest['measurements']): EyringMeasurement[] {
  return measurements.map((m, i) => {
    const path = `measurements.${i}`;
    const selectivity: SelectivityInput = m.selectivity;
    const ratio = parseSelectivity(selectivity, `${path}.selectivity`);
    const out: EyringMeasurement = { temperatureK: toK(m.temperature, `${path}.temperature`), ratio };
    if (m.uncertainty !== undefined) {
      out.sigmaLnR = finiteConversion(sigmaLnRatio(selectivity, m.uncertainty, `${path}.uncertainty`), `${path}.uncertainty`);
    }
    if (m.selectivity.atLeast) out.atLeast = true;
    if (m.excluded) out.excluded = true;
    if (m.label) out.label = m.label;
    return out;
  });
}

/** r beyond the representable range travels as null (JSON has no Infinity); ln r always travels. */
const finiteOrNull = (v: number) => (Number.isFinite(v) && v > 0 ? v : null);
const mapInterval = (iv: SelectivityInterval | null) =>
  iv === null
    ? null
    : finiteOrNull(iv.ratio[0]) !== null && finiteOrNull(iv.ratio[1]) !== null
      ? iv
      : {
          lnRatio: iv.lnRatio,
          ratio: [finiteOrNull(iv.ratio[0]), finiteOrNull(iv.ratio[1])] as [number | null, number | null],
          eePercent: iv.eePercent,
          percentA: iv.percentA,
        };

/** ln r at a quantitation limit given in a measure's own terms (validated by quantitationLimitSchema). */
export function quantitationLimitLnRatio(limit: { measure: SelectivityInput['measure']; value: number }): number {
  switch (limit.measure) {
    case 'ee':
      return lnRatioLimitFromEe(limit.value);
    case 'percentA':
    case 'er':
      return Math.log(limit.value / (100 - limit.value));
    default:
      return Math.log(limit.value);
  }
}

export const DEFAULT_QUANTITATION_LIMIT = { measure: 'ee' as const, value: 99.8 };

export interface FitOptions {
  weighting: FitRequest['weighting'];
  uncertaintyScale: FitRequest['uncertaintyScale'];
  confidence: number;
  /** The new run's assay precision; null or absent → the screen's own scatter. */
  newRun?: AssayPrecision | null;
  /** Where newRun came from, for the note: given in the request, the campaign, or the runs' median. */
  newRunOrigin?: 'request' | 'campaign' | 'median';
  /** The assay's quantitation limit; default 99.8 % ee. */
  quantitationLimit?: { measure: SelectivityInput['measure']; value: number };
}

/** The new run's precision: the one given, else the median of the runs' own in the most common measure. */
export function newRunPrecision(
  given: number | undefined,
  givenMeasure: SelectivityInput['measure'] | undefined,
  runs: readonly { measure: SelectivityInput['measure']; uncertainty: number | null | undefined }[],
): { precision: AssayPrecision | null; origin: 'request' | 'median' } {
  const counts = new Map<SelectivityInput['measure'], number>();
  for (const r of runs) counts.set(r.measure, (counts.get(r.measure) ?? 0) + 1);
  const common = [...counts.entries()].sort((a, b) => b[1] - a[1])[0]?.[0] ?? 'ee';
  const measure = givenMeasure ?? common;
  if (given !== undefined) return { precision: { measure, uncertainty: given }, origin: 'request' };
  const median = medianUncertainty(runs.filter((r) => r.measure === measure && r.uncertainty != null).map((r) => r.uncertainty!));
  return { precision: median === null ? null : { measure, uncertainty: median }, origin: 'median' };
}

function newRunNote(precision: AssayPrecision | null | undefined, origin: FitOptions['newRunOrigin']): string {
  if (!precision) {
    return "No assay precision is known, so a new run is assumed to scatter like the screen's runs about the line.";
  }
  const from =
    origin === 'request' ? 'as given' : origin === 'campaign' ? "the campaign's setting" : "the median of the runs' own uncertainties";
  return `A new run adds its own assay error, ± ${precision.uncertainty} (${precision.measure}, ${from}), propagated to ln r at each predicted value.`;
}

/**
 * Fit + curvature check + predictions, in the API's response shape. Shared with stored campaigns.
 * When the break test accepts curvature, every prediction comes from the segmented model.
 */
export function analyseScreen(measurements: EyringMeasurement[], options: FitOptions, predictK: number[]): FitResponse {
  const weighting = options.weighting === 'none' ? 'none' : options.uncertaintyScale;
  const limit = options.quantitationLimit ?? DEFAULT_QUANTITATION_LIMIT;
  const fit: EyringFit = fitEyring(measurements, {
    confidenceLevel: options.confidence,
    weighting,
    predictAtK: predictK,
    censorLnRatio: quantitationLimitLnRatio(limit),
    ...(options.newRun ? { newRun: options.newRun } : {}),
  });
  const curvature = checkCurvature(measurements, { weighting, confidenceLevel: fit.confidenceLevel });
  const model = chooseScreenModel(fit, curvature);
  const energy = (j: number | null) => (j === null ? null : ddGOut(j));
  const entropy = (j: number | null) => (j === null ? null : { 'J/(mol*K)': j, 'cal/(mol*K)': calK(j) });
  const ls = fit.leastSquaresWithoutBounds;
  const at25 = ddGAtTemperature(fit, 298.15, options.confidence);
  const cov = fit.line.covariance;
  return {
    n: fit.nFitted,
    dof: fit.dof,
    weighting: options.weighting,
    confidence: fit.confidenceLevel,
    slope: fit.slopeK,
    intercept: fit.intercept,
    covariance: cov ? { slopeSlope: cov.slopeSlope, slopeIntercept: cov.interceptSlope, interceptIntercept: cov.interceptIntercept } : null,
    correlation: fit.ddHDdSCorrelation,
    rSquared: fit.rSquared,
    residualSD: fit.residualSdLnR,
    ddH: {
      ...ddGOut(fit.ddHJPerMol),
      se: fit.ddHSeJPerMol === null ? null : ddGOut(fit.ddHSeJPerMol),
      ci: fit.ddHCiJPerMol ? { 'kJ/mol': pair(kJ, fit.ddHCiJPerMol), 'kcal/mol': pair(kcal, fit.ddHCiJPerMol) } : null,
    },
    ddS: {
      'J/(mol*K)': fit.ddSJPerMolK,
      'cal/(mol*K)': calK(fit.ddSJPerMolK),
      se: fit.ddSSeJPerMolK === null ? null : { 'J/(mol*K)': fit.ddSSeJPerMolK, 'cal/(mol*K)': calK(fit.ddSSeJPerMolK) },
      ci: fit.ddSCiJPerMolK ? { 'J/(mol*K)': fit.ddSCiJPerMolK, 'cal/(mol*K)': pair(calK, fit.ddSCiJPerMolK) } : null,
    },
    ddGAt25C: {
      ...ddGOut(at25.ddGJPerMol),
      se: at25.seJPerMol === null ? null : ddGOut(at25.seJPerMol),
      ci: at25.ciJPerMol ? { 'kJ/mol': pair(kJ, at25.ciJPerMol), 'kcal/mol': pair(kcal, at25.ciJPerMol) } : null,
    },
    temperatureRange: { minKelvin: fit.temperatureRangeK.min, maxKelvin: fit.temperatureRangeK.max },
    residuals: fit.points.map((p) => ({
      index: p.index,
      kelvin: p.temperatureK,
      lnRatio: p.lnRatio,
      fitted: p.lineLnRatio,
      residual: p.residual,
      studentized: p.studentizedExternal,
      studentizedInternal: p.studentizedInternal,
      flagReason: p.flagReason,
      residualInAssaySigmas: p.residualInAssaySigmas,
      withinAssayPrecision: p.withinAssayPrecision,
      censorLnRatio: p.censorLnRatio,
      leverage: p.leverage,
      cooksDistance: p.cooksDistance,
      status: p.status,
      flags: residualFlags(p),
    })),
    zeroSelectivity: zeroSelectivity(fit.zeroSelectivityTemperatureK, fit.zeroSelectivityFar, fit.zeroSelectivityInterval),
    estimator: fit.estimator,
    leastSquaresWithoutBounds: ls
      ? {
          n: ls.nFitted,
          ddH: {
            ...ddGOut(ls.ddHJPerMol),
            se: energy(ls.ddHSeJPerMol),
            ci: ls.ddHCiJPerMol ? { 'kJ/mol': pair(kJ, ls.ddHCiJPerMol), 'kcal/mol': pair(kcal, ls.ddHCiJPerMol) } : null,
          },
          ddS: {
            'J/(mol*K)': ls.ddSJPerMolK,
            'cal/(mol*K)': calK(ls.ddSJPerMolK),
            se: entropy(ls.ddSSeJPerMolK),
            ci: ls.ddSCiJPerMolK ? { 'J/(mol*K)': ls.ddSCiJPerMolK, 'cal/(mol*K)': pair(calK, ls.ddSCiJPerMolK) } : null,
          },
          label: 'Least squares on the exact runs only, bounds dropped (biased towards lower selectivity; for comparison)',
        }
      : null,
    censoredFit: fit.censoredFit,
    quantitationLimit: { ...limit, lnRatio: quantitationLimitLnRatio(limit) },
    precisionCheck: fit.precisionCheck,
    newRun: {
      source: fit.newRunBasis.source,
      measure: options.newRun?.measure ?? null,
      uncertainty: options.newRun?.uncertainty ?? null,
      note: newRunNote(options.newRun, options.newRunOrigin),
    },
    twoBranch: curvatureOut(curvature),
    warnings: [...fit.warnings, ...curvature.warnings],
    convention: SIGN_CONVENTION,
    caution: SELECTIVITY_CAUTION,
    predictions: fit.predictions.map((p) =>
      modelPrediction(
        model,
        {
          kelvin: p.temperatureK,
          celsius: p.celsius,
          ratio: finiteOrNull(p.ratio),
          lnRatio: p.lnRatio,
          outOfRange: p.outOfRange,
          newRunSigmaLnR: p.newRunSigmaLnR,
          eePercent: p.eePercent,
          percentA: p.percentA,
          ddG: ddGOut(p.ddGJPerMol),
          ddGSe: p.ddGSeJPerMol === null ? null : ddGOut(p.ddGSeJPerMol),
          extrapolated: p.extrapolated,
          model: 'one-line',
          branch: null,
          confidenceInterval: mapInterval(p.meanInterval),
          predictionInterval: mapInterval(p.predictionInterval),
        },
        fit.confidenceLevel,
        options.newRun,
      ),
    ),
  };
}

export function runFit(req: FitRequest): FitResponse {
  const measurements = toEyringMeasurements(req.measurements);
  const predictK = req.predict.map((t, i) => toK(t, `predict.${i}`));
  const { precision, origin } = newRunPrecision(
    req.newRunUncertainty,
    req.newRunMeasure,
    req.measurements.filter((m) => !m.excluded).map((m) => ({ measure: m.selectivity.measure, uncertainty: m.uncertainty })),
  );
  if (req.quantitationLimit) {
    // A bound inside an explicitly stated limit contradicts it: the assay quantifies values there.
    const lnLimit = quantitationLimitLnRatio(req.quantitationLimit);
    measurements.forEach((m, i) => {
      if (m.atLeast && !m.excluded && Math.abs(Math.log(m.ratio)) < lnLimit * (1 - 1e-12)) {
        throw new BadRequestError(`measurements.${i} is reported as a bound inside the quantitation limit.`, [
          {
            path: `measurements.${i}.selectivity.value`,
            message: `a bound must lie at or beyond the quantitation limit (${req.quantitationLimit!.value} ${req.quantitationLimit!.measure}); inside it the assay gives a value`,
          },
        ]);
      }
    });
  }
  const result = withRequestPaths(fitRequestPath, () =>
    analyseScreen(
      measurements,
      {
        weighting: req.weighting,
        uncertaintyScale: req.uncertaintyScale,
        confidence: req.confidence,
        newRun: precision,
        newRunOrigin: origin,
        ...(req.quantitationLimit ? { quantitationLimit: req.quantitationLimit } : {}),
      },
      predictK,
    ),
  );
  const kelvinLike = kelvinLookingWarning(req.measurements.map((m) => m.temperature));
  if (kelvinLike) result.warnings.push(kelvinLike);
  return result;
}
