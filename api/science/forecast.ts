/**
 * Selectivity forecast over temperature from a two-parameter model of the energy gap
 * (api/science/README.md §1): ΔΔG‡(T) = ΔΔH‡ − T·ΔΔS‡, r = exp(ΔΔG‡/RT), constant ΔΔH‡ and ΔΔS‡.
 */
import { GAS_CONSTANT_J_PER_MOL_K as R } from './constants';
import { DomainError, requireFinite, requireTemperatureK } from './errors';
import { eeFromLnRatioAndRatio, percentAFromLnRatioAndRatio } from './quantities';
import { parseSelectivity, ratioFromDdG, SIGN_CONVENTION, type SelectivityInput } from './selectivity';
import { describeTemperatureK, kelvinToCelsius, temperatureToK, type TemperatureUnit } from './units';

/** The three ways a forecast can be anchored. ΔΔS‡ defaults to 0 in the one-temperature forms. */
export type ForecastBasis =
  | { kind: 'enthalpy-entropy'; ddHJPerMol: number; ddSJPerMolK: number }
  | { kind: 'gap-at-temperature'; ddGJPerMol: number; temperatureK: number; ddSJPerMolK?: number }
  | { kind: 'observed'; selectivity: SelectivityInput; temperatureK: number; ddSJPerMolK?: number };

export interface ForecastPoint {
  kelvin: number;
  celsius: number;
  ratio: number;
  eePercent: number;
  percentA: number;
  ddGJPerMol: number;
}

export interface SelectivityForecast {
  convention: string;
  ddHJPerMol: number;
  ddSJPerMolK: number;
  /** T₀ = ΔΔH‡/ΔΔS‡ where selectivity vanishes, when positive and finite; else null. */
  zeroSelectivityTemperatureK: number | null;
  points: ForecastPoint[];
  /** Plain-language statements of what the forecast takes for granted. */
  assumptions: string[];
}

/** Largest list the engine will build in one call. */
export const MAX_TEMPERATURE_COUNT = 5000;

/**
 * Zero-selectivity temperature T₀ = ΔΔH‡/ΔΔS‡ (api/science/README.md §4): where ΔΔG‡(T₀) = 0 and the preferred
 * isomer inverts. Null unless ΔΔH‡ and ΔΔS‡ are non-zero with the same sign.
 */
export function zeroSelectivityTemperatureK(ddHJPerMol: number, ddSJPerMolK: number): number | null {
  if (ddSJPerMolK === 0 || ddHJPerMol === 0) return null;
  const t0 = ddHJPerMol / ddSJPerMolK;
  return Number.isFinite(t0) && t0 > 0 ? t0 : null;
}

/** One forecast point from ΔΔH‡, ΔΔS‡ at T: ΔΔG‡ = ΔΔH‡ − TΔΔS‡, r = e^(ΔΔG‡/RT), ee = tanh(ΔΔG‡/2RT), %A = 100/(1 + e^(−ΔΔG‡/RT)). */
export function forecastPoint(ddHJPerMol: number, ddSJPerMolK: number, temperatureK: number, field = 'temperatureK'): ForecastPoint {
  return pointAt(ddHJPerMol, ddSJPerMolK, temperatureK, () => field);
}

/** forecastPoint with the field's name built only for an error (a name per temperature was a share of a forecast's time). */
function pointAt(ddHJPerMol: number, ddSJPerMolK: number, temperatureK: number, fieldOf: () => string): ForecastPoint {
  if (!(temperatureK > 0 && Number.isFinite(temperatureK))) requireTemperatureK(temperatureK, fieldOf());
  const ddG = ddHJPerMol - temperatureK * ddSJPerMolK;
  const y = ddG / (R * temperatureK);
  let ratio: number;
  try {
    ratio = ratioFromDdG(ddG, temperatureK);
  } catch (e) {
    if (e instanceof DomainError) throw new DomainError(e.code, `${e.message} at ${temperatureK} K`, fieldOf());
    throw e;
  }
  return {
    kelvin: temperatureK,
    celsius: kelvinToCelsius(temperatureK),
    ratio,
    eePercent: eeFromLnRatioAndRatio(y, ratio),
    percentA: percentAFromLnRatioAndRatio(y, ratio),
    ddGJPerMol: ddG,
  };
}

/**
 * Forecast r, ee, %A and ΔΔG‡ over `temperaturesK` from (a) ΔΔH‡ + ΔΔS‡, (b) ΔΔG‡ at one T
 * (ΔΔH‡ = ΔΔG‡ + T·ΔΔS‡, ΔΔS‡ given or 0) or (c) an observed selectivity at one T
 * (ΔΔG‡ = RT·ln r, then as (b)). Equations: api/science/README.md §1 (Eyring, constant activation parameters).
 */
export function forecastSelectivity(basis: ForecastBasis, temperaturesK: readonly number[]): SelectivityForecast {
  const assumptions: string[] = [];
  let ddH: number;
  let ddS: number;
  switch (basis.kind) {
    case 'enthalpy-entropy':
      ddH = requireFinite(basis.ddHJPerMol, 'basis.ddHJPerMol');
      ddS = requireFinite(basis.ddSJPerMolK, 'basis.ddSJPerMolK');
      break;
    case 'gap-at-temperature':
    case 'observed': {
      const t = requireTemperatureK(basis.temperatureK, 'basis.temperatureK');
      const ddG =
        basis.kind === 'observed'
          ? R * t * Math.log(parseSelectivity(basis.selectivity, 'basis.selectivity'))
          : requireFinite(basis.ddGJPerMol, 'basis.ddGJPerMol');
      if (basis.ddSJPerMolK === undefined) {
        ddS = 0;
        assumptions.push(
          'ΔΔS‡ assumed 0: the energy gap is treated as purely enthalpic, so the forecast changes with temperature only through ln r ∝ 1/T; a real entropy difference can make the true trend weaker, stronger or even reversed.',
        );
      } else {
        ddS = requireFinite(basis.ddSJPerMolK, 'basis.ddSJPerMolK');
      }
      ddH = ddG + t * ddS;
      if (basis.kind === 'observed') {
        assumptions.push(
          `The observed selectivity at ${t.toFixed(2)} K is taken as exact and as set by the selectivity-determining step under kinetic control.`,
        );
      }
      break;
    }
    default:
      throw new DomainError('unknown-basis', 'basis.kind must be enthalpy-entropy, gap-at-temperature or observed', 'basis.kind');
  }
  assumptions.push(
    'ΔΔH‡ and ΔΔS‡ are taken as independent of temperature (no heat-capacity difference between the two transition states) and the same mechanism is assumed at every temperature.',
    'Kinetic control is assumed: the product ratio reflects the transition-state gap, not product stability, with no racemic background reaction and no erosion after the reaction.',
  );
  const t0 = zeroSelectivityTemperatureK(ddH, ddS);
  if (t0 !== null) {
    assumptions.push(
      `Selectivity vanishes at T₀ = ΔΔH‡/ΔΔS‡ ≈ ${describeTemperatureK(t0)} and inverts beyond it; this is usually a far extrapolation of a straight line and should be read as such.`,
    );
  }
  if (!Array.isArray(temperaturesK) || temperaturesK.length === 0) {
    throw new DomainError('no-temperatures', 'at least one temperature is needed', 'temperaturesK');
  }
  if (temperaturesK.length > MAX_TEMPERATURE_COUNT) {
    throw new DomainError('count-out-of-range', `at most ${MAX_TEMPERATURE_COUNT} temperatures per forecast`, 'temperaturesK');
  }
  const points = temperaturesK.map((t, i) => pointAt(ddH, ddS, t, () => `temperaturesK[${i}]`));
  return { convention: SIGN_CONVENTION, ddHJPerMol: ddH, ddSJPerMolK: ddS, zeroSelectivityTemperatureK: t0, points, assumptions };
}

export interface TemperatureListSpec {
  from: number;
  to: number;
  /** 1 … 5000 points, evenly spaced in temperature, both ends included. */
  count: number;
  /** Unit of `from` and `to`; default 'K'. */
  unit?: TemperatureUnit;
}

/** Evenly spaced temperatures in kelvin from `from` to `to` inclusive. count = 1 needs from = to. */
export function temperatureList(spec: TemperatureListSpec): number[] {
  const unit = spec.unit ?? 'K';
  const from = temperatureToK(spec.from, unit, 'from');
  const to = temperatureToK(spec.to, unit, 'to');
  const count = spec.count;
  if (!Number.isInteger(count) || count < 1 || count > MAX_TEMPERATURE_COUNT) {
    throw new DomainError('count-out-of-range', `count must be an integer from 1 to ${MAX_TEMPERATURE_COUNT}`, 'count');
  }
  if (count === 1) {
    if (from !== to) throw new DomainError('count-out-of-range', 'count = 1 needs from = to', 'count');
    return [from];
  }
  const step = (to - from) / (count - 1);
  return Array.from({ length: count }, (_, i) => (i === count - 1 ? to : from + i * step));
}
