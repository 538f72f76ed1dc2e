/**
 * Stateless computations behind /api/v1/forecast and /api/v1/fit: convert the
 * request's { value, unit } quantities to SI with request paths for errors,
 * run the engine, and express results in the units chemists read.
 */
import {
  CELSIUS_OFFSET_K,
  SIGN_CONVENTION,
  THERMOCHEMICAL_CALORIE_J,
  ddGAtTemperature,
  energyToJPerMol,
  entropyToJPerMolK,
  fitEyring,
  fitTwoBranch,
  forecastSelectivity,
  kelvinToCelsius,
  parseSelectivity,
  sigmaLnRatio,
  temperatureToK,
  type EyringFit,
  type EyringMeasurement,
  type ForecastBasis,
  type SelectivityInput,
  type SelectivityInterval,
  type TwoBranchFit,
} from '../../science';
import { SELECTIVITY_CAUTION } from '../../lib/cautions';
import { expandTemperatures } from './temperatures';
import type { FitRequest, FitResponse, ForecastRequest, ForecastResponse } from './schemas';

type Quantity<U extends string> = { value: number; unit: U };
type TemperatureQ = Quantity<'K' | 'C' | 'F'>;
type Temperatures = ForecastRequest['temperatures'];

const kJ = (j: number) => j / 1000;
const kcal = (j: number) => j / (1000 * THERMOCHEMICAL_CALORIE_J);
const calK = (j: number) => j / THERMOCHEMICAL_CALORIE_J;
const pair = (f: (v: number) => number, [a, b]: [number, number]): [number, number] => [f(a), f(b)];

const toK = (t: TemperatureQ, path: string) => temperatureToK(t.value, t.unit, `${path}.value`);

/** A range or a list of temperatures in kelvin, errors reported at their request path. */
export const resolveTemperatures = (spec: Temperatures, path = 'temperatures'): number[] => expandTemperatures(spec, path).kelvins;

const ddGOut = (j: number) => ({ 'kJ/mol': kJ(j), 'kcal/mol': kcal(j) });

function zeroSelectivity(t0: number | null, range?: { min: number; max: number }) {
  if (t0 === null) return null;
  const far = !range || t0 < range.min - 30 || t0 > range.max + 30;
  return {
    kelvin: t0,
    celsius: t0 - CELSIUS_OFFSET_K,
    note: far
      ? 'Where the straight line predicts no selectivity (ΔΔH‡/ΔΔS‡); a far extrapolation: read it as a trend, not a forecast.'
      : 'Where the straight line predicts no selectivity (ΔΔH‡/ΔΔS‡); selectivity inverts beyond it.',
  };
}

export function runForecast(req: ForecastRequest): ForecastResponse {
  const { basis } = req;
  let engineBasis: ForecastBasis;
  switch (basis.kind) {
    case 'activation':
      engineBasis = {
        kind: 'enthalpy-entropy',
        ddHJPerMol: energyToJPerMol(basis.ddH.value, basis.ddH.unit, 'basis.ddH.value'),
        ddSJPerMolK: entropyToJPerMolK(basis.ddS.value, basis.ddS.unit, 'basis.ddS.value'),
      };
      break;
    case 'gap':
      engineBasis = {
        kind: 'gap-at-temperature',
        ddGJPerMol: energyToJPerMol(basis.ddG.value, basis.ddG.unit, 'basis.ddG.value'),
        temperatureK: toK(basis.temperature, 'basis.temperature'),
        ...(basis.ddS ? { ddSJPerMolK: entropyToJPerMolK(basis.ddS.value, basis.ddS.unit, 'basis.ddS.value') } : {}),
      };
      break;
    case 'observed': {
      const selectivity: SelectivityInput = basis.selectivity;
      parseSelectivity(selectivity, 'basis.selectivity'); // fail with the request path before the engine does
      engineBasis = {
        kind: 'observed',
        selectivity,
        temperatureK: toK(basis.temperature, 'basis.temperature'),
        ...(basis.ddS ? { ddSJPerMolK: entropyToJPerMolK(basis.ddS.value, basis.ddS.unit, 'basis.ddS.value') } : {}),
      };
      break;
    }
  }
  const temperaturesK = resolveTemperatures(req.temperatures);
  const result = forecastSelectivity(engineBasis, temperaturesK);
  return {
    points: result.points.map((p) => ({
      kelvin: p.kelvin,
      celsius: p.celsius,
      ratio: p.ratio,
      eePercent: p.eePercent,
      percentA: p.percentA,
      ddG: ddGOut(p.ddGJPerMol),
    })),
    zeroSelectivity: zeroSelectivity(result.zeroSelectivityTemperatureK),
    assumptions: result.assumptions,
    convention: SIGN_CONVENTION,
    caution: SELECTIVITY_CAUTION,
  };
}

/** Convert validated API measurements to the engine's SI form (errors name request paths). */
export function toEyringMeasurements(measurements: FitRequest['measurements']): EyringMeasurement[] {
  return measurements.map((m, i) => {
    const path = `measurements.${i}`;
    const selectivity: SelectivityInput = m.selectivity;
    const ratio = parseSelectivity(selectivity, `${path}.selectivity`);
    const out: EyringMeasurement = { temperatureK: toK(m.temperature, `${path}.temperature`), ratio };
    if (m.uncertainty !== undefined) out.sigmaLnR = sigmaLnRatio(selectivity, m.uncertainty, `${path}.uncertainty`);
    if (m.selectivity.atLeast) out.atLeast = true;
    if (m.excluded) out.excluded = true;
    if (m.label) out.label = m.label;
    return out;
  });
}

const mapInterval = (iv: SelectivityInterval | null) =>
  iv ? { ratio: iv.ratio, eePercent: iv.eePercent, percentA: iv.percentA } : null;

function twoBranchOut(tb: TwoBranchFit | null): FitResponse['twoBranch'] {
  if (!tb) return null;
  const branch = (b: TwoBranchFit['lowBranch']) => ({
    fromKelvin: b.temperatureRangeK.min,
    toKelvin: b.temperatureRangeK.max,
    n: b.n,
    slope: b.slopeK,
    intercept: b.intercept,
    ddH: ddGOut(b.ddHJPerMol),
    ddS: { 'J/(mol*K)': b.ddSJPerMolK, 'cal/(mol*K)': calK(b.ddSJPerMolK) },
  });
  return {
    preferred: tb.preferred,
    breakBetweenKelvin: [tb.lowBranch.temperatureRangeK.max, tb.highBranch.temperatureRangeK.min],
    low: branch(tb.lowBranch),
    high: branch(tb.highBranch),
    fTest: { F: tb.fStatistic, dof1: tb.dof1, dof2: tb.dof2, p: tb.pValue },
    informationCriterion:
      tb.criterion === 'AICc'
        ? { name: 'AICc', oneLine: tb.oneLine.aicc!, twoBranch: tb.twoBranch.aicc! }
        : { name: 'BIC', oneLine: tb.oneLine.bic, twoBranch: tb.twoBranch.bic },
    isoinversion: tb.isoinversionTemperatureK === null ? null : { kelvin: tb.isoinversionTemperatureK, celsius: kelvinToCelsius(tb.isoinversionTemperatureK) },
    note: [tb.reason, tb.isoinversionNote, ...tb.notes].filter(Boolean).join(' '),
  };
}

export interface FitOptions {
  weighting: FitRequest['weighting'];
  uncertaintyScale: FitRequest['uncertaintyScale'];
  confidence: number;
}

/** Fit + two-branch check + predictions, in the API's response shape. Shared with stored campaigns. */
export function analyseScreen(measurements: EyringMeasurement[], options: FitOptions, predictK: number[]): FitResponse {
  const weighting = options.weighting === 'none' ? 'none' : options.uncertaintyScale;
  const fit: EyringFit = fitEyring(measurements, { confidenceLevel: options.confidence, weighting, predictAtK: predictK });
  const twoBranch = fitTwoBranch(measurements, { weighting });
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
      ci: fit.ddSCiJPerMolK
        ? { 'J/(mol*K)': fit.ddSCiJPerMolK, 'cal/(mol*K)': pair(calK, fit.ddSCiJPerMolK) }
        : null,
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
      leverage: p.leverage,
      cooksDistance: p.cooksDistance,
      status: p.status,
      flags: [
        ...p.flags,
        ...(p.censoredBound ? [`${p.censoredBound}-bound${p.boundConsistent === false ? '-disagrees' : ''}`] : []),
        ...(p.exclusionReason ? [`excluded: ${p.exclusionReason}`] : []),
      ],
    })),
    zeroSelectivity: zeroSelectivity(fit.zeroSelectivityTemperatureK, fit.temperatureRangeK),
    twoBranch: twoBranchOut(twoBranch),
    warnings: [...fit.warnings, ...(twoBranch?.warnings ?? [])],
    convention: SIGN_CONVENTION,
    caution: SELECTIVITY_CAUTION,
    predictions: fit.predictions.map((p) => ({
      kelvin: p.temperatureK,
      celsius: p.celsius,
      ratio: p.ratio,
      eePercent: p.eePercent,
      percentA: p.percentA,
      ddG: ddGOut(p.ddGJPerMol),
      ddGSe: p.ddGSeJPerMol === null ? null : ddGOut(p.ddGSeJPerMol),
      extrapolated: p.extrapolated,
      confidenceInterval: mapInterval(p.meanInterval),
      predictionInterval: mapInterval(p.predictionInterval),
    })),
  };
}

export function runFit(req: FitRequest): FitResponse {
  const measurements = toEyringMeasurements(req.measurements);
  const predictK = req.predict.map((t, i) => toK(t, `predict.${i}`));
  return analyseScreen(measurements, req, predictK);
}
