/**
 * Kinetics use cases: convert a request's quantities to SI with the request path of each field,
 * run the engine, and answer in units a chemist reads (kJ/mol and kcal/mol, K and °C, seconds and
 * a readable unit). Engine errors are re-labelled with the request path so a form can point at
 * the offending field.
 */
import {
  DomainError,
  arrheniusEa,
  atropisomerClass,
  energyFromJPerMol,
  energyToJPerMol,
  entropyFromJPerMolK,
  entropyToJPerMolK,
  epimerization,
  epimerizationRates,
  erosionForecast,
  forecastRate,
  gibbsAt,
  kelvinToCelsius,
  productDistribution,
  rateConstantFromRun,
  resolveBarrier,
  temperatureToK,
  type BarrierSpec,
  type KineticRun,
  type KineticSetup,
  type RateBasis,
  type Warning,
} from '../../science';
import type { z } from 'zod';
import type {
  BarrierInput,
  DistributionRequest,
  DistributionResponse,
  ErosionRequest,
  ErosionResponse,
  RateRequest,
  RateResponse,
  measuredRunSchema,
  readableDurationSchema,
} from './schemas';
import { KINETICS_CAUTION } from '../../lib/cautions';
import { expandTemperatures, type ExpandedTemperatures } from '../compute/temperatures';

/** Shown with every time and erosion forecast (DOMAIN §9). */
/** Only a rough check for the one-run sensitivity band; DOMAIN §6 asks to show how the answer depends on ΔH‡. */
const SENSITIVITY_STEP_J_PER_MOL = 10_000;
/** Forecasts further than this from the temperature they are anchored at get a warning. */
const FAR_FROM_ANCHOR_K = 50;

// ---------- helpers ----------

type EnergyOut = { 'kJ/mol': number; 'kcal/mol': number };
type ReadableDuration = z.infer<typeof readableDurationSchema>;

const energyOut = (jPerMol: number): EnergyOut => ({
  'kJ/mol': energyFromJPerMol(jPerMol, 'kJ/mol'),
  'kcal/mol': energyFromJPerMol(jPerMol, 'kcal/mol'),
});

export const SECONDS_PER: Record<ReadableDuration['unit'], number> = { s: 1, min: 60, h: 3600, d: 86_400, y: 365.25 * 86_400 };

/** Seconds in the unit a person would say: s below 2 min, min below 2 h, h below 2 d, d below 2 years, then years. */
export function readableDuration(seconds: number): ReadableDuration {
  const unit: ReadableDuration['unit'] =
    seconds < 120 ? 's' : seconds < 7200 ? 'min' : seconds < 2 * 86_400 ? 'h' : seconds < 730.5 * 86_400 ? 'd' : 'y';
  const value = seconds / SECONDS_PER[unit];
  const shown =
    value !== 0 && (Math.abs(value) >= 1e6 || Math.abs(value) < 1e-3) ? value.toExponential(2) : String(Number(value.toPrecision(3)));
  return { s: seconds, value, unit, text: `${shown} ${unit}` };
}

/** Engine barrier from its request shape; every conversion names its own field. */
export function toBarrierSpec(b: BarrierInput, field: string): BarrierSpec {
  if (b.kind === 'gibbs') {
    return {
      kind: 'gibbs',
      gJPerMol: energyToJPerMol(b.dG.value, b.dG.unit, `${field}.dG.value`),
      temperatureK: temperatureToK(b.temperature.value, b.temperature.unit, `${field}.temperature.value`),
      ...(b.dS ? { sJPerMolK: entropyToJPerMolK(b.dS.value, b.dS.unit, `${field}.dS.value`) } : {}),
    };
  }
  return {
    kind: 'enthalpy-entropy',
    hJPerMol: energyToJPerMol(b.dH.value, b.dH.unit, `${field}.dH.value`),
    sJPerMolK: entropyToJPerMolK(b.dS.value, b.dS.unit, `${field}.dS.value`),
  };
}

const BARRIER_FIELDS: Record<string, string> = {
  gJPerMol: 'dG.value',
  temperatureK: 'temperature.value',
  sJPerMolK: 'dS.value',
  hJPerMol: 'dH.value',
};

/**
 * Rename an engine field (e.g. `temperaturesK[3]`, `basis.barrier.gJPerMol`) to the request path
 * (e.g. `temperatures.values.3.value`, `basis.dG.value`); anything unknown goes to `fallback`.
 */
type FieldRule = [RegExp, (m: RegExpMatchArray) => string];

function relabel<T>(compute: () => T, rules: FieldRule[], fallback: string): T {
  try {
    return compute();
  } catch (e) {
    if (!(e instanceof DomainError)) throw e;
    const field = e.field ?? '';
    for (const [re, to] of rules) {
      const m = field.match(re);
      if (m) throw new DomainError(e.code, e.message, to(m));
    }
    throw new DomainError(e.code, e.message, fallback);
  }
}

const temperatureRule = (t: ExpandedTemperatures): FieldRule => [/^temperaturesK\[(\d+)\]$/, (m) => t.pathOf(Number(m[1]))];
const barrierRule = (enginePrefix: string, requestPrefix: (m: RegExpMatchArray) => string): FieldRule => [
  new RegExp(`^${enginePrefix}\\.(gJPerMol|temperatureK|sJPerMolK|hJPerMol)$`),
  (m) => `${requestPrefix(m)}.${BARRIER_FIELDS[m[m.length - 1]!]}`,
];

function farFromAnchor(kelvins: number[], anchors: number[]): Warning | null {
  if (anchors.length === 0) return null;
  const worst = Math.max(...kelvins.map((t) => Math.min(...anchors.map((a) => Math.abs(t - a)))));
  if (worst <= FAR_FROM_ANCHOR_K) return null;
  return {
    code: 'far-from-anchor',
    message: `Some temperatures lie ${worst.toFixed(0)} K from the temperature the data come from; the further the extrapolation, the less it can be trusted.`,
  };
}

// ---------- distribution ----------

/** Percent of each product, per diastereomer group and its ee, and dr, over temperature (DOMAIN §5). */
export function computeDistribution(req: DistributionRequest): DistributionResponse {
  const temps = expandTemperatures(req.temperatures);
  const pathways = req.pathways.map((p, i) => ({
    id: p.label,
    barrier: toBarrierSpec(p.barrier, `pathways.${i}.barrier`),
    diastereomer: p.diastereomer,
    enantiomer: p.enantiomer,
  }));
  const result = relabel(
    () => productDistribution(pathways, temps.kelvins),
    [
      temperatureRule(temps),
      barrierRule('pathways\\[(\\d+)\\]\\.barrier', (m) => `pathways.${m[1]}.barrier`),
      [/^pathways\[(\d+)\]\.(diastereomer|enantiomer)$/, (m) => `pathways.${m[1]}.${m[2]}`],
    ],
    'pathways',
  );
  const groups = result.points[0]?.groups.map((g) => g.group) ?? [];
  const definitions = ['percents[i] is the share of all product formed through pathways[i] under kinetic control, in %.'];
  if (groups.length > 0) {
    definitions.push('ee of a diastereomer = (A − B)/(A + B) × 100 within its group: positive when the pathway marked A wins.');
  }
  if (groups.length === 2) definitions.push(`dr = ${groups[0]} : ${groups[1]}, given as the number r of r:1.`);
  return {
    pathways: req.pathways.map((p) => ({ label: p.label, diastereomer: p.diastereomer ?? null, enantiomer: p.enantiomer ?? null })),
    groups,
    points: result.points.map((pt) => ({
      kelvin: pt.temperatureK,
      celsius: pt.celsius,
      percents: pt.percents,
      groups: pt.groups.map((g) => ({ diastereomer: g.group, percent: g.percent, eePercent: g.eePercent })),
      dr: pt.diastereomerRatio,
    })),
    definitions,
    assumptions: result.assumptions,
  };
}

// ---------- rate ----------

function toSetup(s: RateRequest['setup']): KineticSetup {
  switch (s.order) {
    case 'first':
      return { order: 'first' };
    case 'pseudo-first':
      return { order: 'pseudo-first', limitingConcentrationM: s.limiting.value, excessConcentrationM: s.excess.value };
    case 'second':
      return { order: 'second', initialConcentrationM: s.initial.value };
  }
}

function toRun(r: z.infer<typeof measuredRunSchema>, field: string): KineticRun {
  return {
    conversion: r.conversionPercent / 100,
    timeS: r.time.value * SECONDS_PER[r.time.unit],
    temperatureK: temperatureToK(r.temperature.value, r.temperature.unit, `${field}.temperature.value`),
  };
}

const RUN_FIELDS: Record<string, string> = { conversion: 'conversionPercent', timeS: 'time.value', temperatureK: 'temperature.value' };

function rateRules(temps: ExpandedTemperatures): FieldRule[] {
  return [
    temperatureRule(temps),
    barrierRule('basis\\.barrier', () => 'basis'),
    [/^basis\.run\.(conversion|timeS|temperatureK)$/, (m) => `basis.run.${RUN_FIELDS[m[1]!]}`],
    [/^runs\[(\d)\]\.(conversion|timeS|temperatureK)$/, (m) => `basis.runs.${m[1]}.${RUN_FIELDS[m[2]!]}`],
    [/^basis\.assumedHJPerMol$/, () => 'basis.assumedDH.value'],
    [/^setup\.(limiting|excess|initial)ConcentrationM$/, (m) => `setup.${m[1]}.value`],
    [/^targetConversion$/, () => 'targetConversionPercent'],
    [/^basis\.kind$/, () => 'basis.kind'],
  ];
}

/** k, k_obs, half-life and time to a target conversion over temperature from a barrier or from runs (DOMAIN §6). */
export function computeRate(req: RateRequest): RateResponse {
  const temps = expandTemperatures(req.temperatures);
  const setup = toSetup(req.setup);
  const rules = rateRules(temps);
  const target = req.targetConversionPercent / 100;
  let basis: RateBasis;
  let source: RateResponse['activation']['source'];
  let runs: KineticRun[] = [];
  let anchors: number[] = [];
  const b = req.basis;
  switch (b.kind) {
    case 'gibbs':
    case 'activation': {
      const barrier = toBarrierSpec(b, 'basis');
      basis = { kind: 'barrier', barrier };
      source = 'given';
      if (barrier.kind === 'gibbs') anchors = [barrier.temperatureK];
      break;
    }
    case 'one-run':
      runs = [toRun(b.run, 'basis.run')];
      basis = {
        kind: 'one-run',
        run: runs[0]!,
        assumedHJPerMol: energyToJPerMol(b.assumedDH.value, b.assumedDH.unit, 'basis.assumedDH.value'),
      };
      source = 'assumed';
      anchors = [runs[0]!.temperatureK];
      break;
    case 'two-runs':
      runs = [toRun(b.runs[0], 'basis.runs.0'), toRun(b.runs[1], 'basis.runs.1')];
      basis = { kind: 'two-runs', runs: [runs[0]!, runs[1]!] };
      source = 'derived';
      anchors = runs.map((r) => r.temperatureK);
      break;
  }
  const forecast = relabel(() => forecastRate(basis, setup, temps.kelvins, { targetConversion: target }), rules, 'temperatures');
  const measured = runs.map((run, i) => {
    const field = b.kind === 'one-run' ? 'basis.run' : `basis.runs.${i}`;
    const { k, kObsPerS } = relabel(
      () => rateConstantFromRun(run, setup),
      [...rules, [/^run\.(\w+)$/, (m) => `${field}.${RUN_FIELDS[m[1]!] ?? m[1]}`]],
      field,
    );
    return { kelvin: run.temperatureK, celsius: kelvinToCelsius(run.temperatureK), k, kObsPerS };
  });

  const eaAt = runs.length > 0 ? runs.reduce((sum, r) => sum + r.temperatureK, 0) / runs.length : (anchors[0] ?? 298.15);
  const assumptions = [...forecast.assumptions];
  if (setup.order === 'pseudo-first') {
    assumptions.push('Pseudo-first order: the excess reagent stays at its starting concentration, so k_obs = k·[excess]₀.');
  }
  if (setup.order === 'second') {
    assumptions.push('Second order with both reactants starting at the same concentration; times scale inversely with that concentration.');
  }
  const warnings = [...forecast.warnings];
  const far = farFromAnchor(temps.kelvins, anchors);
  if (far) warnings.push(far);

  let sensitivity: RateResponse['sensitivity'] = null;
  if (basis.kind === 'one-run') {
    const oneRun = basis;
    sensitivity = {
      note: 'Times to the target conversion if ΔH‡ were 10 kJ/mol lower or higher than assumed; ΔS‡ is re-derived from the same run each time, so all variants agree at the run temperature.',
      variants: [-SENSITIVITY_STEP_J_PER_MOL, SENSITIVITY_STEP_J_PER_MOL].map((step) => {
        const h = oneRun.assumedHJPerMol + step;
        let points: { kelvin: number; celsius: number; timeToTarget: ReadableDuration }[] | null;
        try {
          const alt = forecastRate({ ...oneRun, assumedHJPerMol: h }, setup, temps.kelvins, { targetConversion: target });
          points = alt.points.map((p) => ({
            kelvin: p.temperatureK,
            celsius: p.celsius,
            timeToTarget: readableDuration(p.timeToTargetS!),
          }));
        } catch (e) {
          // A variant that leaves the representable range is reported as missing, not as a failure of the whole request.
          if (!(e instanceof DomainError)) throw e;
          points = null;
          warnings.push({
            code: 'sensitivity-out-of-range',
            message: `With ΔH‡ = ${(h / 1000).toFixed(1)} kJ/mol the times fall outside the representable range.`,
          });
        }
        return { dH: energyOut(h), points };
      }),
    };
  }

  return {
    order: setup.order,
    kUnit: setup.order === 'first' ? 's^-1' : 'L/(mol*s)',
    targetConversionPercent: req.targetConversionPercent,
    activation: {
      source,
      dH: energyOut(forecast.hJPerMol),
      dS: { 'J/(mol*K)': forecast.sJPerMolK, 'cal/(mol*K)': entropyFromJPerMolK(forecast.sJPerMolK, 'cal/(mol*K)') },
      ea: { ...energyOut(arrheniusEa(forecast.hJPerMol, eaAt)), kelvin: eaAt },
    },
    runs: measured,
    points: forecast.points.map((p) => ({
      kelvin: p.temperatureK,
      celsius: p.celsius,
      k: p.k,
      kObsPerS: p.kObsPerS,
      halfLife: readableDuration(p.halfLifeS),
      timeToTarget: readableDuration(p.timeToTargetS!),
      dG: energyOut(p.gJPerMol),
      ea: energyOut(p.arrheniusEaJPerMol),
    })),
    sensitivity,
    assumptions,
    warnings,
    caution: KINETICS_CAUTION,
  };
}

// ---------- erosion ----------

const EPIMERIZATION_DEFINITIONS = [
  'k_e is the rate constant of A → B from the Eyring equation; the reverse B → A is k_e/K with K = [B]/[A] at equilibrium.',
  'ee here is the excess of A over B, (A − B)/(A + B) × 100 (for epimers this is the de); it relaxes towards its equilibrium value as exp(−(k_e + k_e/K)·t).',
  'The half-life shown is ln 2/(k_e + k_e/K): the time for the distance from equilibrium to halve. With K = 1 it is the ee half-life ln 2/(2k_e).',
];

/** Longest hold keeping the excess ≥ floor when it relaxes to `equilibriumPercent` at rate `lambda`. */
function holdAboveFloor(
  initialPercent: number,
  floorPercent: number,
  equilibriumPercent: number,
  lambdaPerS: number,
): { seconds: number | null; status: 'above' | 'already-below' | 'never-reached' } {
  if (initialPercent <= floorPercent) return { seconds: 0, status: 'already-below' };
  if (floorPercent <= equilibriumPercent) return { seconds: null, status: 'never-reached' };
  return { seconds: Math.log((initialPercent - equilibriumPercent) / (floorPercent - equilibriumPercent)) / lambdaPerS, status: 'above' };
}

/** k_e, k_rac, ee half-life, ee after a hold and the longest hold above a floor over temperature (DOMAIN §7). */
export function computeErosion(req: ErosionRequest): ErosionResponse {
  const temps = expandTemperatures(req.temperatures);
  const barrier = toBarrierSpec(req.barrier, 'barrier');
  const holdS = req.hold ? req.hold.value * SECONDS_PER[req.hold.unit] : undefined;
  const ee0 = req.initialEePercent;
  const floor = req.eeFloorPercent;
  const epimer = req.equilibriumRatio !== undefined;
  const K = req.equilibriumRatio ?? 1;
  const equilibriumPercent = (100 * (1 - K)) / (1 + K);
  const commonRules: FieldRule[] = [
    barrierRule('barrier', () => 'barrier'),
    [/^ee0Percent$/, () => 'initialEePercent'],
    [/^floorEePercent$/, () => 'eeFloorPercent'],
    [/^(timeS|holdTimeS)$/, () => 'hold.value'],
    [/^equilibriumConstant$/, () => 'equilibriumRatio'],
  ];

  let definitions: string[] = [];
  let assumptions: string[] = [];
  const resolved = relabel(() => resolveBarrier(barrier, 'barrier'), commonRules, 'barrier');
  const points = temps.kelvins.map((t, i) => {
    const rules = [...commonRules, temperatureRule(temps)];
    const at = temps.pathOf(i);
    let ke: number;
    let kr: number;
    let afterHold: number | null = null;
    let hold: { seconds: number | null; status: 'above' | 'already-below' | 'never-reached' } | null = null;
    if (!epimer) {
      const r = relabel(() => erosionForecast(barrier, [t], { ee0Percent: ee0, holdTimeS: holdS, floorEePercent: floor }), rules, at);
      if (i === 0) ({ definitions, assumptions } = r);
      const p = r.points[0]!;
      ke = p.kOneWayPerS;
      kr = ke;
      afterHold = p.eeAfterHoldPercent;
      if (floor !== undefined) hold = { seconds: p.longestHoldS, status: ee0 <= floor ? 'already-below' : 'above' };
    } else {
      ({ kForwardPerS: ke, kReversePerS: kr } = relabel(() => epimerizationRates(barrier, K, t), rules, at));
      if (holdS !== undefined) {
        const state = relabel(() => epimerization(ke, kr, (1 + ee0 / 100) / 2, holdS), rules, at);
        afterHold = 100 * (2 * state.fractionA - 1);
      }
      if (floor !== undefined) hold = holdAboveFloor(ee0, floor, equilibriumPercent, ke + kr);
    }
    const lambda = ke + kr;
    const halfLifeS = Math.LN2 / lambda;
    if (!Number.isFinite(halfLifeS) || (hold?.seconds != null && !Number.isFinite(hold.seconds))) {
      throw new DomainError('result-out-of-range', `the barrier is too high to give a finite time at ${t.toFixed(2)} K`, at);
    }
    return {
      kelvin: t,
      celsius: kelvinToCelsius(t),
      dG: energyOut(gibbsAt(resolved, t, at)),
      kePerS: ke,
      kReversePerS: kr,
      kRacPerS: epimer ? null : 2 * ke,
      kRelaxationPerS: lambda,
      eeHalfLife: readableDuration(halfLifeS),
      eeAfterHoldPercent: afterHold,
      longestHold: hold === null || hold.seconds === null ? null : readableDuration(hold.seconds),
      floorStatus: hold === null ? null : hold.status,
    };
  });

  if (epimer) {
    definitions = [...EPIMERIZATION_DEFINITIONS];
    assumptions = [
      'Epimerization A ⇌ B is first order in both directions with constant ΔH‡ and ΔS‡; no other pathway consumes either epimer.',
      `The equilibrium ratio K = [B]/[A] = ${K} is taken as the same at every temperature.`,
    ];
    if (resolved.entropyAssumedZero) assumptions.push('ΔS‡ of epimerization assumed 0: the barrier is treated as purely enthalpic.');
  }

  const cls = relabel(() => atropisomerClass(barrier), commonRules, 'barrier');
  const warnings: Warning[] = [];
  if (floor !== undefined && floor >= ee0) {
    warnings.push({
      code: 'floor-not-below-initial',
      message: `The ee floor (${floor} %) is not below the initial ee (${ee0} %): no hold keeps ee above it.`,
    });
  }
  if (epimer && floor !== undefined && floor <= equilibriumPercent) {
    warnings.push({
      code: 'floor-below-equilibrium',
      message: `The floor lies at or below the equilibrium excess (${equilibriumPercent.toFixed(1)} %), so epimerization never takes the material below it.`,
    });
  }
  const far = barrier.kind === 'gibbs' ? farFromAnchor(temps.kelvins, [barrier.temperatureK]) : null;
  if (far) warnings.push(far);

  return {
    model: epimer ? 'epimerization' : 'racemization',
    equilibrium: epimer ? { ratio: K, excessPercent: equilibriumPercent } : null,
    points,
    atropisomerClass: {
      class: cls.atropisomerClass,
      kelvin: cls.temperatureK,
      dG: energyOut(energyToJPerMol(cls.barrierKcalPerMol, 'kcal/mol')),
      eeHalfLife: readableDuration(cls.eeHalfLifeS),
      description: cls.description,
      definition: cls.definition,
      source: `[M] recalled from memory, verify before relying on it: ${cls.source}`,
    },
    definitions,
    assumptions,
    warnings,
    caution: KINETICS_CAUTION,
  };
}
