import { useWatch, type Control } from 'react-hook-form';
import {
  ASSAY_METHODS,
  CAMPAIGN_STATUSES,
  type AssayMethod,
  type CampaignStatus,
  type SelectivityMeasure,
} from '../../../../api/features/campaigns/schemas';
import { FormSelectField, FormTextField } from '../../../components/ui/form-fields';
import type { CampaignFormValues } from '../lib/campaign-form';
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
  control,
  compact = false,
}: {
  control: Control<CampaignFormValues, unknown, unknown>;
  compact?: boolean;
}) {
  const measure = useWatch({ control, name: 'measure' });
  return (
    <div className={`grid gap-3 ${compact ? 'sm:grid-cols-2' : 'sm:grid-cols-2 lg:grid-cols-4'}`}>
      <FormTextField control={control} className={compact ? 'sm:col-span-2' : 'sm:col-span-2'} label="Title" name="title" />
      <FormTextField control={control} label="Product A (numerator)" name="productNameA" hint="e.g. (S)-amine; r = [A]/[B]" />
      <FormTextField control={control} label="Product B" name="productNameB" />
      <FormSelectField<CampaignFormValues, SelectivityMeasure>
        control={control}
        label="Reported as"
        name="measure"
        options={MEASURES.map((m) => ({ value: m, label: MEASURE_LABEL[m] }))}
      />
      <FormSelectField<CampaignFormValues, AssayMethod>
        control={control}
        label="Assay"
        name="assayMethod"
        options={ASSAY_METHODS.map((m) => ({ value: m, label: ASSAY_LABEL[m] }))}
      />
      <FormTextField
        control={control}
        label="Default uncertainty (SD)"
        name="defaultUncertainty"
        inputMode="text"
        hint={`${uncertaintyUnit(measure) === '(relative)' ? 'Relative, 0.05 = 5 %' : `In ${uncertaintyUnit(measure).replace(/[()]/g, '')}`}; used where a run gives none`}
      />
      <FormTextField
        control={control}
        label="Next run’s assay SD"
        name="newRunUncertainty"
        inputMode="text"
        hint="Widens a forecast’s interval for one new run; blank: the median of the runs’"
      />
      <FormTextField
        control={control}
        label="Quantitation limit"
        name="quantitationLimit"
        inputMode="text"
        hint={`${LIMIT_HINT[measure]}; at or beyond it a result is a bound. Blank: 99.8 % ee`}
      />
      <FormSelectField<CampaignFormValues, CampaignStatus>
        control={control}
        label="Status"
        name="status"
        options={CAMPAIGN_STATUSES.map((s) => ({ value: s, label: s }))}
      />
      <FormTextField
        control={control}
        className="sm:col-span-2"
        label="Reaction"
        name="reactionDescription"
        hint="Substrate, catalyst, solvent, concentration"
      />
      <FormTextField control={control} className="sm:col-span-2" label="Notes" name="notes" />
    </div>
  );
}
