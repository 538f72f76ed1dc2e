import { rateRequestSchema, type RateRequest } from '../../../../api/features/calculators/kinetics-schemas';
import type { FieldError } from '../../../lib/api-client';
import type { BarrierText } from './barrier-text';
import { validateRequest } from '../../../lib/field-errors';
import type { EnergyUnit } from './forecast-form';
import { numberText as num, rangeText } from './number-text';
import type { TemperatureUnit } from './parse-screen';

export type DurationUnit = 's' | 'min' | 'h' | 'd';
export type RateBasisKind = 'one-run' | 'two-runs' | 'gibbs' | 'activation';
export type KineticOrder = 'first' | 'pseudo-first' | 'second';

/** One measured run as typed: X % conversion after a time at a temperature. */
export interface RunText {
  conversion: string;
  time: string;
  timeUnit: DurationUnit;
  temperature: string;
  temperatureUnit: TemperatureUnit;
}

export interface RateFormState extends BarrierText {
  kind: RateBasisKind;
  order: KineticOrder;
  /** pseudo-first: limiting reagent and the one in excess; second: the common starting concentration (mol/L). */
  limiting: string;
  excess: string;
  initial: string;
  run1: RunText;
  run2: RunText;
  /** One run only: the ΔH‡ the answer assumes (a default is offered and stated). */
  assumedDH: string;
  assumedDHUnit: EnergyUnit;
  target: string;
  rangeFrom: string;
  rangeTo: string;
  rangeUnit: TemperatureUnit;
  count: string;
}

/** Offered when only one run is known; the page states it is an assumption and shows ±10 kJ/mol beside it. */
export const DEFAULT_ASSUMED_DH_KJ = '60';

const emptyRun: RunText = { conversion: '', time: '', timeUnit: 'h', temperature: '', temperatureUnit: 'C' };

export const initialRateForm: RateFormState = {
  kind: 'one-run',
  order: 'first',
  limiting: '',
  excess: '',
  initial: '',
  run1: emptyRun,
  run2: emptyRun,
  assumedDH: DEFAULT_ASSUMED_DH_KJ,
  assumedDHUnit: 'kJ/mol',
  dG: '',
  dGUnit: 'kJ/mol',
  dGTemperature: '25',
  dGTemperatureUnit: 'C',
  dH: '',
  dHUnit: 'kJ/mol',
  dS: '',
  dSUnit: 'J/(mol*K)',
  target: '95',
  rangeFrom: '-40',
  rangeTo: '40',
  rangeUnit: 'C',
  count: '9',
};

const molar = (text: string) => ({ value: num(text), unit: 'mol/L' as const });

function runOf(r: RunText) {
  return {
    conversionPercent: num(r.conversion),
    time: { value: num(r.time), unit: r.timeUnit },
    temperature: { value: num(r.temperature), unit: r.temperatureUnit },
  };
}

/** Build the rate request from the form and validate it with the API's own schema. */
export function toRateRequest(form: RateFormState): { request: RateRequest | null; errors: FieldError[] } {
  const setup =
    form.order === 'first'
      ? { order: 'first' }
      : form.order === 'pseudo-first'
        ? { order: 'pseudo-first', limiting: molar(form.limiting), excess: molar(form.excess) }
        : { order: 'second', initial: molar(form.initial) };
  let basis: unknown;
  if (form.kind === 'one-run') {
    basis = { kind: 'one-run', run: runOf(form.run1), assumedDH: { value: num(form.assumedDH), unit: form.assumedDHUnit } };
  } else if (form.kind === 'two-runs') {
    basis = { kind: 'two-runs', runs: [runOf(form.run1), runOf(form.run2)] };
  } else if (form.kind === 'gibbs') {
    const dS = num(form.dS);
    basis = {
      kind: 'gibbs',
      dG: { value: num(form.dG), unit: form.dGUnit },
      temperature: { value: num(form.dGTemperature), unit: form.dGTemperatureUnit },
      ...(dS === undefined ? {} : { dS: { value: dS, unit: form.dSUnit } }),
    };
  } else {
    basis = { kind: 'activation', dH: { value: num(form.dH), unit: form.dHUnit }, dS: { value: num(form.dS), unit: form.dSUnit } };
  }
  const candidate = {
    setup,
    basis,
    targetConversionPercent: num(form.target),
    temperatures: rangeText(form),
  };
  return validateRequest(rateRequestSchema, candidate);
}
