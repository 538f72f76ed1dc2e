/**
 * Loss of stereochemical purity after the reaction (api/science/README.md §7).
 *
 * Racemization R ⇌ S with one-way rate constant k_e (Eyring, from the barrier):
 *   d(ee)/dt = −2k_e·ee  ⇒  ee(t) = ee₀·exp(−2k_e t),  ee half-life t½ = ln2/(2k_e).
 * Many authors call 2k_e "k_rac"; both are reported and labelled.
 */
import { resolveBarrier, type BarrierSpec } from './activation';
import { DomainError, requireFinite, requireFiniteResult, requireTemperatureK } from './errors';
import { MAX_TEMPERATURE_COUNT } from './forecast';
import { eyringRateConstant } from './rate';
import { energyFromJPerMol, kelvinToCelsius } from './units';

/** Plain statement of the definitions used, for display beside any erosion number. */
export const EROSION_DEFINITIONS = [
  'k_e is the one-way rate constant of R → S (equal to S → R) from the Eyring equation.',
  'k_rac = 2k_e is the rate constant of ee decay: ee(t) = ee₀·exp(−k_rac·t); some authors call k_e itself k_rac.',
  'The ee half-life is the time for ee to halve: t½ = ln 2/(2k_e) = ln 2/k_rac.',
];

function requireEe(eePercent: number, field: string): number {
  requireFinite(eePercent, field);
  if (Math.abs(eePercent) > 100) throw new DomainError('ee-out-of-range', `${field} must lie between −100 and 100 %`, field);
  return eePercent;
}

function requireRate(k: number, field: string): number {
  requireFinite(k, field);
  if (!(k > 0)) throw new DomainError('rate-not-positive', `${field} must be positive`, field);
  return k;
}

/** One-way racemization (or epimerization) rate constant k_e = (k_B T/h)·exp(−ΔG‡(T)/RT). */
export function racemizationRateConstant(barrier: BarrierSpec, temperatureK: number, kappa = 1): number {
  const b = resolveBarrier(barrier);
  requireTemperatureK(temperatureK, 'temperatureK');
  return eyringRateConstant(b.hJPerMol - temperatureK * b.sJPerMolK, temperatureK, kappa);
}

/** ee after time t: ee(t) = ee₀·exp(−2k_e·t) (first-order reversible R ⇌ S with equal rates). */
export function eeAfterTime(ee0Percent: number, kOneWayPerS: number, timeS: number): number {
  requireEe(ee0Percent, 'ee0Percent');
  requireRate(kOneWayPerS, 'kOneWayPerS');
  requireFinite(timeS, 'timeS');
  if (timeS < 0) throw new DomainError('time-negative', 'timeS must not be negative', 'timeS');
  return ee0Percent * Math.exp(-2 * kOneWayPerS * timeS);
}

/** ee half-life t½ = ln2/(2k_e). */
export function eeHalfLifeS(kOneWayPerS: number): number {
  requireRate(kOneWayPerS, 'kOneWayPerS');
  return requireFiniteResult(Math.LN2 / (2 * kOneWayPerS), 'half-life', 'kOneWayPerS');
}

/**
 * Longest hold keeping |ee| ≥ floor: t = ln(|ee₀|/floor)/(2k_e); 0 when |ee₀| is already at or
 * below the floor.
 */
export function longestHoldS(ee0Percent: number, floorEePercent: number, kOneWayPerS: number): number {
  requireEe(ee0Percent, 'ee0Percent');
  requireFinite(floorEePercent, 'floorEePercent');
  if (!(floorEePercent > 0 && floorEePercent <= 100)) {
    throw new DomainError('floor-out-of-range', 'floorEePercent must lie in (0, 100]', 'floorEePercent');
  }
  requireRate(kOneWayPerS, 'kOneWayPerS');
  const ee0 = Math.abs(ee0Percent);
  if (ee0 <= floorEePercent) return 0;
  return requireFiniteResult(Math.log(ee0 / floorEePercent) / (2 * kOneWayPerS), 'hold time', 'kOneWayPerS');
}

export interface ErosionPoint {
  temperatureK: number;
  celsius: number;
  kOneWayPerS: number;
  /** 2k_e, the ee decay constant. */
  kRacPerS: number;
  eeHalfLifeS: number;
  eeAfterHoldPercent: number | null;
  longestHoldS: number | null;
}

/** k_e, k_rac, ee half-life, ee after a hold and the longest hold above a floor, over temperature. */
export function erosionForecast(
  barrier: BarrierSpec,
  temperaturesK: readonly number[],
  options: { ee0Percent: number; holdTimeS?: number; floorEePercent?: number; kappa?: number },
): { definitions: string[]; assumptions: string[]; points: ErosionPoint[] } {
  const resolved = resolveBarrier(barrier);
  requireEe(options.ee0Percent, 'ee0Percent');
  if (!Array.isArray(temperaturesK) || temperaturesK.length === 0 || temperaturesK.length > MAX_TEMPERATURE_COUNT) {
    throw new DomainError('count-out-of-range', `give 1 to ${MAX_TEMPERATURE_COUNT} temperatures`, 'temperaturesK');
  }
  const points = temperaturesK.map((t, i) => {
    requireTemperatureK(t, `temperaturesK[${i}]`);
    const ke = eyringRateConstant(resolved.hJPerMol - t * resolved.sJPerMolK, t, options.kappa ?? 1);
    return {
      temperatureK: t,
      celsius: kelvinToCelsius(t),
      kOneWayPerS: ke,
      kRacPerS: 2 * ke,
      eeHalfLifeS: eeHalfLifeS(ke),
      eeAfterHoldPercent: options.holdTimeS === undefined ? null : eeAfterTime(options.ee0Percent, ke, options.holdTimeS),
      longestHoldS: options.floorEePercent === undefined ? null : longestHoldS(options.ee0Percent, options.floorEePercent, ke),
    };
  });
  const assumptions = [
    'Racemization is first order and reversible with equal forward and reverse rates (no other pathway consumes either enantiomer).',
  ];
  if (resolved.entropyAssumedZero) assumptions.push('ΔS‡ of racemization assumed 0: the barrier is treated as purely enthalpic.');
  return { definitions: [...EROSION_DEFINITIONS], assumptions, points };
}

export interface EpimerizationState {
  fractionA: number;
  fractionB: number;
  /** K = [B]/[A] at equilibrium = k_f/k_r. */
  equilibriumConstant: number;
  equilibriumFractionA: number;
  /** Relaxation rate k_f + k_r. */
  relaxationRatePerS: number;
  /** Time for the distance from equilibrium to halve: ln2/(k_f + k_r). */
  relaxationHalfLifeS: number;
}

/**
 * Epimerization A ⇌ B (k_f: A → B, k_r: B → A) towards K = k_f/k_r = [B]/[A]:
 *   x_A(t) = x_A,eq + (x_A,0 − x_A,eq)·exp(−(k_f + k_r)t),  x_A,eq = k_r/(k_f + k_r).
 */
export function epimerization(kForwardPerS: number, kReversePerS: number, fractionA0: number, timeS: number): EpimerizationState {
  requireRate(kForwardPerS, 'kForwardPerS');
  requireRate(kReversePerS, 'kReversePerS');
  requireFinite(fractionA0, 'fractionA0');
  if (fractionA0 < 0 || fractionA0 > 1) throw new DomainError('fraction-out-of-range', 'fractionA0 must lie between 0 and 1', 'fractionA0');
  requireFinite(timeS, 'timeS');
  if (timeS < 0) throw new DomainError('time-negative', 'timeS must not be negative', 'timeS');
  const sum = kForwardPerS + kReversePerS;
  const eqA = kReversePerS / sum;
  const fractionA = eqA + (fractionA0 - eqA) * Math.exp(-sum * timeS);
  return {
    fractionA,
    fractionB: 1 - fractionA,
    equilibriumConstant: requireFiniteResult(kForwardPerS / kReversePerS, 'equilibrium constant'),
    equilibriumFractionA: eqA,
    relaxationRatePerS: sum,
    relaxationHalfLifeS: requireFiniteResult(Math.LN2 / sum, 'relaxation half-life'),
  };
}

/** Excess of A over B at equilibrium, 100·(1 − K)/(1 + K) %, for K = [B]/[A] (0 % when K = 1). */
export function equilibriumExcessPercent(equilibriumConstant: number): number {
  return (100 * (1 - equilibriumConstant)) / (1 + equilibriumConstant);
}

/**
 * Longest hold keeping the excess at or above `floorPercent` while it relaxes towards
 * `equilibriumPercent` as excess(t) = eq + (excess₀ − eq)·exp(−λt), λ = k_f + k_r:
 * t = ln((excess₀ − eq)/(floor − eq))/λ. None when the start is already at or below the floor;
 * unlimited (null) when the floor lies at or below equilibrium.
 */
export function epimerizationHoldAboveFloor(
  initialPercent: number,
  floorPercent: number,
  equilibriumPercent: number,
  relaxationRatePerS: number,
): { seconds: number | null; status: 'above' | 'already-below' | 'never-reached' } {
  if (initialPercent <= floorPercent) return { seconds: 0, status: 'already-below' };
  if (floorPercent <= equilibriumPercent) return { seconds: null, status: 'never-reached' };
  return {
    seconds: Math.log((initialPercent - equilibriumPercent) / (floorPercent - equilibriumPercent)) / relaxationRatePerS,
    status: 'above',
  };
}

/** k_f from the A → B barrier and k_r = k_f/K for a given equilibrium constant K = [B]/[A]. */
export function epimerizationRates(
  barrierForward: BarrierSpec,
  equilibriumConstant: number,
  temperatureK: number,
): { kForwardPerS: number; kReversePerS: number } {
  requireFinite(equilibriumConstant, 'equilibriumConstant');
  if (!(equilibriumConstant > 0)) throw new DomainError('not-positive', 'equilibriumConstant must be positive', 'equilibriumConstant');
  const kf = racemizationRateConstant(barrierForward, temperatureK);
  return { kForwardPerS: kf, kReversePerS: requireFiniteResult(kf / equilibriumConstant, 'reverse rate') };
}

/** Body temperature used for the atropisomer classes, 37 °C. */
export const ATROPISOMER_CLASS_TEMPERATURE_K = 310.15;

/**
 * Atropisomer class by the rotation barrier at 37 °C (api/science/README.md §7; LaPlante et al.,
 * J. Med. Chem. 2011, 54, 7005): class 1 below 20 kcal/mol (interconverts in minutes
 * or less), class 2 from 20 to below 30 kcal/mol (minutes to years), class 3 at 30 kcal/mol or
 * more (stable for years). The half-life reported is the ee half-life ln2/(2k_e).
 */
export function atropisomerClass(barrier: BarrierSpec): {
  atropisomerClass: 1 | 2 | 3;
  barrierKcalPerMol: number;
  temperatureK: number;
  eeHalfLifeS: number;
  description: string;
  definition: string;
  source: string;
} {
  const b = resolveBarrier(barrier);
  const t = ATROPISOMER_CLASS_TEMPERATURE_K;
  const g = b.hJPerMol - t * b.sJPerMolK;
  const kcal = energyFromJPerMol(g, 'kcal/mol');
  const cls: 1 | 2 | 3 = kcal < 20 ? 1 : kcal < 30 ? 2 : 3;
  const description =
    cls === 1
      ? 'Class 1: interconverts in minutes or less at 37 °C; treat as a single rapidly equilibrating species.'
      : cls === 2
        ? 'Class 2: interconverts over minutes to years at 37 °C; the riskiest class for development.'
        : 'Class 3: stable for years at 37 °C; can be developed as a single atropisomer.';
  return {
    atropisomerClass: cls,
    barrierKcalPerMol: kcal,
    temperatureK: t,
    eeHalfLifeS: eeHalfLifeS(eyringRateConstant(g, t)),
    description,
    definition: 'Half-life shown is the ee half-life, t½ = ln 2/(2k_e), with k_e the one-way Eyring rate constant at 37 °C.',
    source:
      'LaPlante, S. R.; Fader, L. D.; Fandrick, K. R.; et al. Assessing atropisomer axial chirality in drug discovery and development. J. Med. Chem. 2011, 54, 7005 (class boundaries 20 and 30 kcal/mol at 37 °C).',
  };
}
