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
import type { Campaign } from '../api/types';
import { parseNumber } from './grid';

export interface CampaignFormValues {
  title: string;
  productNameA: string;
  productNameB: string;
  measure: SelectivityMeasure;
  assayMethod: AssayMethod;
  defaultUncertainty: string;
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

export function createBody(v: CampaignFormValues): { body: CampaignCreate | null; errors: FormErrors } {
  const u = uncertaintyOf(v.defaultUncertainty);
  if (u === 'invalid') return { body: null, errors: { defaultUncertainty: `“${v.defaultUncertainty}” is not a number` } };
  const parsed = campaignCreateSchema.safeParse({
    ...v,
    productNameA: v.productNameA.trim() || 'A',
    productNameB: v.productNameB.trim() || 'B',
    defaultUncertainty: u,
  });
  return parsed.success ? { body: parsed.data, errors: {} } : { body: null, errors: issuesToErrors(parsed.error.issues) };
}

/** Only the changed fields, with the version the form was opened at. */
export function updateBody(c: Campaign, v: CampaignFormValues): { body: CampaignUpdate | null; errors: FormErrors } {
  const u = uncertaintyOf(v.defaultUncertainty);
  if (u === 'invalid') return { body: null, errors: { defaultUncertainty: `“${v.defaultUncertainty}” is not a number` } };
  const before = valuesFromCampaign(c);
  const changed: Record<string, unknown> = { version: c.version };
  for (const key of Object.keys(v) as (keyof CampaignFormValues)[]) {
    if (v[key].trim() === before[key].trim()) continue;
    changed[key] = key === 'defaultUncertainty' ? u : v[key];
  }
  const parsed = campaignUpdateSchema.safeParse(changed);
  return parsed.success ? { body: parsed.data, errors: {} } : { body: null, errors: issuesToErrors(parsed.error.issues) };
}
