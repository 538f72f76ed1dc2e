import type { UseFormReturn } from 'react-hook-form';
import type { FieldError } from '../../../lib/api-client';
import { signed } from '../../../lib/format';
import { signedGap, type ForecastFormState } from '../lib/forecast-form';
import { CalculatorForm, FormNumber, FormSegmented, FormSelect } from './calculator-form';
import { buttonClass, energyUnitOptions, entropyUnitOptions, measureOptions, temperatureUnitOptions } from '../../../components/ui/fields';
import { RangeFields, rangeFieldPaths } from './kinetics-parts';

/** Every field path this form renders, so errors for other paths go to the general alert. */
export const forecastFieldPaths = ['basis.selectivity', 'basis.temperature', 'basis.ddG', 'basis.ddH', 'basis.ddS', ...rangeFieldPaths];

const selectivityPlaceholder: Record<ForecastFormState['measure'], string> = {
  ee: 'e.g. 92.5',
  er: 'e.g. 96:4',
  dr: 'e.g. 12:1',
  percentA: 'e.g. 96.2',
  ratio: 'e.g. 24',
};

export function ForecastForm({
  form,
  onSubmit,
  errors,
  busy,
}: {
  form: UseFormReturn<ForecastFormState>;
  onSubmit: () => void;
  errors: FieldError[];
  busy: boolean;
}) {
  const values = form.watch();
  const gap = signedGap(values);
  const { kind, measure, gapUnit } = values;
  const ddSOptional = kind !== 'activation';

  return (
    <CalculatorForm form={form} errors={errors} onSubmit={onSubmit} label="Forecast inputs">
      <FormSegmented
        legend="Start from"
        radioName="basis-kind"
        name="kind"
        options={[
          { value: 'observed', label: 'Observed' },
          { value: 'gap', label: 'Gap ΔΔG‡' },
          { value: 'activation', label: 'ΔΔH‡ + ΔΔS‡' },
        ]}
      />

      {kind === 'observed' && (
        <div className="flex flex-wrap items-start gap-3">
          <FormNumber
            label="Observed value"
            path="basis.selectivity"
            name="selectivity"
            placeholder={selectivityPlaceholder[measure]}
            unit={<FormSelect label="Measure" name="measure" options={measureOptions} />}
            hint="of A, the isomer named first"
          />
        </div>
      )}

      {kind === 'gap' && (
        <div className="flex flex-col gap-1">
          <FormNumber
            label="Energy gap |ΔΔG‡|"
            path="basis.ddG"
            name="gap"
            placeholder="e.g. 5.7"
            unit={
              <>
                <FormSelect label="Energy unit" name="gapUnit" options={energyUnitOptions} />
                <FormSelect
                  label="Favouring"
                  name="gapFavours"
                  options={[
                    { value: 'A', label: 'favouring A' },
                    { value: 'B', label: 'favouring B' },
                  ]}
                />
              </>
            }
          />
          {gap !== undefined && (
            <p className="tnum text-xs text-ink-600">
              Sent as ΔΔG‡ = {signed(gap, 3).replace(/\.?0+$/, '')} {gapUnit} (B − A).
            </p>
          )}
        </div>
      )}

      {kind !== 'activation' && (
        <FormNumber
          label="at temperature"
          path="basis.temperature"
          name="temperature"
          placeholder="e.g. −20"
          unit={<FormSelect label="Temperature unit" name="temperatureUnit" options={temperatureUnitOptions} />}
        />
      )}

      <div className="flex flex-wrap items-start gap-3">
        {kind === 'activation' && (
          <FormNumber
            label="ΔΔH‡ (B − A)"
            path="basis.ddH"
            name="ddH"
            placeholder="e.g. 10"
            unit={<FormSelect label="ΔΔH‡ unit" name="ddHUnit" options={energyUnitOptions} />}
          />
        )}
        <FormNumber
          label={ddSOptional ? 'ΔΔS‡ (B − A), optional' : 'ΔΔS‡ (B − A)'}
          path="basis.ddS"
          name="ddS"
          placeholder={ddSOptional ? 'assumed 0' : 'e.g. 8'}
          hint={ddSOptional ? 'Empty: assumed zero, so ΔΔG‡ is the same at every temperature.' : undefined}
          unit={<FormSelect label="ΔΔS‡ unit" name="ddSUnit" options={entropyUnitOptions} />}
        />
      </div>

      <RangeFields />

      <div>
        <button type="submit" className={buttonClass} disabled={busy}>
          {busy ? 'Forecasting…' : 'Forecast'}
        </button>
      </div>
    </CalculatorForm>
  );
}
