import { FormNumber, FormSelect } from './calculator-form';
import { energyUnitOptions, entropyUnitOptions, temperatureUnitOptions } from '../../../components/ui/fields';

/**
 * Inputs for one activation barrier, shared by the rate and erosion forms, bound to the form's
 * `BarrierText` fields (lib/barrier-text). `path` is the request path of the barrier (e.g. `basis`, `barrier`) so
 * server errors land on the inputs; `name` prefixes the labels (e.g. "Barrier ΔG‡").
 */
export function BarrierFields({
  kind,
  path,
  name = '',
  placeholders,
}: {
  kind: 'gibbs' | 'activation';
  path: string;
  name?: string;
  placeholders: { energy: string; entropy: string };
}) {
  const label = (what: string) => (name ? `${name} ${what}` : what);
  // Unit selects get labels that do not contain the field labels, so a label finds one control.
  const unitLabel = (what: string) => (name ? `${name} ${what} unit` : `${what[0]!.toUpperCase()}${what.slice(1)} unit`);
  const dSOptional = kind === 'gibbs';
  // ΔG‡ at a stated temperature, or ΔH‡: the energy field and its unit are named after it.
  const energy = kind === 'gibbs' ? 'dG' : 'dH';
  return (
    <>
      <div className="flex flex-wrap items-start gap-3">
        <FormNumber
          key={energy}
          label={label(energy === 'dG' ? 'ΔG‡' : 'ΔH‡')}
          path={`${path}.${energy}`}
          name={energy}
          placeholder={placeholders.energy}
          width="w-20"
          unit={<FormSelect label={unitLabel('energy')} name={`${energy}Unit`} options={energyUnitOptions} />}
        />
        {kind === 'gibbs' && (
          <FormNumber
            label="at temperature"
            path={`${path}.temperature`}
            name="dGTemperature"
            width="w-20"
            unit={<FormSelect label={unitLabel('temperature')} name="dGTemperatureUnit" options={temperatureUnitOptions} />}
          />
        )}
      </div>
      <FormNumber
        label={dSOptional ? 'ΔS‡, optional' : 'ΔS‡'}
        path={`${path}.dS`}
        name="dS"
        placeholder={dSOptional ? 'assumed 0' : placeholders.entropy}
        hint={dSOptional ? 'Empty: taken as 0, so ΔG‡ is the same at every temperature.' : undefined}
        width="w-20"
        unit={<FormSelect label={unitLabel('entropy')} name="dSUnit" options={entropyUnitOptions} />}
      />
    </>
  );
}
