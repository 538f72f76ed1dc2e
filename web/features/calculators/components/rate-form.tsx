import type { UseFormReturn } from 'react-hook-form';
import type { FieldError } from '../../../lib/api-client';
import { DEFAULT_ASSUMED_DH_KJ, type RateFormState } from '../lib/rate-form';
import { BarrierFields } from './barrier-fields';
import { CalculatorForm, FormNumber, FormSegmented, FormSelect } from './calculator-form';
import { buttonClass, energyUnitOptions, temperatureUnitOptions } from '../../../components/ui/fields';
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

function RunFields({ title, path, prefix }: { title: string; path: string; prefix: 'run1' | 'run2' }) {
  return (
    <fieldset className="flex flex-col gap-2">
      <legend className="mb-1 text-xs font-semibold text-ink-800">{title}</legend>
      <div className="flex flex-wrap items-start gap-3">
        <FormNumber
          label="Reached conversion (%)"
          path={`${path}.conversionPercent`}
          name={`${prefix}.conversion`}
          placeholder="e.g. 95"
          width="w-20"
        />
        <FormNumber
          label="after"
          path={`${path}.time`}
          name={`${prefix}.time`}
          placeholder="e.g. 4"
          width="w-20"
          unit={<FormSelect label="Time unit" name={`${prefix}.timeUnit`} options={durationUnitOptions} />}
        />
        <FormNumber
          label="at temperature"
          path={`${path}.temperature`}
          name={`${prefix}.temperature`}
          placeholder="e.g. 0"
          width="w-20"
          unit={<FormSelect label="Run temperature unit" name={`${prefix}.temperatureUnit`} options={temperatureUnitOptions} />}
        />
      </div>
    </fieldset>
  );
}

/** Inputs of the time-to-finish panel: what is known about the rate, the kinetic order, a target and a range. */
export function RateForm({
  form,
  onSubmit,
  errors,
  busy,
}: {
  form: UseFormReturn<RateFormState>;
  onSubmit: () => void;
  errors: FieldError[];
  busy: boolean;
}) {
  const [kind, order] = form.watch(['kind', 'order']);
  const usesRuns = kind === 'one-run' || kind === 'two-runs';

  return (
    <CalculatorForm form={form} errors={errors} onSubmit={onSubmit} label="Time to finish inputs">
      <FormSegmented
        legend="What you know about the rate"
        radioName="rate-basis-kind"
        name="kind"
        options={[
          { value: 'one-run', label: 'One run' },
          { value: 'two-runs', label: 'Two runs' },
          { value: 'gibbs', label: 'ΔG‡' },
          { value: 'activation', label: 'ΔH‡ + ΔS‡' },
        ]}
      />

      {usesRuns && (
        <RunFields
          title={kind === 'one-run' ? 'Measured run' : 'First run'}
          path={kind === 'one-run' ? 'basis.run' : 'basis.runs.0'}
          prefix="run1"
        />
      )}
      {kind === 'two-runs' && <RunFields title="Second run, at another temperature" path="basis.runs.1" prefix="run2" />}
      {kind === 'one-run' && (
        <FormNumber
          label="Assumed ΔH‡"
          path="basis.assumedDH"
          name="assumedDH"
          width="w-20"
          hint={`One run fixes k at one temperature only, so ΔH‡ must be assumed (offered: ${DEFAULT_ASSUMED_DH_KJ} kJ/mol). The table also shows the times for ΔH‡ 10 kJ/mol lower and higher.`}
          unit={<FormSelect label="ΔH‡ unit" name="assumedDHUnit" options={energyUnitOptions} />}
        />
      )}

      {(kind === 'gibbs' || kind === 'activation') && (
        <BarrierFields kind={kind} path="basis" placeholders={{ energy: kind === 'gibbs' ? 'e.g. 90' : 'e.g. 60', entropy: 'e.g. −90' }} />
      )}

      <fieldset className="flex flex-col gap-2 border-t border-slate-200 pt-3">
        <legend className="sr-only">Kinetic order</legend>
        <FormSegmented
          legend="Kinetic order"
          radioName="rate-order"
          name="order"
          options={[
            { value: 'first', label: 'First' },
            { value: 'pseudo-first', label: 'Pseudo-first' },
            { value: 'second', label: 'Second' },
          ]}
        />
        {order === 'pseudo-first' && (
          <div className="flex flex-wrap items-start gap-3">
            <FormNumber label="[A]₀ limiting (mol/L)" path="setup.limiting" name="limiting" placeholder="e.g. 0.1" width="w-20" />
            <FormNumber
              label="[B]₀ in excess (mol/L)"
              path="setup.excess"
              name="excess"
              placeholder="e.g. 1.0"
              width="w-20"
              hint="k is then k₂ and k_obs = k₂·[B]₀; at least 10-fold excess keeps it pseudo-first order."
            />
          </div>
        )}
        {order === 'second' && (
          <FormNumber
            label="Starting concentration c₀ of A and B (mol/L)"
            path="setup.initial"
            name="initial"
            placeholder="e.g. 0.5"
            width="w-20"
            hint="A + B at equal starting concentrations."
          />
        )}
      </fieldset>

      <FormNumber label="Target conversion (%)" path="targetConversionPercent" name="target" width="w-20" />
      <RangeFields />

      <div>
        <button type="submit" className={buttonClass} disabled={busy}>
          {busy ? 'Calculating…' : 'Calculate times'}
        </button>
      </div>
    </CalculatorForm>
  );
}
