import { forecastRequestSchema, type ForecastRequest } from '../../../../api/features/calculators/schemas';
import { numberText as num, rangeText } from './number-text';
import type { FieldError } from '../../../lib/api-client';
import { validateRequest } from '../../../lib/field-errors';
import type { SelectivityMeasure, TemperatureUnit } from './parse-screen';

export type BasisKind = 'observed' | 'gap' | 'activation';
export type EnergyUnit = 'kJ/mol' | 'kcal/mol';
export type EntropyUnit = 'J/(mol*K)' | 'cal/(mol*K)';

/** What the forecast form holds: text as typed, so a half-typed number is never lost. */
export interface ForecastFormState {
  kind: BasisKind;
  measure: SelectivityMeasure;
  selectivity: string;
  temperature: string;
  temperatureUnit: TemperatureUnit;
  gap: string;
  gapUnit: EnergyUnit;
  /** The gap is entered as a size plus the isomer it favours; the request carries it signed (B − A). */
  gapFavours: 'A' | 'B';
  ddH: string;
  ddHUnit: EnergyUnit;
  ddS: string;
  ddSUnit: EntropyUnit;
  rangeFrom: string;
  rangeTo: string;
  rangeUnit: TemperatureUnit;
  count: string;
}

export const initialForecastForm: ForecastFormState = {
  kind: 'observed',
  measure: 'ee',
  selectivity: '',
  temperature: '',
  temperatureUnit: 'C',
  gap: '',
  gapUnit: 'kJ/mol',
  gapFavours: 'A',
  ddH: '',
  ddHUnit: 'kJ/mol',
  ddS: '',
  ddSUnit: 'J/(mol*K)',
  rangeFrom: '-80',
  rangeTo: '40',
  rangeUnit: 'C',
  count: '13',
};

/** The signed ΔΔG‡ the request will carry, or undefined while the size is not a number. */
export function signedGap(form: ForecastFormState): number | undefined {
  const size = num(form.gap);
  if (size === undefined || Number.isNaN(size)) return undefined;
  return form.gapFavours === 'A' ? size : -size;
}

/** Build the request from the form and validate it with the API's own schema. */
export function toForecastRequest(form: ForecastFormState): { request: ForecastRequest | null; errors: FieldError[] } {
  const temperature = { value: num(form.temperature), unit: form.temperatureUnit };
  const ddSValue = num(form.ddS);
  const ddS = ddSValue === undefined ? undefined : { value: ddSValue, unit: form.ddSUnit };
  let basis: unknown;
  if (form.kind === 'observed') {
    const text = form.selectivity.trim();
    const ratioText = /^\d+(\.\d+)?\s*:\s*\d+(\.\d+)?$/.test(text) && ['er', 'dr', 'ratio'].includes(form.measure);
    basis = {
      kind: 'observed',
      selectivity: { measure: form.measure, value: ratioText ? text : num(text) },
      temperature,
      ...(ddS ? { ddS } : {}),
    };
  } else if (form.kind === 'gap') {
    const size = num(form.gap);
    const value = size === undefined || Number.isNaN(size) ? size : form.gapFavours === 'A' ? size : -size;
    basis = { kind: 'gap', ddG: { value, unit: form.gapUnit }, temperature, ...(ddS ? { ddS } : {}) };
  } else {
    basis = { kind: 'activation', ddH: { value: num(form.ddH), unit: form.ddHUnit }, ddS: { value: ddSValue, unit: form.ddSUnit } };
  }
  const candidate = {
    basis,
    temperatures: rangeText(form),
  };
  return validateRequest(forecastRequestSchema, candidate);
}
