import type { EnergyUnit, EntropyUnit } from './forecast-form';
import type { TemperatureUnit } from './parse-screen';

/** The text of a barrier as typed: ΔG‡ at a temperature (ΔS‡ optional), or ΔH‡ with ΔS‡; the rate and erosion forms both hold it. */
export interface BarrierText {
  dG: string;
  dGUnit: EnergyUnit;
  dGTemperature: string;
  dGTemperatureUnit: TemperatureUnit;
  dH: string;
  dHUnit: EnergyUnit;
  dS: string;
  dSUnit: EntropyUnit;
}
