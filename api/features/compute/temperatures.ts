import type { z } from 'zod';
import { temperatureToK } from '../../science';
import type { temperaturesSchema } from './schemas';

export interface ExpandedTemperatures {
  kelvins: number[];
  /** Request path of the i-th temperature. */
  pathOf(i: number): string;
}

/** A range (evenly spaced in kelvin, ends included) or a list, converted to kelvin with each field's path. */
export function expandTemperatures(input: z.infer<typeof temperaturesSchema>, field = 'temperatures'): ExpandedTemperatures {
  if ('values' in input) {
    const kelvins = input.values.map((t, i) => temperatureToK(t.value, t.unit, `${field}.values.${i}.value`));
    return { kelvins, pathOf: (i) => `${field}.values.${i}.value` };
  }
  const from = temperatureToK(input.from.value, input.from.unit, `${field}.from.value`);
  const to = temperatureToK(input.to.value, input.to.unit, `${field}.to.value`);
  const n = input.count;
  const kelvins = n === 1 ? [from] : Array.from({ length: n }, (_, i) => (i === n - 1 ? to : from + ((to - from) * i) / (n - 1)));
  return { kelvins, pathOf: (i) => (i === 0 ? `${field}.from.value` : i === n - 1 ? `${field}.to.value` : field) };
}
