/**
 * What the selectivity calculators (/forecast, /fit) share: request quantities to SI with the
 * request path of each field for errors, engine errors renamed to request paths, and energies and
 * the zero-selectivity temperature in the units chemists read.
 */
import { CELSIUS_OFFSET_K, THERMOCHEMICAL_CALORIE_J, energyToJPerMol, entropyToJPerMolK, temperatureToK } from '../../science';
import { BadRequestError } from '../../lib/errors';
import type { ZeroSelectivityInterval } from '../../science/eyring-fit';
import { expandTemperatures } from './temperatures';
import type { ForecastRequest } from './schemas';

type Quantity<U extends string> = { value: number; unit: U };
export type TemperatureQ = Quantity<'K' | 'C' | 'F'>;
type Temperatures = ForecastRequest['temperatures'];

export const kJ = (j: number) => j / 1000;
export const kcal = (j: number) => j / (1000 * THERMOCHEMICAL_CALORIE_J);
export const calK = (j: number) => j / THERMOCHEMICAL_CALORIE_J;
export const pair = (f: (v: number) => number, [a, b]: [number, number]): [number, number] => [f(a), f(b)];

/** A unit conversion whose result overflows is the request's fault: 400 on the field that was sent. */
export function finiteConversion(value: number, path: string): number {
  if (!Number.isFinite(value)) {
    throw new BadRequestError(`${path} is too large to convert to SI units.`, [{ path, message: 'is too large to convert to SI units' }]);
  }
  return value;
}

export const toK = (t: TemperatureQ, path: string) => finiteConversion(temperatureToK(t.value, t.unit, `${path}.value`), `${path}.value`);
export const toJPerMol = (q: { value: number; unit: Parameters<typeof energyToJPerMol>[1] }, path: string) =>
  finiteConversion(energyToJPerMol(q.value, q.unit, `${path}.value`), `${path}.value`);
export const toJPerMolK = (q: { value: number; unit: Parameters<typeof entropyToJPerMolK>[1] }, path: string) =>
  finiteConversion(entropyToJPerMolK(q.value, q.unit, `${path}.value`), `${path}.value`);

/**
 * Re-throw an engine error with the request field it came from: the engine names its own
 * arguments (`measurements[2].sigmaLnR`, `temperaturesK[0]`), the client needs what it sent.
 */
export function withRequestPaths<T>(rename: (field: string) => string | null, run: () => T): T {
  try {
    return run();
  } catch (err) {
    if (err instanceof Error && err.name === 'DomainError') {
      const field = (err as { field?: string }).field;
      const mapped = field === undefined ? null : rename(field);
      if (mapped !== null) Object.defineProperty(err, 'field', { value: mapped });
    }
    throw err;
  }
}

export const resolveTemperatures = (spec: Temperatures, path = 'temperatures'): number[] => expandTemperatures(spec, path).kelvins;

export const ddGOut = (j: number) => ({ 'kJ/mol': kJ(j), 'kcal/mol': kcal(j) });

/**
 * T₀ with its note. `far`: outside the data and the temperatures asked about (a forecast from
 * ΔΔH‡/ΔΔS‡ has no data, so only the requested range counts).
 */
export function zeroSelectivity(t0: number | null, far: boolean, interval?: ZeroSelectivityInterval | null) {
  if (t0 === null) return null;
  return {
    kelvin: t0,
    celsius: t0 - CELSIUS_OFFSET_K,
    note: far
      ? 'Where the straight line predicts no selectivity (ΔΔH‡/ΔΔS‡); a far extrapolation: read it as a trend, not a forecast.'
      : 'Where the straight line predicts no selectivity (ΔΔH‡/ΔΔS‡); selectivity inverts beyond it.',
    farExtrapolation: far,
    ...(interval === undefined
      ? {}
      : {
          interval: interval
            ? {
                ranges: interval.ranges.map((r) => ({ fromKelvin: r.fromK, toKelvin: r.toK })),
                bounded: interval.bounded,
                note: interval.message,
              }
            : null,
        }),
  };
}
