/** The campaign form's text values ⇄ the API's create and update bodies (checked with the shared schemas). */
import {
  campaignCreateSchema,
  campaignUpdateSchema,
  type AssayMethod,
  type CampaignCreate,
  type CampaignStatus,
  type CampaignUpdate,
  type SelectivityMeasure,
} from '../../../../api/features/campaigns/schemas';
import type { FieldError } from '../../../lib/api-client';
import type { Campaign } from '../api/types';
import { parseNumber } from './grid';

export interface CampaignFormValues {
  title: string;
  productNameA: string;
  productNameB: string;
  measure: SelectivityMeasure;
  assayMethod: AssayMethod;
  defaultUncertainty: string;
  newRunUncertainty: string;
  quantitationLimit: string;
  status: CampaignStatus;
  reactionDescription: string;
  notes: string;
}

export type FormErrors = Partial<Record<keyof CampaignFormValues | '(form)', string>>;

export const blankCampaign: CampaignFormValues = {
  title: '',
  productNameA: '',
  productNameB: '',
  measure: 'ee',
  assayMethod: 'chiral-hplc',
  defaultUncertainty: '',
  newRunUncertainty: '',
  quantitationLimit: '',
  status: 'active',
  reactionDescription: '',
  notes: '',
};

export function valuesFromCampaign(c: Campaign): CampaignFormValues {
  return {
    title: c.title,
    productNameA: c.productNameA,
    productNameB: c.productNameB,
    measure: c.measure,
    assayMethod: c.assayMethod,
    defaultUncertainty: c.defaultUncertainty === null ? '' : String(c.defaultUncertainty),
    newRunUncertainty: c.newRunUncertainty == null ? '' : String(c.newRunUncertainty),
    quantitationLimit: c.quantitationLimit == null ? '' : String(c.quantitationLimit),
    status: c.status,
    reactionDescription: c.reactionDescription ?? '',
    notes: c.notes ?? '',
  };
}

function issuesToErrors(issues: { path: PropertyKey[]; message: string }[]): FormErrors {
  const errors: FormErrors = {};
  for (const i of issues) {
    const key = (i.path.map(String)[0] || '(form)') as keyof FormErrors;
    errors[key] ??= i.message;
  }
  return errors;
}

function uncertaintyOf(text: string): number | null | 'invalid' {
  return parseNumber(text);
}

/** The number-typed fields of the form: text → number or null (blank), or the error for its field. */
const NUMBER_FIELDS = ['defaultUncertainty', 'newRunUncertainty', 'quantitationLimit'] as const;
type NumberField = (typeof NUMBER_FIELDS)[number];
function numbersOf(v: CampaignFormValues): { numbers: Record<NumberField, number | null> | null; errors: FormErrors } {
  const numbers = {} as Record<NumberField, number | null>;
  for (const key of NUMBER_FIELDS) {
    const n = uncertaintyOf(v[key]);
    if (n === 'invalid') return { numbers: null, errors: { [key]: `“${v[key]}” is not a number` } };
    numbers[key] = n;
  }
  return { numbers, errors: {} };
}

export function createBody(v: CampaignFormValues): { body: CampaignCreate | null; errors: FormErrors } {
  const { numbers, errors } = numbersOf(v);
  if (!numbers) return { body: null, errors };
  const parsed = campaignCreateSchema.safeParse({
    ...v,
    productNameA: v.productNameA.trim() || 'A',
    productNameB: v.productNameB.trim() || 'B',
    ...numbers,
  });
  return parsed.success ? { body: parsed.data, errors: {} } : { body: null, errors: issuesToErrors(parsed.error.issues) };
}

/** Only the changed fields, with the version the form was opened at. */
export function updateBody(c: Campaign, v: CampaignFormValues): { body: CampaignUpdate | null; errors: FormErrors } {
  const { numbers, errors } = numbersOf(v);
  if (!numbers) return { body: null, errors };
  const before = valuesFromCampaign(c);
  const changed: Record<string, unknown> = { version: c.version };
  for (const key of Object.keys(v) as (keyof CampaignFormValues)[]) {
    if (v[key].trim() === before[key].trim()) continue;
    changed[key] = (NUMBER_FIELDS as readonly string[]).includes(key) ? numbers[key as NumberField] : v[key];
  }
  const parsed = campaignUpdateSchema.safeParse(changed);
  return parsed.success ? { body: parsed.data, errors: {} } : { body: null, errors: issuesToErrors(parsed.error.issues) };
}

/** The form's errors as `{ path, message }` pairs ('(form)' is the form's own message, path ''). */
export function fieldErrorList(errors: FormErrors): FieldError[] {
  return Object.entries(errors).map(([path, message]) => ({ path: path === '(form)' ? '' : path, message: message ?? '' }));
}

/** Every field of the form, for `applyServerErrors`: a server path below one of them lands on it. */
export const CAMPAIGN_FIELDS = Object.keys(blankCampaign) as (keyof CampaignFormValues)[];
