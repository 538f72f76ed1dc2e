import { erosionRequestSchema, type ErosionRequest } from '../../../../api/features/calculators/kinetics-schemas';
import type { FieldError } from '../../../lib/api-client';
import type { BarrierText } from './barrier-text';
import { validateRequest } from '../../../lib/field-errors';
import { numberText as num, rangeText } from './number-text';
import type { TemperatureUnit } from './parse-screen';
import type { DurationUnit } from './rate-form';

export interface ErosionFormState extends BarrierText {
  kind: 'gibbs' | 'activation';
  initialEe: string;
  hold: string;
  holdUnit: DurationUnit;
  eeFloor: string;
  /** Empty: racemization (K = 1); otherwise epimerization towards K = [B]/[A]. */
  equilibriumRatio: string;
  rangeFrom: string;
  rangeTo: string;
  rangeUnit: TemperatureUnit;
  count: string;
}

export const initialErosionForm: ErosionFormState = {
  kind: 'gibbs',
  dG: '',
  dGUnit: 'kcal/mol',
  dGTemperature: '25',
  dGTemperatureUnit: 'C',
  dH: '',
  dHUnit: 'kcal/mol',
  dS: '',
  dSUnit: 'J/(mol*K)',
  initialEe: '',
  hold: '',
  holdUnit: 'h',
  eeFloor: '',
  equilibriumRatio: '',
  rangeFrom: '-20',
  rangeTo: '60',
  rangeUnit: 'C',
  count: '9',
};

/** Build the erosion request from the form and validate it with the API's own schema. */
export function toErosionRequest(form: ErosionFormState): { request: ErosionRequest | null; errors: FieldError[] } {
  const dS = num(form.dS);
  const barrier =
    form.kind === 'gibbs'
      ? {
          kind: 'gibbs',
          dG: { value: num(form.dG), unit: form.dGUnit },
          temperature: { value: num(form.dGTemperature), unit: form.dGTemperatureUnit },
          ...(dS === undefined ? {} : { dS: { value: dS, unit: form.dSUnit } }),
        }
      : { kind: 'activation', dH: { value: num(form.dH), unit: form.dHUnit }, dS: { value: dS, unit: form.dSUnit } };
  const hold = num(form.hold);
  const floor = num(form.eeFloor);
  const ratio = num(form.equilibriumRatio);
  const candidate = {
    barrier,
    initialEePercent: num(form.initialEe),
    ...(hold === undefined ? {} : { hold: { value: hold, unit: form.holdUnit } }),
    ...(floor === undefined ? {} : { eeFloorPercent: floor }),
    ...(ratio === undefined ? {} : { equilibriumRatio: ratio }),
    temperatures: rangeText(form),
  };
  return validateRequest(erosionRequestSchema, candidate);
}
