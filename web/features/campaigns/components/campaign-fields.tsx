import { useState } from 'react';
import {
  ASSAY_METHODS,
  CAMPAIGN_STATUSES,
  type AssayMethod,
  type CampaignStatus,
  type SelectivityMeasure,
} from '../../../../api/features/campaigns/schemas';
import { SelectField, TextField } from '../../../components/ui/form';
import type { CampaignFormValues, FormErrors } from '../lib/campaign-form';
import { ASSAY_LABEL, MEASURE_LABEL, uncertaintyUnit } from '../lib/labels';

const MEASURES: SelectivityMeasure[] = ['ee', 'percentA', 'er', 'dr', 'ratio'];

/** How the quantitation limit is written for each measure. */
const LIMIT_HINT: Record<SelectivityMeasure, string> = {
  ee: 'In % ee, e.g. 99.8',
  percentA: 'Major share in %, e.g. 99.9',
  er: 'Major share in %, e.g. 99.9',
  dr: 'As r, e.g. 200 for 200:1',
  ratio: 'As r, e.g. 200',
};

/** The fields of a campaign, shared by the new-campaign form and the edit form. */
export function CampaignFields({
  values,
  errors,
  set,
  compact = false,
}: {
  values: CampaignFormValues;
  errors: FormErrors;
  set: <K extends keyof CampaignFormValues>(key: K) => (value: CampaignFormValues[K]) => void;
  compact?: boolean;
}) {
  return (
    <div className={`grid gap-3 ${compact ? 'sm:grid-cols-2' : 'sm:grid-cols-2 lg:grid-cols-4'}`}>
      <TextField
        className={compact ? 'sm:col-span-2' : 'sm:col-span-2'}
        label="Title"
        name="title"
        value={values.title}
        onChange={set('title')}
        error={errors.title}
      />
      <TextField
        label="Product A (numerator)"
        name="productNameA"
        value={values.productNameA}
        onChange={set('productNameA')}
        error={errors.productNameA}
        hint="e.g. (S)-amine; r = [A]/[B]"
      />
      <TextField
        label="Product B"
        name="productNameB"
        value={values.productNameB}
        onChange={set('productNameB')}
        error={errors.productNameB}
      />
      <SelectField<SelectivityMeasure>
        label="Reported as"
        name="measure"
        value={values.measure}
        options={MEASURES.map((m) => ({ value: m, label: MEASURE_LABEL[m] }))}
        onChange={set('measure')}
        error={errors.measure}
      />
      <SelectField<AssayMethod>
        label="Assay"
        name="assayMethod"
        value={values.assayMethod}
        options={ASSAY_METHODS.map((m) => ({ value: m, label: ASSAY_LABEL[m] }))}
        onChange={set('assayMethod')}
        error={errors.assayMethod}
      />
      <TextField
        label="Default uncertainty (SD)"
        name="defaultUncertainty"
        inputMode="text"
        value={values.defaultUncertainty}
        onChange={set('defaultUncertainty')}
        error={errors.defaultUncertainty}
        hint={`${uncertaintyUnit(values.measure) === '(relative)' ? 'Relative, 0.05 = 5 %' : `In ${uncertaintyUnit(values.measure).replace(/[()]/g, '')}`}; used where a run gives none`}
      />
      <TextField
        label="Next run’s assay SD"
        name="newRunUncertainty"
        inputMode="text"
        value={values.newRunUncertainty}
        onChange={set('newRunUncertainty')}
        error={errors.newRunUncertainty}
        hint="Widens a forecast’s interval for one new run; blank: the median of the runs’"
      />
      <TextField
        label="Quantitation limit"
        name="quantitationLimit"
        inputMode="text"
        value={values.quantitationLimit}
        onChange={set('quantitationLimit')}
        error={errors.quantitationLimit}
        hint={`${LIMIT_HINT[values.measure]}; at or beyond it a result is a bound. Blank: 99.8 % ee`}
      />
      <SelectField<CampaignStatus>
        label="Status"
        name="status"
        value={values.status}
        options={CAMPAIGN_STATUSES.map((s) => ({ value: s, label: s }))}
        onChange={set('status')}
        error={errors.status}
      />
      <TextField
        className="sm:col-span-2"
        label="Reaction"
        name="reactionDescription"
        value={values.reactionDescription}
        onChange={set('reactionDescription')}
        error={errors.reactionDescription}
        hint="Substrate, catalyst, solvent, concentration"
      />
      <TextField className="sm:col-span-2" label="Notes" name="notes" value={values.notes} onChange={set('notes')} error={errors.notes} />
    </div>
  );
}

/** Values and field errors of a campaign form; typing into a field clears that field's error. */
export function useCampaignFormState(initial: CampaignFormValues | (() => CampaignFormValues)) {
  const [values, setValues] = useState<CampaignFormValues>(initial);
  const [errors, setErrors] = useState<FormErrors>({});
  const set =
    <K extends keyof CampaignFormValues>(key: K) =>
    (value: CampaignFormValues[K]) => {
      setValues((v) => ({ ...v, [key]: value }));
      setErrors(({ [key]: _gone, ...rest }) => rest);
    };
  return { values, setValues, errors, setErrors, set };
}
