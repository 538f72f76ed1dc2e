import type { FormEvent } from 'react';
import type { FieldError } from '../../../lib/api-client';
import { DEFAULT_ASSUMED_DH_KJ, type RateFormState, type RunText } from '../lib/rate-form';
import { BarrierFields } from './barrier-fields';
import { buttonClass, energyUnitOptions, NumberField, Segmented, SelectField, temperatureUnitOptions } from '../../../components/ui/fields';
import { durationUnitOptions, RangeFields, rangeFieldPaths } from './kinetics-parts';

/** Every field path this form can render, so errors for other paths go to the general alert. */
export const rateFieldPaths = [
  'setup.limiting',
  'setup.excess',
  'setup.initial',
  'basis.run',
  'basis.runs',
  'basis.assumedDH',
  'basis.dG',
  'basis.temperature',
  'basis.dH',
  'basis.dS',
  'targetConversionPercent',
  ...rangeFieldPaths,
];

function RunFields({
  title,
  path,
  run,
  onChange,
  errors,
}: {
  title: string;
  path: string;
  run: RunText;
  onChange: (run: RunText) => void;
  errors: FieldError[];
}) {
  const set = (patch: Partial<RunText>) => onChange({ ...run, ...patch });
  return (
    <fieldset className="flex flex-col gap-2">
      <legend className="mb-1 text-xs font-semibold text-ink-800">{title}</legend>
      <div className="flex flex-wrap items-start gap-3">
        <NumberField
          label="Reached conversion (%)"
          path={`${path}.conversionPercent`}
          value={run.conversion}
          onChange={(conversion) => set({ conversion })}
          errors={errors}
          placeholder="e.g. 95"
          width="w-20"
        />
        <NumberField
          label="after"
          path={`${path}.time`}
          value={run.time}
          onChange={(time) => set({ time })}
          errors={errors}
          placeholder="e.g. 4"
          width="w-20"
          unit={
            <SelectField label="Time unit" value={run.timeUnit} options={durationUnitOptions} onChange={(timeUnit) => set({ timeUnit })} />
          }
        />
        <NumberField
          label="at temperature"
          path={`${path}.temperature`}
          value={run.temperature}
          onChange={(temperature) => set({ temperature })}
          errors={errors}
          placeholder="e.g. 0"
          width="w-20"
          unit={
            <SelectField
              label="Run temperature unit"
              value={run.temperatureUnit}
              options={temperatureUnitOptions}
              onChange={(temperatureUnit) => set({ temperatureUnit })}
            />
          }
        />
      </div>
    </fieldset>
  );
}

/** Inputs of the time-to-finish panel: what is known about the rate, the kinetic order, a target and a range. */
export function RateForm({
  form,
  onChange,
  onSubmit,
  errors,
  busy,
}: {
  form: RateFormState;
  onChange: (patch: Partial<RateFormState>) => void;
  onSubmit: () => void;
  errors: FieldError[];
  busy: boolean;
}) {
  const submit = (e: FormEvent) => {
    e.preventDefault();
    onSubmit();
  };
  const usesRuns = form.kind === 'one-run' || form.kind === 'two-runs';

  return (
    <form onSubmit={submit} noValidate aria-label="Time to finish inputs" className="flex flex-col gap-4">
      <Segmented
        legend="What you know about the rate"
        name="rate-basis-kind"
        value={form.kind}
        onChange={(kind) => onChange({ kind })}
        options={[
          { value: 'one-run', label: 'One run' },
          { value: 'two-runs', label: 'Two runs' },
          { value: 'gibbs', label: 'ΔG‡' },
          { value: 'activation', label: 'ΔH‡ + ΔS‡' },
        ]}
      />

      {usesRuns && (
        <RunFields
          title={form.kind === 'one-run' ? 'Measured run' : 'First run'}
          path={form.kind === 'one-run' ? 'basis.run' : 'basis.runs.0'}
          run={form.run1}
          onChange={(run1) => onChange({ run1 })}
          errors={errors}
        />
      )}
      {form.kind === 'two-runs' && (
        <RunFields
          title="Second run, at another temperature"
          path="basis.runs.1"
          run={form.run2}
          onChange={(run2) => onChange({ run2 })}
          errors={errors}
        />
      )}
      {form.kind === 'one-run' && (
        <NumberField
          label="Assumed ΔH‡"
          path="basis.assumedDH"
          value={form.assumedDH}
          onChange={(assumedDH) => onChange({ assumedDH })}
          errors={errors}
          width="w-20"
          hint={`One run fixes k at one temperature only, so ΔH‡ must be assumed (offered: ${DEFAULT_ASSUMED_DH_KJ} kJ/mol). The table also shows the times for ΔH‡ 10 kJ/mol lower and higher.`}
          unit={
            <SelectField
              label="ΔH‡ unit"
              value={form.assumedDHUnit}
              options={energyUnitOptions}
              onChange={(assumedDHUnit) => onChange({ assumedDHUnit })}
            />
          }
        />
      )}

      {(form.kind === 'gibbs' || form.kind === 'activation') && (
        <BarrierFields
          kind={form.kind}
          form={form}
          onChange={onChange}
          errors={errors}
          path="basis"
          placeholders={{ energy: form.kind === 'gibbs' ? 'e.g. 90' : 'e.g. 60', entropy: 'e.g. −90' }}
        />
      )}

      <fieldset className="flex flex-col gap-2 border-t border-slate-200 pt-3">
        <legend className="sr-only">Kinetic order</legend>
        <Segmented
          legend="Kinetic order"
          name="rate-order"
          value={form.order}
          onChange={(order) => onChange({ order })}
          options={[
            { value: 'first', label: 'First' },
            { value: 'pseudo-first', label: 'Pseudo-first' },
            { value: 'second', label: 'Second' },
          ]}
        />
        {form.order === 'pseudo-first' && (
          <div className="flex flex-wrap items-start gap-3">
            <NumberField
              label="[A]₀ limiting (mol/L)"
              path="setup.limiting"
              value={form.limiting}
              onChange={(limiting) => onChange({ limiting })}
              errors={errors}
              placeholder="e.g. 0.1"
              width="w-20"
            />
            <NumberField
              label="[B]₀ in excess (mol/L)"
              path="setup.excess"
              value={form.excess}
              onChange={(excess) => onChange({ excess })}
              errors={errors}
              placeholder="e.g. 1.0"
              width="w-20"
              hint="k is then k₂ and k_obs = k₂·[B]₀; at least 10-fold excess keeps it pseudo-first order."
            />
          </div>
        )}
        {form.order === 'second' && (
          <NumberField
            label="Starting concentration c₀ of A and B (mol/L)"
            path="setup.initial"
            value={form.initial}
            onChange={(initial) => onChange({ initial })}
            errors={errors}
            placeholder="e.g. 0.5"
            width="w-20"
            hint="A + B at equal starting concentrations."
          />
        )}
      </fieldset>

      <NumberField
        label="Target conversion (%)"
        path="targetConversionPercent"
        value={form.target}
        onChange={(target) => onChange({ target })}
        errors={errors}
        width="w-20"
      />
      <RangeFields from={form.rangeFrom} to={form.rangeTo} unit={form.rangeUnit} count={form.count} onChange={onChange} errors={errors} />

      <div>
        <button type="submit" className={buttonClass} disabled={busy}>
          {busy ? 'Calculating…' : 'Calculate times'}
        </button>
      </div>
    </form>
  );
}
