import { distributionRequestSchema, type DistributionRequest } from '../../../../api/features/calculators/kinetics-schemas';
import type { FieldError } from '../../../lib/api-client';
import { validateRequest } from '../../../lib/field-errors';
import type { EnergyUnit, EntropyUnit } from './forecast-form';
import { numberText as num, rangeText } from './number-text';
import type { TemperatureUnit } from './parse-screen';

/** One competing pathway as typed. `mode` says whether its barrier is a relative G‡ or H‡ and S‡. */
export interface PathwayText {
  /** Stable key for React lists (not sent). */
  id: number;
  label: string;
  mode: 'G' | 'HS';
  g: string;
  h: string;
  s: string;
  diastereomer: string;
  enantiomer: '' | 'A' | 'B';
}

export interface DistributionFormState {
  pathways: PathwayText[];
  energyUnit: EnergyUnit;
  entropyUnit: EntropyUnit;
  /** The temperature at which the relative G‡ values hold (S‡ taken as 0 for those pathways). */
  gTemperature: string;
  gTemperatureUnit: TemperatureUnit;
  rangeFrom: string;
  rangeTo: string;
  rangeUnit: TemperatureUnit;
  count: string;
}

let nextId = 1;
export function blankPathway(label = ''): PathwayText {
  return { id: nextId++, label, mode: 'G', g: '', h: '', s: '', diastereomer: '', enantiomer: '' };
}

export const initialDistributionForm = (): DistributionFormState => ({
  pathways: [blankPathway('P1'), blankPathway('P2')],
  energyUnit: 'kJ/mol',
  entropyUnit: 'J/(mol*K)',
  gTemperature: '25',
  gTemperatureUnit: 'C',
  rangeFrom: '-78',
  rangeTo: '25',
  rangeUnit: 'C',
  count: '9',
});

/**
 * Invented example (Kestrelmoor Laboratories, not measured data): two diastereomers, each as an
 * enantiomer pair, given as H‡ and S‡ relative to the syn-A transition state.
 */
export function exampleDistributionForm(): DistributionFormState {
  const row = (label: string, h: string, s: string, diastereomer: string, enantiomer: 'A' | 'B'): PathwayText => ({
    ...blankPathway(label),
    mode: 'HS',
    h,
    s,
    diastereomer,
    enantiomer,
  });
  return {
    ...initialDistributionForm(),
    pathways: [
      row('syn-A', '0', '0', 'syn', 'A'),
      row('syn-B', '9.5', '4', 'syn', 'B'),
      row('anti-A', '4.5', '-6', 'anti', 'A'),
      row('anti-B', '7', '-2', 'anti', 'B'),
    ],
  };
}

/** Build the distribution request from the form and validate it with the API's own schema. */
export function toDistributionRequest(form: DistributionFormState): { request: DistributionRequest | null; errors: FieldError[] } {
  const pathways = form.pathways.map((p) => ({
    label: p.label.trim(),
    barrier:
      p.mode === 'G'
        ? {
            kind: 'gibbs',
            dG: { value: num(p.g), unit: form.energyUnit },
            temperature: { value: num(form.gTemperature), unit: form.gTemperatureUnit },
          }
        : { kind: 'activation', dH: { value: num(p.h), unit: form.energyUnit }, dS: { value: num(p.s), unit: form.entropyUnit } },
    ...(p.diastereomer.trim() ? { diastereomer: p.diastereomer.trim() } : {}),
    ...(p.enantiomer ? { enantiomer: p.enantiomer } : {}),
  }));
  const candidate = {
    pathways,
    temperatures: rangeText(form),
  };
  return validateRequest(distributionRequestSchema, candidate);
}
