import { CELSIUS_OFFSET_K, THERMOCHEMICAL_CALORIE_J } from './constants';
import { DomainError, requireFinite, requireTemperatureK } from './errors';
import { TEMPERATURE_UNITS, type TemperatureUnit } from './quantities';

/** Molar energy units accepted at the boundary (ASCII spelling). */
export const ENERGY_UNITS = ['J/mol', 'kJ/mol', 'cal/mol', 'kcal/mol'] as const;
export type EnergyUnit = (typeof ENERGY_UNITS)[number];

/** Molar entropy units accepted at the boundary; cal/(mol*K) is the "entropy unit" (e.u.). */
export const ENTROPY_UNITS = ['J/(mol*K)', 'cal/(mol*K)'] as const;
export type EntropyUnit = (typeof ENTROPY_UNITS)[number];

/** Temperature units: kelvin, degree Celsius, degree Fahrenheit (defined in quantities.ts). */
export { TEMPERATURE_UNITS, type TemperatureUnit };

const ENERGY_FACTOR_J: Record<EnergyUnit, number> = {
  'J/mol': 1,
  'kJ/mol': 1000,
  'cal/mol': THERMOCHEMICAL_CALORIE_J,
  'kcal/mol': 1000 * THERMOCHEMICAL_CALORIE_J,
};

const ENTROPY_FACTOR_J: Record<EntropyUnit, number> = {
  'J/(mol*K)': 1,
  'cal/(mol*K)': THERMOCHEMICAL_CALORIE_J,
};

export function isEnergyUnit(unit: string): unit is EnergyUnit {
  return (ENERGY_UNITS as readonly string[]).includes(unit);
}
export function isEntropyUnit(unit: string): unit is EntropyUnit {
  return (ENTROPY_UNITS as readonly string[]).includes(unit);
}
export function isTemperatureUnit(unit: string): unit is TemperatureUnit {
  return (TEMPERATURE_UNITS as readonly string[]).includes(unit);
}

function unitError(unit: string, allowed: readonly string[], field: string): DomainError {
  return new DomainError('unknown-unit', `unknown unit "${unit}"; expected one of ${allowed.join(', ')}`, field);
}

/**
 * Molar energy to J/mol. 1 kcal = 4184 J (thermochemical calorie, NIST SP 811).
 */
export function energyToJPerMol(value: number, unit: EnergyUnit, field = 'energy'): number {
  requireFinite(value, field);
  if (!isEnergyUnit(unit)) throw unitError(unit, ENERGY_UNITS, field);
  return value * ENERGY_FACTOR_J[unit];
}

/** J/mol to the given molar energy unit (inverse of {@link energyToJPerMol}). */
export function energyFromJPerMol(valueJPerMol: number, unit: EnergyUnit, field = 'energy'): number {
  requireFinite(valueJPerMol, field);
  if (!isEnergyUnit(unit)) throw unitError(unit, ENERGY_UNITS, field);
  return valueJPerMol / ENERGY_FACTOR_J[unit];
}

/** Molar entropy to J/(mol·K); 1 cal/(mol·K) = 4.184 J/(mol·K) (NIST SP 811). */
export function entropyToJPerMolK(value: number, unit: EntropyUnit, field = 'entropy'): number {
  requireFinite(value, field);
  if (!isEntropyUnit(unit)) throw unitError(unit, ENTROPY_UNITS, field);
  return value * ENTROPY_FACTOR_J[unit];
}

/** J/(mol·K) to the given entropy unit (inverse of {@link entropyToJPerMolK}). */
export function entropyFromJPerMolK(valueJPerMolK: number, unit: EntropyUnit, field = 'entropy'): number {
  requireFinite(valueJPerMolK, field);
  if (!isEntropyUnit(unit)) throw unitError(unit, ENTROPY_UNITS, field);
  return valueJPerMolK / ENTROPY_FACTOR_J[unit];
}

/**
 * Temperature to kelvin: T(K) = T(°C) + 273.15; T(K) = (T(°F) + 459.67)·5/9 (SI definitions).
 * Throws `temperature-not-positive` for results at or below 0 K.
 */
export function temperatureToK(value: number, unit: TemperatureUnit, field = 'temperature'): number {
  requireFinite(value, field);
  let kelvin: number;
  switch (unit) {
    case 'K':
      kelvin = value;
      break;
    case 'C':
      kelvin = value + CELSIUS_OFFSET_K;
      break;
    case 'F':
      kelvin = ((value - 32) * 5) / 9 + CELSIUS_OFFSET_K;
      break;
    default:
      throw unitError(unit, TEMPERATURE_UNITS, field);
  }
  return requireTemperatureK(kelvin, field);
}

/** Kelvin to the given temperature unit (inverse of {@link temperatureToK}); requires T > 0 K. */
export function temperatureFromK(kelvin: number, unit: TemperatureUnit, field = 'temperature'): number {
  requireTemperatureK(kelvin, field);
  switch (unit) {
    case 'K':
      return kelvin;
    case 'C':
      return kelvin - CELSIUS_OFFSET_K;
    case 'F':
      return ((kelvin - CELSIUS_OFFSET_K) * 9) / 5 + 32;
    default:
      throw unitError(unit, TEMPERATURE_UNITS, field);
  }
}

/** Kelvin to degrees Celsius (no validation beyond finiteness; used for display columns). */
export function kelvinToCelsius(kelvin: number): number {
  return kelvin - CELSIUS_OFFSET_K;
}

/** A temperature for messages: kelvin to 0.01 K with degrees Celsius beside it, e.g. "273.15 K (0.0 °C)". */
export function describeTemperatureK(kelvin: number): string {
  const celsius = kelvin - CELSIUS_OFFSET_K;
  return `${kelvin.toFixed(2)} K (${(Math.abs(celsius) < 0.05 ? 0 : celsius).toFixed(1).replace('-', '−')} °C)`;
}
