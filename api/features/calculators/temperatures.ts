import type { z } from 'zod';
import { temperatureToK } from '../../science';
import { BadRequestError } from '../../lib/errors';
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
  if (n === 1 && Math.abs(to - from) > 1e-9) {
    throw new BadRequestError(`${field}.count is 1 but the range runs from ${from} K to ${to} K.`, [
      {
        path: `${field}.count`,
        message: 'a range from one temperature to a different one needs a count of at least 2 (or give to equal to from)',
      },
    ]);
  }
  const kelvins = n === 1 ? [from] : Array.from({ length: n }, (_, i) => (i === n - 1 ? to : from + ((to - from) * i) / (n - 1)));
  return { kelvins, pathOf: (i) => (i === 0 ? `${field}.from.value` : i === n - 1 ? `${field}.to.value` : field) };
}

/**
 * Screens run roughly between −100 and +150 °C, so a value of 190 to 400 labelled °C or °F is
 * probably a kelvin reading in the wrong unit. One rule for the importer and the calculator.
 */
export function looksLikeKelvin(value: number, unit: 'K' | 'C' | 'F'): boolean {
  return unit !== 'K' && value >= 190 && value <= 400;
}

/** The calculator's warning for temperatures that look like kelvin labelled °C/°F, or null. */
export function kelvinLookingWarning(
  temperatures: readonly { value: number; unit: 'K' | 'C' | 'F' }[],
): { code: string; message: string } | null {
  const odd = temperatures.filter((t) => looksLikeKelvin(t.value, t.unit));
  if (odd.length === 0) return null;
  const unit = odd[0]!.unit === 'C' ? '°C' : '°F';
  const shown = odd
    .slice(0, 3)
    .map((t) => String(Math.round(t.value * 100) / 100))
    .join(', ');
  return {
    code: 'temperature-looks-like-kelvin',
    message: `${odd.length} ${odd.length === 1 ? 'temperature' : 'temperatures'} labelled ${unit} (${shown}${odd.length > 3 ? ', …' : ''}) ${odd.length === 1 ? 'looks' : 'look'} like kelvin values; check the unit.`,
  };
}
