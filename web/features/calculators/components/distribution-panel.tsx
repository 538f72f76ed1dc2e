import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { DistributionRequest, DistributionResponse } from '../../../../api/features/calculators/kinetics-schemas';
import { LineChart } from '../../../components/charts/line-chart';
import { TemperatureCells, TemperatureTable } from '../../../components/charts/temperature-swatch';
import { SafetyCaution } from '../../../components/ui/caution';
import { Panel } from '../../../components/ui/page';
import type { FieldError } from '../../../lib/api-client';
import { fixed, percent, sig } from '../../../lib/format';
import { useDistribution } from '../api/post-distribution';
import {
  blankPathway,
  exampleDistributionForm,
  initialDistributionForm,
  toDistributionRequest,
  type DistributionFormState,
  type PathwayText,
} from '../lib/distribution-form';
import { apiFieldErrors, messagesFor, normalisePath, unmatchedErrors } from '../../../lib/field-errors';
import {
  buttonClass,
  energyUnitOptions,
  entropyUnitOptions,
  inputClass,
  NumberField,
  secondaryButtonClass,
  UnplacedErrors,
  SelectField,
  selectClass,
  temperatureUnitOptions,
} from '../../../components/ui/fields';
import { CalculatorForm } from './calculator-form';
import { EmptyResult, RangeFields, rangeFieldPaths, ResultNotes, Th } from './kinetics-parts';

const MAX_ROWS = 12;
const pathwayFieldPaths = ['pathways', 'gTemperature', ...rangeFieldPaths];

/** Errors on any pathway's G‡ temperature belong to the one shared field. */
function withSharedTemperature(errors: FieldError[]): FieldError[] {
  return errors.map((e) => (/^pathways\.\d+\.barrier\.temperature/.test(normalisePath(e.path)) ? { ...e, path: 'gTemperature' } : e));
}

function CellInput({
  label,
  path,
  value,
  onChange,
  errors,
  width,
  placeholder,
}: {
  label: string;
  path: string;
  value: string;
  onChange: (v: string) => void;
  errors: FieldError[];
  width: string;
  placeholder?: string;
}) {
  const messages = messagesFor(errors, path);
  return (
    <td className="px-1 py-1 align-top">
      <input
        aria-label={label}
        name={path}
        className={`${inputClass} ${width}`}
        value={value}
        placeholder={placeholder}
        onChange={(e) => onChange(e.target.value)}
        aria-invalid={messages.length > 0}
        autoComplete="off"
      />
      {messages.length > 0 && (
        <p className="mt-0.5 max-w-[10rem] text-xs text-red-700" role="alert">
          {messages.join('; ')}
        </p>
      )}
    </td>
  );
}

/** Several pathways: product shares, dr and ee per diastereomer from competing transition states. */
export function DistributionPanel() {
  const methods = useForm<DistributionFormState>({ defaultValues: initialDistributionForm() });
  const form = methods.watch();
  const [request, setRequest] = useState<DistributionRequest | null>(null);
  const [clientErrors, setClientErrors] = useState<FieldError[]>([]);
  const query = useDistribution(request);

  const serverErrors = apiFieldErrors(query.error);
  const errors = withSharedTemperature(clientErrors.length ? clientErrors : serverErrors);
  const leftover = unmatchedErrors(errors, pathwayFieldPaths).concat(errors.filter((e) => normalisePath(e.path) === 'pathways'));
  const data = query.data;

  const change = (patch: Partial<DistributionFormState>) => {
    for (const [key, value] of Object.entries(patch)) methods.setValue(key as keyof DistributionFormState, value as never);
  };
  const setRow = (id: number, patch: Partial<PathwayText>) =>
    methods.setValue(
      'pathways',
      methods.getValues('pathways').map((p) => (p.id === id ? { ...p, ...patch } : p)),
    );
  const submit = () => {
    const { request: next, errors: found } = toDistributionRequest(methods.getValues());
    setClientErrors(found);
    if (next) setRequest(next);
  };
  const usesG = form.pathways.some((p) => p.mode === 'G');

  return (
    <Panel title="Several pathways">
      <CalculatorForm form={methods} errors={errors} onSubmit={submit} label="Pathway inputs" className="flex flex-col gap-3">
        <p className="text-xs text-ink-600">
          One row per competing transition state. Give each barrier relative to any common reference (the same for every row), as G‡ or as
          H‡ and S‡. To get dr and ee, give every row a diastereomer group and mark its enantiomer A or B.
        </p>
        <div className="overflow-x-auto">
          <table className="tnum border-collapse text-left text-sm">
            <caption className="sr-only">Competing pathways</caption>
            <thead className="text-xs text-ink-600">
              <tr>
                <Th>Label</Th>
                <Th>Barrier as</Th>
                <Th>G‡ ({form.energyUnit})</Th>
                <Th>H‡ ({form.energyUnit})</Th>
                <Th>S‡ ({form.entropyUnit === 'J/(mol*K)' ? 'J/(mol·K)' : 'cal/(mol·K)'})</Th>
                <Th>Diastereomer</Th>
                <Th>Enantiomer</Th>
                <th scope="col">
                  <span className="sr-only">Remove</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {form.pathways.map((p, i) => {
                const name = p.label.trim() || `row ${i + 1}`;
                return (
                  <tr key={p.id}>
                    <CellInput
                      label={`Label, row ${i + 1}`}
                      path={`pathways.${i}.label`}
                      value={p.label}
                      onChange={(label) => setRow(p.id, { label })}
                      errors={errors}
                      width="w-24"
                    />
                    <td className="px-1 py-1 align-top">
                      <select
                        aria-label={`Barrier as, ${name}`}
                        className={selectClass}
                        value={p.mode}
                        onChange={(e) => setRow(p.id, { mode: e.target.value as PathwayText['mode'] })}
                      >
                        <option value="G">G‡</option>
                        <option value="HS">H‡ and S‡</option>
                      </select>
                    </td>
                    {p.mode === 'G' ? (
                      <>
                        <CellInput
                          label={`G‡, ${name}`}
                          path={`pathways.${i}.barrier.dG`}
                          value={p.g}
                          onChange={(g) => setRow(p.id, { g })}
                          errors={errors}
                          width="w-20"
                          placeholder="e.g. 0"
                        />
                        <td className="px-1 text-xs text-ink-500">—</td>
                        <td className="px-1 text-xs text-ink-500">—</td>
                      </>
                    ) : (
                      <>
                        <td className="px-1 text-xs text-ink-500">—</td>
                        <CellInput
                          label={`H‡, ${name}`}
                          path={`pathways.${i}.barrier.dH`}
                          value={p.h}
                          onChange={(h) => setRow(p.id, { h })}
                          errors={errors}
                          width="w-20"
                        />
                        <CellInput
                          label={`S‡, ${name}`}
                          path={`pathways.${i}.barrier.dS`}
                          value={p.s}
                          onChange={(s) => setRow(p.id, { s })}
                          errors={errors}
                          width="w-20"
                        />
                      </>
                    )}
                    <CellInput
                      label={`Diastereomer, ${name}`}
                      path={`pathways.${i}.diastereomer`}
                      value={p.diastereomer}
                      onChange={(diastereomer) => setRow(p.id, { diastereomer })}
                      errors={errors}
                      width="w-20"
                      placeholder="optional"
                    />
                    <td className="px-1 py-1 align-top">
                      <select
                        aria-label={`Enantiomer, ${name}`}
                        className={selectClass}
                        value={p.enantiomer}
                        onChange={(e) => setRow(p.id, { enantiomer: e.target.value as PathwayText['enantiomer'] })}
                        aria-invalid={messagesFor(errors, `pathways.${i}.enantiomer`).length > 0}
                      >
                        <option value="">—</option>
                        <option value="A">A</option>
                        <option value="B">B</option>
                      </select>
                      {messagesFor(errors, `pathways.${i}.enantiomer`).map((m) => (
                        <p key={m} className="mt-0.5 max-w-[10rem] text-xs text-red-700" role="alert">
                          {m}
                        </p>
                      ))}
                    </td>
                    <td className="px-1 py-1 align-top">
                      <button
                        type="button"
                        className="rounded px-1.5 py-1 text-sm text-ink-600 hover:bg-slate-100 disabled:opacity-40"
                        aria-label={`Remove ${name}`}
                        disabled={form.pathways.length <= 2}
                        onClick={() => change({ pathways: form.pathways.filter((q) => q.id !== p.id) })}
                      >
                        ✕
                      </button>
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
        <div className="flex flex-wrap items-start gap-3">
          <button
            type="button"
            className={secondaryButtonClass}
            disabled={form.pathways.length >= MAX_ROWS}
            onClick={() => change({ pathways: [...form.pathways, blankPathway(`P${form.pathways.length + 1}`)] })}
          >
            Add pathway
          </button>
          <button type="button" className={secondaryButtonClass} onClick={() => methods.reset(exampleDistributionForm())}>
            Load invented example
          </button>
          <label className="flex items-center gap-1.5 text-xs font-medium text-ink-700">
            Energy unit
            <SelectField
              label="Pathway energy unit"
              value={form.energyUnit}
              options={energyUnitOptions}
              onChange={(energyUnit) => change({ energyUnit })}
            />
          </label>
          <label className="flex items-center gap-1.5 text-xs font-medium text-ink-700">
            Entropy unit
            <SelectField
              label="Pathway entropy unit"
              value={form.entropyUnit}
              options={entropyUnitOptions}
              onChange={(entropyUnit) => change({ entropyUnit })}
            />
          </label>
        </div>
        {usesG && (
          <NumberField
            label="G‡ values hold at"
            path="gTemperature"
            value={form.gTemperature}
            onChange={(gTemperature) => change({ gTemperature })}
            errors={errors}
            width="w-20"
            hint="Rows given as G‡ are taken with S‡ = 0, so their gaps are the same at every temperature."
            unit={
              <SelectField
                label="G‡ temperature unit"
                value={form.gTemperatureUnit}
                options={temperatureUnitOptions}
                onChange={(gTemperatureUnit) => change({ gTemperatureUnit })}
              />
            }
          />
        )}
        <RangeFields />
        <div>
          <button type="submit" className={buttonClass} disabled={query.isFetching}>
            {query.isFetching ? 'Calculating…' : 'Calculate distribution'}
          </button>
        </div>
        <UnplacedErrors error={query.error} clientErrors={clientErrors} serverErrors={serverErrors} leftover={leftover} />
      </CalculatorForm>

      <div className="mt-4 flex min-w-0 flex-col gap-3" aria-live="polite">
        {!data && !query.isFetching && (
          <EmptyResult failed={Boolean(query.error)}>
            Enter at least two pathways and a range, then press Calculate distribution.
          </EmptyResult>
        )}
        {data && (
          <div className={`flex flex-col gap-3 ${query.isPlaceholderData ? 'opacity-60' : ''}`}>
            <DistributionResult data={data} />
          </div>
        )}
      </div>
    </Panel>
  );
}

function DistributionResult({ data }: { data: DistributionResponse }) {
  const series = data.pathways.map((p, i) => ({
    key: `p${i}`,
    label: p.label,
    points: data.points.map((pt) => ({ x: pt.celsius, y: pt.percents[i] })),
  }));
  const hasDr = data.points.some((p) => p.dr !== null);
  return (
    <div className="grid gap-4 xl:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
      <LineChart
        title="Share of each product against temperature"
        series={series}
        yLabel="Product (%)"
        formatY={(v) => fixed(v, 0)}
        yDomain={[0, 100]}
        testId="distribution-chart"
      />
      <div className="flex min-w-0 flex-col gap-3">
        <TemperatureTable
          caption="Product distribution by temperature"
          headings={
            <>
              {data.pathways.map((p) => (
                <Th key={p.label}>{p.label} (%)</Th>
              ))}
              {data.groups.map((g) => (
                <Th key={`g-${g}`} className="border-l border-slate-200">
                  {g}: share (%) · ee (%)
                </Th>
              ))}
              {hasDr && <Th className="border-l border-slate-200">dr ({data.groups.join(' : ')})</Th>}
            </>
          }
        >
          {data.points.map((pt) => (
            <tr key={pt.kelvin} className="border-b border-slate-100 last:border-0 hover:bg-slate-50">
              <TemperatureCells celsius={pt.celsius} />
              {pt.percents.map((v, i) => (
                <td key={i} className="px-2 py-1">
                  {percent(v)}
                </td>
              ))}
              {pt.groups.map((g) => (
                <td key={g.diastereomer} className="border-l border-slate-100 px-2 py-1">
                  {percent(g.percent)} · {percent(g.eePercent)}
                </td>
              ))}
              {hasDr && (
                <td className="border-l border-slate-100 px-2 py-1 font-medium text-ink-950">
                  {pt.dr === null ? '—' : `${sig(pt.dr, 3)} : 1`}
                </td>
              )}
            </tr>
          ))}
        </TemperatureTable>
        <ResultNotes definitions={data.definitions} assumptions={data.assumptions} />
        <SafetyCaution compact />
      </div>
    </div>
  );
}
