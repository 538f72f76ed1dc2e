import type { FormEvent } from 'react';
import type { FieldError } from '../../../lib/api-client';
import type { ErosionFormState } from '../lib/erosion-form';
import { BarrierFields } from './barrier-fields';
import { buttonClass, NumberField, Segmented, SelectField } from '../../../components/ui/fields';
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
  onChange,
  onSubmit,
  errors,
  busy,
}: {
  form: ErosionFormState;
  onChange: (patch: Partial<ErosionFormState>) => void;
  onSubmit: () => void;
  errors: FieldError[];
  busy: boolean;
}) {
  const submit = (e: FormEvent) => {
    e.preventDefault();
    onSubmit();
  };
  return (
    <form onSubmit={submit} noValidate aria-label="Erosion inputs" className="flex flex-col gap-4">
      <Segmented
        legend="Barrier to racemization or epimerization"
        name="erosion-barrier-kind"
        value={form.kind}
        onChange={(kind) => onChange({ kind })}
        options={[
          { value: 'gibbs', label: 'ΔG‡' },
          { value: 'activation', label: 'ΔH‡ + ΔS‡' },
        ]}
      />
      <BarrierFields
        kind={form.kind}
        form={form}
        onChange={onChange}
        errors={errors}
        path="barrier"
        name="Barrier"
        placeholders={{ energy: 'e.g. 25', entropy: 'e.g. −10' }}
      />

      <div className="flex flex-wrap items-start gap-3 border-t border-slate-200 pt-3">
        <NumberField
          label="Initial ee (%)"
          path="initialEePercent"
          value={form.initialEe}
          onChange={(initialEe) => onChange({ initialEe })}
          errors={errors}
          placeholder="e.g. 99.5"
          width="w-20"
        />
        <NumberField
          label="ee floor (%), optional"
          path="eeFloorPercent"
          value={form.eeFloor}
          onChange={(eeFloor) => onChange({ eeFloor })}
          errors={errors}
          placeholder="e.g. 99.0"
          width="w-20"
        />
      </div>
      <div className="flex flex-wrap items-start gap-3">
        <NumberField
          label="Hold time, optional"
          path="hold"
          value={form.hold}
          onChange={(hold) => onChange({ hold })}
          errors={errors}
          placeholder="e.g. 12"
          width="w-20"
          unit={
            <SelectField
              label="Hold time unit"
              value={form.holdUnit}
              options={durationUnitOptions}
              onChange={(holdUnit) => onChange({ holdUnit })}
            />
          }
        />
        <NumberField
          label="Equilibrium K = [B]/[A], optional"
          path="equilibriumRatio"
          value={form.equilibriumRatio}
          onChange={(equilibriumRatio) => onChange({ equilibriumRatio })}
          errors={errors}
          placeholder="none"
          width="w-24"
          hint="Leave empty for racemization (K = 1); give K for epimerization towards another ratio."
        />
      </div>
      <RangeFields from={form.rangeFrom} to={form.rangeTo} unit={form.rangeUnit} count={form.count} onChange={onChange} errors={errors} />
      <div>
        <button type="submit" className={buttonClass} disabled={busy}>
          {busy ? 'Calculating…' : 'Calculate erosion'}
        </button>
      </div>
    </form>
  );
}
