import type { UseFormReturn } from 'react-hook-form';
import type { FieldError } from '../../../lib/api-client';
import type { ErosionFormState } from '../lib/erosion-form';
import { BarrierFields } from './barrier-fields';
import { CalculatorForm, FormNumber, FormSegmented, FormSelect } from './calculator-form';
import { buttonClass } from '../../../components/ui/fields';
import { durationUnitOptions, RangeFields, rangeFieldPaths } from './kinetics-parts';

export const erosionFieldPaths = [
  'barrier.dG',
  'barrier.temperature',
  'barrier.dH',
  'barrier.dS',
  'initialEePercent',
  'hold',
  'eeFloorPercent',
  'equilibriumRatio',
  ...rangeFieldPaths,
];

/** Inputs of the erosion panel: the barrier to racemization (or epimerization), the starting ee, a hold and a floor. */
export function ErosionForm({
  form,
  onSubmit,
  errors,
  busy,
}: {
  form: UseFormReturn<ErosionFormState>;
  onSubmit: () => void;
  errors: FieldError[];
  busy: boolean;
}) {
  const kind = form.watch('kind');
  return (
    <CalculatorForm form={form} errors={errors} onSubmit={onSubmit} label="Erosion inputs">
      <FormSegmented
        legend="Barrier to racemization or epimerization"
        radioName="erosion-barrier-kind"
        name="kind"
        options={[
          { value: 'gibbs', label: 'ΔG‡' },
          { value: 'activation', label: 'ΔH‡ + ΔS‡' },
        ]}
      />
      <BarrierFields kind={kind} path="barrier" name="Barrier" placeholders={{ energy: 'e.g. 25', entropy: 'e.g. −10' }} />

      <div className="flex flex-wrap items-start gap-3 border-t border-slate-200 pt-3">
        <FormNumber label="Initial ee (%)" path="initialEePercent" name="initialEe" placeholder="e.g. 99.5" width="w-20" />
        <FormNumber label="ee floor (%), optional" path="eeFloorPercent" name="eeFloor" placeholder="e.g. 99.0" width="w-20" />
      </div>
      <div className="flex flex-wrap items-start gap-3">
        <FormNumber
          label="Hold time, optional"
          path="hold"
          name="hold"
          placeholder="e.g. 12"
          width="w-20"
          unit={<FormSelect label="Hold time unit" name="holdUnit" options={durationUnitOptions} />}
        />
        <FormNumber
          label="Equilibrium K = [B]/[A], optional"
          path="equilibriumRatio"
          name="equilibriumRatio"
          placeholder="none"
          width="w-24"
          hint="Leave empty for racemization (K = 1); give K for epimerization towards another ratio."
        />
      </div>
      <RangeFields />
      <div>
        <button type="submit" className={buttonClass} disabled={busy}>
          {busy ? 'Calculating…' : 'Calculate erosion'}
        </button>
      </div>
    </CalculatorForm>
  );
}
