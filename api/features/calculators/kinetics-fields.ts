/**
 * What the kinetics calculators (/distribution, /rate, /erosion) share: barriers from their request
 * shape, engine errors re-labelled with the request path so a form can point at the offending field,
 * and answers in units a chemist reads (kJ/mol and kcal/mol, seconds and a readable unit).
 */
import {
  DomainError,
  energyFromJPerMol,
  energyToJPerMol,
  entropyToJPerMolK,
  temperatureToK,
  type BarrierSpec,
  type Warning,
} from '../../science';
import type { z } from 'zod';
import type { BarrierInput, readableDurationSchema } from './kinetics-schemas';
import { SECONDS_PER } from '../../science/quantities';
import { type ExpandedTemperatures } from './temperatures';

const FAR_FROM_ANCHOR_K = 50;

export type EnergyOut = { 'kJ/mol': number; 'kcal/mol': number };
export type ReadableDuration = z.infer<typeof readableDurationSchema>;

export const energyOut = (jPerMol: number): EnergyOut => ({
  'kJ/mol': energyFromJPerMol(jPerMol, 'kJ/mol'),
  'kcal/mol': energyFromJPerMol(jPerMol, 'kcal/mol'),
});

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
export type FieldRule = [RegExp, (m: RegExpMatchArray) => string];

export function relabel<T>(compute: () => T, rules: FieldRule[], fallback: string): T {
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

export const temperatureRule = (t: ExpandedTemperatures): FieldRule => [/^temperaturesK\[(\d+)\]$/, (m) => t.pathOf(Number(m[1]))];
export const barrierRule = (enginePrefix: string, requestPrefix: (m: RegExpMatchArray) => string): FieldRule => [
  new RegExp(`^${enginePrefix}\\.(gJPerMol|temperatureK|sJPerMolK|hJPerMol)$`),
  (m) => `${requestPrefix(m)}.${BARRIER_FIELDS[m[m.length - 1]!]}`,
];

export function farFromAnchor(kelvins: number[], anchors: number[]): Warning | null {
  if (anchors.length === 0) return null;
  const worst = Math.max(...kelvins.map((t) => Math.min(...anchors.map((a) => Math.abs(t - a)))));
  if (worst <= FAR_FROM_ANCHOR_K) return null;
  return {
    code: 'far-from-anchor',
    message: `Some temperatures lie ${worst.toFixed(0)} K from the temperature the data come from; the further the extrapolation, the less it can be trusted.`,
  };
}
