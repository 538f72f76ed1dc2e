/**
 * The stateless temperature planner behind POST /api/v1/plan: convert the request's quantities to
 * SI (errors at request paths), fit the screen and the rate, run the planner, and answer in the
 * units chemists read. Shared with stored campaign plans.
 */
import {
  CELSIUS_OFFSET_K,
  DomainError,
  SIGN_CONVENTION,
  energyFromJPerMol,
  entropyFromJPerMolK,
  checkCurvature,
  chooseScreenModel,
  fitEyring,
  fitRateFromRuns,
  planTemperature,
  suggestNextRuns,
  temperatureToK,
  type EyringMeasurement,
  type KineticSetup,
  type PlanEvaluation,
  type PlanHoldInput,
  type PlanRateInput,
  type RateFit,
} from '../../science';
import { SELECTIVITY_CAUTION } from '../../lib/cautions';
import { toEyringMeasurements } from '../calculators/fit';
import { readableDuration, toBarrierSpec } from '../calculators/kinetics-fields';
import { SECONDS_PER } from '../../science/quantities';
import type { PlanRequest, PlanResponse } from './schemas';

const kc = (kelvin: number) => ({ kelvin, celsius: kelvin - CELSIUS_OFFSET_K });
const toK = (t: { value: number; unit: 'K' | 'C' | 'F' }, path: string) => temperatureToK(t.value, t.unit, `${path}.value`);
const seconds = (d: { value: number; unit: 's' | 'min' | 'h' | 'd' }) => d.value * SECONDS_PER[d.unit];

function toSetup(rate: NonNullable<PlanRequest['rate']>): KineticSetup {
  if (rate.order === 'pseudo-first')
    return { order: 'pseudo-first', limitingConcentrationM: rate.limiting!.value, excessConcentrationM: rate.excess!.value };
  if (rate.order === 'second') return { order: 'second', initialConcentrationM: rate.initial!.value };
  return { order: 'first' };
}

function fitRate(rate: NonNullable<PlanRequest['rate']>): RateFit {
  const runs = rate.runs.map((r, i) => ({
    temperatureK: toK(r.temperature, `rate.runs.${i}.temperature`),
    conversion: r.conversionPercent / 100,
    timeS: seconds(r.time),
  }));
  try {
    return fitRateFromRuns(runs, toSetup(rate), { lowConversion: rate.lowConversionPercent / 100, field: 'rate.runs' });
  } catch (e) {
    // The engine names runs[i].conversion / timeS; point at the request's own field names.
    if (e instanceof DomainError && e.field) {
      const field = e.field
        .replace(/\[(\d+)\]/g, '.$1')
        .replace(/\.conversion$/, '.conversionPercent')
        .replace(/\.timeS$/, '.time.value');
      throw new DomainError(e.code, e.message.replace(e.field, field), field);
    }
    throw e;
  }
}

function point(e: PlanEvaluation): PlanResponse['curve'][number] {
  return {
    kelvin: e.temperatureK,
    celsius: e.celsius,
    probabilityMeetsSpec: e.probabilityMeetsSpec,
    predicted: { lnRatio: e.lnRatio, value: e.value, band: e.band },
    timeToTarget: e.timeToTargetS === null || !Number.isFinite(e.timeToTargetS) ? null : readableDuration(e.timeToTargetS),
    timeBandSeconds: e.timeBandS,
    eeAfterHold: e.eeAfterHoldPercent,
    feasible: e.feasible,
    failing: e.failing,
  };
}

/** The screen in the engine's form: the same conversion as POST /fit. */
export interface PlanScreen {
  measurements: EyringMeasurement[];
  weighting: PlanRequest['weighting'];
  uncertaintyScale: PlanRequest['uncertaintyScale'];
}

/** Plan from already converted runs (the campaign route passes its stored runs here). */
export function planFromScreen(
  screen: PlanScreen,
  req: Omit<PlanRequest, 'measurements' | 'weighting' | 'uncertaintyScale'>,
): PlanResponse {
  const weighting = screen.weighting === 'none' ? 'none' : screen.uncertaintyScale;
  const fit = fitEyring(screen.measurements, { weighting });
  // Curvature accepted → probabilities come from the segmented model, as every other forecast does.
  const curvature = checkCurvature(screen.measurements, { weighting, confidenceLevel: fit.confidenceLevel });
  const screenModel = chooseScreenModel(fit, curvature);
  const fromK = toK(req.temperatures.from, 'temperatures.from');
  const toKv = toK(req.temperatures.to, 'temperatures.to');
  if (!(toKv > fromK))
    throw new DomainError('range-reversed', 'temperatures.to must be warmer than temperatures.from', 'temperatures.to.value');
  const rateFit = req.rate ? fitRate(req.rate) : null;
  const rate: PlanRateInput | undefined = rateFit
    ? {
        fit: rateFit,
        targetConversion: req.rate!.targetConversionPercent / 100,
        ...(req.rate!.maxTime ? { maxTimeS: seconds(req.rate!.maxTime) } : {}),
      }
    : undefined;
  const hold: PlanHoldInput | undefined = req.hold
    ? { barrier: toBarrierSpec(req.hold.barrier, 'hold.barrier'), timeS: seconds(req.hold.time), floorEePercent: req.hold.floorEePercent }
    : undefined;
  const atK = req.at.map((t, i) => toK(t, `at.${i}`));
  const result = planTemperature({
    fit,
    model: screenModel,
    specification: req.specification,
    ...(req.newRunUncertainty !== undefined ? { newRunUncertainty: req.newRunUncertainty } : {}),
    rangeK: { from: fromK, to: toKv },
    rule: req.rule,
    ...(rate ? { rate } : {}),
    ...(hold ? { hold } : {}),
    applyAtProbability: req.applyAtProbability,
    atK,
    curvePoints: req.curvePoints,
  });
  let nextRuns: PlanResponse['nextRuns'] = null;
  if (req.nextRuns) {
    const best = result.curve.reduce((a, b) => (b.probabilityMeetsSpec > a.probabilityMeetsSpec ? b : a));
    const targetK = req.nextRuns.at ? toK(req.nextRuns.at, 'nextRuns.at') : (result.recommended?.temperatureK ?? best.temperatureK);
    const s = suggestNextRuns(fit, { targetK, fromK, toK: toKv, count: req.nextRuns.count });
    nextRuns = {
      at: kc(s.targetK),
      temperatures: s.temperaturesK.map(kc),
      halfWidthBefore: s.halfWidthBefore,
      halfWidthAfter: s.halfWidthAfter,
      meanHalfWidthBefore: s.meanHalfWidthBefore,
      meanHalfWidthAfter: s.meanHalfWidthAfter,
      note: s.note,
    };
  }
  return {
    recommended: result.recommended
      ? { ...kc(result.recommended.temperatureK), probabilityMeetsSpec: result.recommended.probabilityMeetsSpec, rule: result.rule }
      : null,
    rule: { name: result.rule, text: result.ruleText },
    window: result.window ? { from: kc(result.window.fromK), to: kc(result.window.toK) } : null,
    feasibleRanges: result.feasibleRangesK.map(([a, b]) => ({ from: kc(a), to: kc(b) })),
    binding: result.binding,
    needs: result.needs.map((n) => ({
      constraint: n.constraint,
      kind: n.kind,
      from: n.lowK === null ? null : kc(n.lowK),
      to: n.highK === null ? null : kc(n.highK),
      message: n.message,
    })),
    conflict: result.conflict ? { message: result.conflict.message, gapKelvin: result.conflict.gapK } : null,
    resolutions: result.resolutions,
    specification: { ...req.specification, lnRatio: result.specificationLnRatio },
    model: {
      kind: screenModel.kind === 'segmented' ? 'segmented' : 'straight-line',
      n: fit.nFitted,
      dof: screenModel.kind === 'segmented' ? screenModel.fit.coefficients.dof : fit.dof,
      fromKelvin: fit.temperatureRangeK.min,
      toKelvin: fit.temperatureRangeK.max,
    },
    evaluations: result.evaluations.map(point),
    curve: result.curve.map(point),
    rate: rateFit
      ? {
          order: req.rate!.order,
          dH: {
            'kJ/mol': energyFromJPerMol(rateFit.hJPerMol, 'kJ/mol'),
            'kcal/mol': energyFromJPerMol(rateFit.hJPerMol, 'kcal/mol'),
            se:
              rateFit.hSeJPerMol === null
                ? null
                : {
                    'kJ/mol': energyFromJPerMol(rateFit.hSeJPerMol, 'kJ/mol'),
                    'kcal/mol': energyFromJPerMol(rateFit.hSeJPerMol, 'kcal/mol'),
                  },
          },
          dS: {
            'J/(mol*K)': rateFit.sJPerMolK,
            'cal/(mol*K)': entropyFromJPerMolK(rateFit.sJPerMolK, 'cal/(mol*K)'),
            se:
              rateFit.sSeJPerMolK === null
                ? null
                : { 'J/(mol*K)': rateFit.sSeJPerMolK, 'cal/(mol*K)': entropyFromJPerMolK(rateFit.sSeJPerMolK, 'cal/(mol*K)') },
          },
          runs: rateFit.runs.map((r) => ({ index: r.index, kelvin: r.temperatureK, k: r.k, lowConversion: r.lowConversion })),
          kUnit: req.rate!.order === 'first' ? 's^-1' : 'M^-1 s^-1',
        }
      : null,
    nextRuns,
    warnings: [...fit.warnings, ...result.warnings],
    convention: SIGN_CONVENTION,
    caution: SELECTIVITY_CAUTION,
  };
}

/** POST /api/v1/plan. */
export function runPlan(req: PlanRequest): PlanResponse {
  return planFromScreen(
    { measurements: toEyringMeasurements(req.measurements), weighting: req.weighting, uncertaintyScale: req.uncertaintyScale },
    req,
  );
}
