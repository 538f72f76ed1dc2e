/**
 * Invented dr runs for report tests and the report benchmark (no database): ln r follows
 * ΔΔH‡ = 9 kJ/mol and ΔΔS‡ = 4 J/(mol·K) [C], stored as "a:1" to one decimal.
 */
import type { Measurement } from '../../api/models/measurement';
import { GAS_CONSTANT_J_PER_MOL_K as R } from '../../api/science/constants';

/** ln r of the invented screen at `temperatureK`, moved by `offset`. */
function inventedLnRatio(temperatureK: number, offset = 0): number {
  return 9000 / (R * temperatureK) - 4 / R + offset;
}

/**
 * One run at `temperatureK` whose ln r lies `offset` from the invented line: converted to 90 %,
 * not a bound, no stated uncertainty; `fields` adds or replaces the rest (id, sample, time…).
 */
export function inventedDrRun(
  campaignId: string,
  temperatureK: number,
  offset: number,
  fields: Partial<Record<keyof Measurement, unknown>>,
): Measurement {
  return {
    campaignId,
    temperatureK,
    measure: 'dr',
    value: Math.round(Math.exp(inventedLnRatio(temperatureK, offset)) * 10) / 10,
    valueB: 1,
    isLowerBound: false,
    uncertainty: null,
    conversionPercent: 90,
    notes: null,
    ...fields,
  } as unknown as Measurement;
}
