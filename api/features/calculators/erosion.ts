/** POST /api/v1/erosion: how fast ee erodes (racemization or epimerization) and the longest hold above a floor. */
import {
  DomainError,
  atropisomerClass,
  energyToJPerMol,
  equilibriumExcessPercent,
  epimerization,
  epimerizationHoldAboveFloor,
  epimerizationRates,
  erosionForecast,
  gibbsAt,
  kelvinToCelsius,
  resolveBarrier,
  type Warning,
} from '../../science';
import type { ErosionRequest, ErosionResponse } from './kinetics-schemas';
import { KINETICS_CAUTION } from '../../lib/cautions';
import { SECONDS_PER } from '../../science/quantities';
import { expandTemperatures } from './temperatures';
import {
  energyOut,
  readableDuration,
  toBarrierSpec,
  relabel,
  temperatureRule,
  barrierRule,
  farFromAnchor,
  type FieldRule,
} from './kinetics-fields';

const EPIMERIZATION_DEFINITIONS = [
  'k_e is the rate constant of A → B from the Eyring equation; the reverse B → A is k_e/K with K = [B]/[A] at equilibrium.',
  'ee here is the excess of A over B, (A − B)/(A + B) × 100 (for epimers this is the de); it relaxes towards its equilibrium value as exp(−(k_e + k_e/K)·t).',
  'The half-life shown is ln 2/(k_e + k_e/K): the time for the distance from equilibrium to halve. With K = 1 it is the ee half-life ln 2/(2k_e).',
];

/** k_e, k_rac, ee half-life, ee after a hold and the longest hold above a floor over temperature (api/science/README.md §7). */
export function computeErosion(req: ErosionRequest): ErosionResponse {
  const temps = expandTemperatures(req.temperatures);
  const barrier = toBarrierSpec(req.barrier, 'barrier');
  const holdS = req.hold ? req.hold.value * SECONDS_PER[req.hold.unit] : undefined;
  const ee0 = req.initialEePercent;
  const floor = req.eeFloorPercent;
  const epimer = req.equilibriumRatio !== undefined;
  const K = req.equilibriumRatio ?? 1;
  const equilibriumPercent = equilibriumExcessPercent(K);
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
      if (floor !== undefined) hold = epimerizationHoldAboveFloor(ee0, floor, equilibriumPercent, ke + kr);
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
      source: cls.source,
    },
    definitions,
    assumptions,
    warnings,
    caution: KINETICS_CAUTION,
  };
}
