import type { FieldError } from '../../../lib/api-client';
import type { EnergyUnit, EntropyUnit } from '../lib/forecast-form';
import type { TemperatureUnit } from '../lib/parse-screen';
import { energyUnitOptions, entropyUnitOptions, NumberField, SelectField, temperatureUnitOptions } from '../../../components/ui/fields';

/** The text of a barrier as typed: ΔG‡ at a temperature (ΔS‡ optional), or ΔH‡ with ΔS‡. */
export interface BarrierText {
  dG: string;
  dGUnit: EnergyUnit;
  dGTemperature: string;
  dGTemperatureUnit: TemperatureUnit;
  dH: string;
  dHUnit: EnergyUnit;
  dS: string;
  dSUnit: EntropyUnit;
}

/**
 * Inputs for one activation barrier, shared by the rate and erosion forms. `path` is the
 * request path of the barrier (e.g. `basis`, `barrier`) so server errors land on the inputs;
 * `name` prefixes the labels (e.g. "Barrier ΔG‡").
 */
export function BarrierFields({
  kind,
  form,
  onChange,
  errors,
  path,
  name = '',
  placeholders,
}: {
  kind: 'gibbs' | 'activation';
  form: BarrierText;
  onChange: (patch: Partial<BarrierText>) => void;
  errors: FieldError[];
  path: string;
  name?: string;
  placeholders: { energy: string; entropy: string };
}) {
  const label = (what: string) => (name ? `${name} ${what}` : what);
  // Unit selects get labels that do not contain the field labels, so a label finds one control.
  const unitLabel = (what: string) => (name ? `${name} ${what} unit` : `${what[0]!.toUpperCase()}${what.slice(1)} unit`);
  const dSOptional = kind === 'gibbs';
  return (
    <>
      <div className="flex flex-wrap items-start gap-3">
        {kind === 'gibbs' ? (
          <>
            <NumberField
              label={label('ΔG‡')}
              path={`${path}.dG`}
              value={form.dG}
              onChange={(dG) => onChange({ dG })}
              errors={errors}
              placeholder={placeholders.energy}
              width="w-20"
              unit={
                <SelectField
                  label={unitLabel('energy')}
                  value={form.dGUnit}
                  options={energyUnitOptions}
                  onChange={(dGUnit) => onChange({ dGUnit })}
                />
              }
            />
            <NumberField
              label="at temperature"
              path={`${path}.temperature`}
              value={form.dGTemperature}
              onChange={(dGTemperature) => onChange({ dGTemperature })}
              errors={errors}
              width="w-20"
              unit={
                <SelectField
                  label={unitLabel('temperature')}
                  value={form.dGTemperatureUnit}
                  options={temperatureUnitOptions}
                  onChange={(dGTemperatureUnit) => onChange({ dGTemperatureUnit })}
                />
              }
            />
          </>
        ) : (
          <NumberField
            label={label('ΔH‡')}
            path={`${path}.dH`}
            value={form.dH}
            onChange={(dH) => onChange({ dH })}
            errors={errors}
            placeholder={placeholders.energy}
            width="w-20"
            unit={
              <SelectField
                label={unitLabel('energy')}
                value={form.dHUnit}
                options={energyUnitOptions}
                onChange={(dHUnit) => onChange({ dHUnit })}
              />
            }
          />
        )}
      </div>
      <NumberField
        label={dSOptional ? 'ΔS‡, optional' : 'ΔS‡'}
        path={`${path}.dS`}
        value={form.dS}
        onChange={(dS) => onChange({ dS })}
        errors={errors}
        placeholder={dSOptional ? 'assumed 0' : placeholders.entropy}
        hint={dSOptional ? 'Empty: taken as 0, so ΔG‡ is the same at every temperature.' : undefined}
        width="w-20"
        unit={
          <SelectField
            label={unitLabel('entropy')}
            value={form.dSUnit}
            options={entropyUnitOptions}
            onChange={(dSUnit) => onChange({ dSUnit })}
          />
        }
      />
    </>
  );
}
