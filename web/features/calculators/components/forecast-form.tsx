import type { FormEvent } from 'react';
import type { FieldError } from '../../../lib/api-client';
import { signed } from '../../../lib/format';
import { signedGap, type ForecastFormState } from '../lib/forecast-form';
import {
  buttonClass,
  energyUnitOptions,
  entropyUnitOptions,
  measureOptions,
  NumberField,
  Segmented,
  SelectField,
  temperatureUnitOptions,
} from '../../../components/ui/fields';

/** Every field path this form renders, so errors for other paths go to the general alert. */
export const forecastFieldPaths = [
  'basis.selectivity',
  'basis.temperature',
  'basis.ddG',
  'basis.ddH',
  'basis.ddS',
  'temperatures.from',
  'temperatures.to',
  'temperatures.count',
];

const selectivityPlaceholder: Record<ForecastFormState['measure'], string> = {
  ee: 'e.g. 92.5',
  er: 'e.g. 96:4',
  dr: 'e.g. 12:1',
  percentA: 'e.g. 96.2',
  ratio: 'e.g. 24',
};

export function ForecastForm({
  form,
  onChange,
  onSubmit,
  errors,
  busy,
}: {
  form: ForecastFormState;
  onChange: (patch: Partial<ForecastFormState>) => void;
  onSubmit: () => void;
  errors: FieldError[];
  busy: boolean;
}) {
  const submit = (e: FormEvent) => {
    e.preventDefault();
    onSubmit();
  };
  const gap = signedGap(form);
  const ddSOptional = form.kind !== 'activation';

  return (
    <form onSubmit={submit} noValidate aria-label="Forecast inputs" className="flex flex-col gap-4">
      <Segmented
        legend="Start from"
        name="basis-kind"
        value={form.kind}
        onChange={(kind) => onChange({ kind })}
        options={[
          { value: 'observed', label: 'Observed' },
          { value: 'gap', label: 'Gap ΔΔG‡' },
          { value: 'activation', label: 'ΔΔH‡ + ΔΔS‡' },
        ]}
      />

      {form.kind === 'observed' && (
        <div className="flex flex-wrap items-start gap-3">
          <NumberField
            label="Observed value"
            path="basis.selectivity"
            value={form.selectivity}
            onChange={(selectivity) => onChange({ selectivity })}
            errors={errors}
            placeholder={selectivityPlaceholder[form.measure]}
            unit={
              <SelectField label="Measure" value={form.measure} options={measureOptions} onChange={(measure) => onChange({ measure })} />
            }
            hint="of A, the isomer named first"
          />
        </div>
      )}

      {form.kind === 'gap' && (
        <div className="flex flex-col gap-1">
          <NumberField
            label="Energy gap |ΔΔG‡|"
            path="basis.ddG"
            value={form.gap}
            onChange={(g) => onChange({ gap: g })}
            errors={errors}
            placeholder="e.g. 5.7"
            unit={
              <>
                <SelectField
                  label="Energy unit"
                  value={form.gapUnit}
                  options={energyUnitOptions}
                  onChange={(gapUnit) => onChange({ gapUnit })}
                />
                <SelectField
                  label="Favouring"
                  value={form.gapFavours}
                  options={[
                    { value: 'A', label: 'favouring A' },
                    { value: 'B', label: 'favouring B' },
                  ]}
                  onChange={(gapFavours) => onChange({ gapFavours })}
                />
              </>
            }
          />
          {gap !== undefined && (
            <p className="tnum text-xs text-ink-600">
              Sent as ΔΔG‡ = {signed(gap, 3).replace(/\.?0+$/, '')} {form.gapUnit} (B − A).
            </p>
          )}
        </div>
      )}

      {form.kind !== 'activation' && (
        <NumberField
          label="at temperature"
          path="basis.temperature"
          value={form.temperature}
          onChange={(temperature) => onChange({ temperature })}
          errors={errors}
          placeholder="e.g. −20"
          unit={
            <SelectField
              label="Temperature unit"
              value={form.temperatureUnit}
              options={temperatureUnitOptions}
              onChange={(temperatureUnit) => onChange({ temperatureUnit })}
            />
          }
        />
      )}

      <div className="flex flex-wrap items-start gap-3">
        {form.kind === 'activation' && (
          <NumberField
            label="ΔΔH‡ (B − A)"
            path="basis.ddH"
            value={form.ddH}
            onChange={(ddH) => onChange({ ddH })}
            errors={errors}
            placeholder="e.g. 10"
            unit={
              <SelectField
                label="ΔΔH‡ unit"
                value={form.ddHUnit}
                options={energyUnitOptions}
                onChange={(ddHUnit) => onChange({ ddHUnit })}
              />
            }
          />
        )}
        <NumberField
          label={ddSOptional ? 'ΔΔS‡ (B − A), optional' : 'ΔΔS‡ (B − A)'}
          path="basis.ddS"
          value={form.ddS}
          onChange={(ddS) => onChange({ ddS })}
          errors={errors}
          placeholder={ddSOptional ? 'assumed 0' : 'e.g. 8'}
          hint={ddSOptional ? 'Empty: assumed zero, so ΔΔG‡ is the same at every temperature.' : undefined}
          unit={
            <SelectField
              label="ΔΔS‡ unit"
              value={form.ddSUnit}
              options={entropyUnitOptions}
              onChange={(ddSUnit) => onChange({ ddSUnit })}
            />
          }
        />
      </div>

      <fieldset className="flex flex-wrap items-start gap-3 border-t border-slate-200 pt-3">
        <legend className="sr-only">Temperature range</legend>
        <NumberField
          label="From"
          path="temperatures.from"
          value={form.rangeFrom}
          onChange={(rangeFrom) => onChange({ rangeFrom })}
          errors={errors}
          width="w-20"
        />
        <NumberField
          label="to"
          path="temperatures.to"
          value={form.rangeTo}
          onChange={(rangeTo) => onChange({ rangeTo })}
          errors={errors}
          width="w-20"
          unit={
            <SelectField
              label="Range unit"
              value={form.rangeUnit}
              options={temperatureUnitOptions}
              onChange={(rangeUnit) => onChange({ rangeUnit })}
            />
          }
        />
        <NumberField
          label="Temperatures"
          path="temperatures.count"
          value={form.count}
          onChange={(count) => onChange({ count })}
          errors={errors}
          width="w-16"
        />
      </fieldset>

      <div>
        <button type="submit" className={buttonClass} disabled={busy}>
          {busy ? 'Forecasting…' : 'Forecast'}
        </button>
      </div>
    </form>
  );
}
