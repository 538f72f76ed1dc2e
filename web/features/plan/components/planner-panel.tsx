import { useEffect, useState, type FormEvent } from 'react';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import { SafetyCaution } from '../../../components/ui/caution';
import { paths } from '../../../config/paths';
import { ApiError, type FieldError } from '../../../lib/api-client';
import { fixed, probabilityPercent, sig } from '../../../lib/format';
import { celsiusFromKelvin } from '../../../../api/science/quantities';
import { NumberField, Segmented, buttonClass, selectClass } from '../../../components/ui/fields';
import { useCampaignPlan, useCampaignSpecification, useSavePlan, type CampaignPlan, type PlanInputsBody } from '../api/plan';
import { CONSTRAINT_WORDS, OperatingWindowChart } from './operating-window-chart';

type Measure = 'ee' | 'er' | 'dr' | 'percentA';
type Rule = 'warmest' | 'coldest' | 'middle';

interface FormState {
  measure: Measure;
  minimum: string;
  probability: string;
  fromC: string;
  toC: string;
  rule: Rule;
  targetConversion: string;
  maxTimeH: string;
  holdH: string;
  holdFloor: string;
  holdBarrier: string;
  nextRuns: string;
  /** The assay's SD for one new run, in the specification measure's units; empty: the runs' own scatter or median. */
  newRunSd: string;
  /** Apply the time and hold limits at the required probability instead of their central estimates. */
  atProbability: boolean;
}

type TextKey = { [K in keyof FormState]: FormState[K] extends string ? K : never }[keyof FormState];

/** A number box of the planner: the form value it edits and the request path its server errors name. */
interface PlanField {
  key: TextKey;
  label: string;
  path: string;
  width: string;
  hint?: string;
}

/** The specification and the jacket's range, beside the measure. */
const LIMIT_FIELDS: PlanField[] = [
  { key: 'minimum', label: 'Minimum', path: 'minimum', width: 'w-24' },
  { key: 'probability', label: 'Required probability', path: 'probability', width: 'w-20', hint: '0.5–0.999' },
  { key: 'fromC', label: 'Coldest jacket (°C)', path: 'temperatures.from', width: 'w-20' },
  { key: 'toC', label: 'Warmest jacket (°C)', path: 'temperatures.to', width: 'w-20' },
];

/** Time, hold and next-run settings. */
const CONSTRAINT_FIELDS: PlanField[] = [
  { key: 'maxTimeH', label: 'Longest reaction time (h)', path: 'rate.maxTime', width: 'w-20', hint: "uses the runs' conversion and time" },
  { key: 'targetConversion', label: 'Target conversion (%)', path: 'rate.targetConversionPercent', width: 'w-20' },
  { key: 'holdH', label: 'Hold before isolation (h)', path: 'hold.time', width: 'w-20' },
  { key: 'holdBarrier', label: 'Racemization ΔG‡ (kcal/mol)', path: 'hold.barrier', width: 'w-20' },
  { key: 'holdFloor', label: 'ee floor after hold (%)', path: 'hold.floorEePercent', width: 'w-20' },
  { key: 'nextRuns', label: 'Next runs to suggest', path: 'nextRuns.count', width: 'w-16' },
  {
    key: 'newRunSd',
    label: 'Assay SD of a new run',
    path: 'newRunUncertainty',
    width: 'w-20',
    hint: "in the specification's units; empty: from the runs",
  },
];

function PlanNumberField({
  field,
  form,
  set,
  errors,
}: {
  field: PlanField;
  form: FormState;
  set: (k: TextKey) => (v: string) => void;
  errors: FieldError[];
}) {
  return (
    <NumberField
      label={field.label}
      path={field.path}
      value={form[field.key]}
      onChange={set(field.key)}
      errors={errors}
      width={field.width}
      hint={field.hint}
    />
  );
}

const num = (s: string) => (s.trim() === '' ? undefined : Number(s.replace(',', '.')));

function fromPlan(
  plan: CampaignPlan | null | undefined,
  spec: { measure: Measure; minimum: number; probability: number } | null | undefined,
): FormState {
  const i = plan?.inputs;
  const hold = i?.hold;
  return {
    measure: spec?.measure ?? 'ee',
    minimum: String(spec?.minimum ?? 98),
    probability: String(spec?.probability ?? 0.95),
    fromC: i ? String(i.temperatures.from.unit === 'C' ? i.temperatures.from.value : celsiusFromKelvin(i.temperatures.from.value)) : '-70',
    toC: i ? String(i.temperatures.to.unit === 'C' ? i.temperatures.to.value : celsiusFromKelvin(i.temperatures.to.value)) : '25',
    rule: (i?.rule as Rule | undefined) ?? 'warmest',
    targetConversion: String(i?.rate?.targetConversionPercent ?? 95),
    maxTimeH: i?.rate?.maxTime ? String(i.rate.maxTime.value) : '',
    holdH: hold ? String(hold.time.value) : '',
    holdFloor: hold ? String(hold.floorEePercent) : '',
    holdBarrier: hold && hold.barrier.kind === 'gibbs' ? String(hold.barrier.dG.value) : '',
    nextRuns: String(i?.nextRuns?.count ?? 3),
    newRunSd: i?.newRunUncertainty !== undefined ? String(i.newRunUncertainty) : '',
    atProbability: i?.applyAtProbability ?? false,
  };
}

function toInputs(f: FormState): PlanInputsBody {
  const maxTime = num(f.maxTimeH);
  const holdH = num(f.holdH);
  const count = num(f.nextRuns);
  return {
    temperatures: { from: { value: num(f.fromC) ?? Number.NaN, unit: 'C' }, to: { value: num(f.toC) ?? Number.NaN, unit: 'C' } },
    rule: f.rule,
    curvePoints: 121,
    ...(maxTime !== undefined
      ? { rate: { targetConversionPercent: num(f.targetConversion) ?? Number.NaN, maxTime: { value: maxTime, unit: 'h' } } }
      : {}),
    ...(holdH !== undefined
      ? {
          hold: {
            barrier: {
              kind: 'gibbs',
              dG: { value: num(f.holdBarrier) ?? Number.NaN, unit: 'kcal/mol' },
              temperature: { value: 25, unit: 'C' },
            },
            time: { value: holdH, unit: 'h' },
            floorEePercent: num(f.holdFloor) ?? Number.NaN,
          },
        }
      : {}),
    ...(count ? { nextRuns: { count } } : {}),
    ...(num(f.newRunSd) !== undefined ? { newRunUncertainty: num(f.newRunSd) } : {}),
    applyAtProbability: f.atProbability,
  } as PlanInputsBody;
}

const MEASURES: { value: Measure; label: string }[] = [
  { value: 'ee', label: '% ee' },
  { value: 'er', label: 'er (% major)' },
  { value: 'dr', label: 'dr (r:1)' },
  { value: 'percentA', label: '% major' },
];

/** Server field paths → the form's own paths ('inputs.' prefix off; specification fields as they are). */
function fieldErrors(error: unknown): FieldError[] {
  if (!(error instanceof ApiError)) return [];
  return error.fieldErrors.map((e) => ({ ...e, path: e.path.replace(/^inputs\./, '') }));
}

function PlanSummary({ plan }: { plan: CampaignPlan }) {
  const r = plan.result;
  return (
    <div className="flex flex-col gap-3" data-testid="plan-summary">
      {r.recommended ? (
        <div className="rounded-md border border-fjord-200 bg-fjord-50 px-3 py-2">
          <p className="text-sm text-ink-700">Recommended temperature</p>
          <p className="tnum text-2xl font-semibold text-ink-950" data-testid="recommended">
            {fixed(r.recommended.celsius, 1)} °C{' '}
            <span className="text-base font-normal text-ink-600">({fixed(r.recommended.kelvin, 2)} K)</span>
          </p>
          <p className="tnum text-sm text-ink-700">
            Probability that the next run meets the specification: {probabilityPercent(r.recommended.probabilityMeetsSpec)} %
          </p>
          <p className="mt-1 text-xs text-ink-600">Rule: {r.rule.text}</p>
        </div>
      ) : (
        <div
          role="status"
          className="rounded-md border border-rose-300 bg-rose-50 px-3 py-2 text-sm text-rose-900"
          data-testid="no-recommendation"
        >
          <p className="font-medium">✕ No temperature in the allowed range meets every constraint.</p>
          {r.conflict && <p className="mt-1">{r.conflict.message}</p>}
          {r.resolutions.length > 0 && (
            <ul className="mt-1 list-disc pl-5">
              {r.resolutions.map((x) => (
                <li key={x}>{x}</li>
              ))}
            </ul>
          )}
        </div>
      )}
      <dl className="tnum grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="text-ink-600">Window</dt>
        <dd data-testid="window">{r.window ? `${fixed(r.window.from.celsius, 1)} to ${fixed(r.window.to.celsius, 1)} °C` : 'none'}</dd>
        <dt className="text-ink-600">Limited by</dt>
        <dd>{r.binding.map((b) => CONSTRAINT_WORDS[b] ?? b).join(', ') || '—'}</dd>
        <dt className="text-ink-600">Each constraint alone</dt>
        <dd>{r.needs.map((n) => n.message).join('; ')}</dd>
        {r.nextRuns && (
          <>
            <dt className="text-ink-600">Next runs</dt>
            <dd>
              {r.nextRuns.temperatures.map((t) => `${fixed(t.celsius, 0)} °C`).join(', ')} — interval for one new run at{' '}
              {fixed(r.nextRuns.at.celsius, 1)} °C narrows from ±{sig(r.nextRuns.halfWidthBefore, 2)} to ±
              {sig(r.nextRuns.halfWidthAfter, 2)} in ln r
            </dd>
          </>
        )}
        <dt className="text-ink-600">Model</dt>
        <dd>
          straight line ln r on 1/T, {r.model.n} runs from {fixed(r.model.fromKelvin - 273.15, 0)} to {fixed(r.model.toKelvin - 273.15, 0)}{' '}
          °C; saved plan version {plan.version}
        </dd>
      </dl>
      {r.warnings.length > 0 && (
        <ul className="list-disc pl-5 text-xs text-ink-600">
          {r.warnings.map((w) => (
            <li key={w.code + w.message}>{w.message}</li>
          ))}
        </ul>
      )}
      <SafetyCaution compact />
    </div>
  );
}

/** The planner on a campaign page: a specification, plant limits, the saved plan and its operating window. */
export function PlannerPanel({ campaignId, projectId, canEdit }: { campaignId: string; projectId: string; canEdit: boolean }) {
  const spec = useCampaignSpecification(campaignId);
  const plan = useCampaignPlan(campaignId);
  const save = useSavePlan(campaignId);
  // The form starts from the saved plan once it and the specification have loaded (never again on a refetch).
  const methods = useForm<FormState>();
  const [loaded, setLoaded] = useState(false);
  useEffect(() => {
    if (!loaded && spec.data !== undefined && plan.data !== undefined) {
      methods.reset(fromPlan(plan.data, spec.data.effective));
      setLoaded(true);
    }
  }, [loaded, methods, spec.data, plan.data]);
  const values = methods.watch();
  const form = loaded ? values : null;
  const errors = fieldErrors(save.error);
  const set = (k: keyof FormState) => (v: string) => methods.setValue(k, v as never);

  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    if (!form) return;
    save.mutate({
      specification: { measure: form.measure, minimum: num(form.minimum) ?? Number.NaN, probability: num(form.probability) ?? Number.NaN },
      inputs: toInputs(form),
    });
  };

  return (
    <div className="flex flex-col gap-4">
      {form && canEdit && (
        <form onSubmit={onSubmit} className="flex flex-col gap-3" aria-label="Plan the temperature">
          <div className="flex flex-wrap items-end gap-3">
            <div className="flex flex-col gap-1">
              <span className="text-xs font-medium text-ink-700">Specification measure</span>
              <select
                aria-label="Specification measure"
                className={selectClass}
                value={form.measure}
                onChange={(e) => methods.setValue('measure', e.target.value as Measure)}
              >
                {MEASURES.map((m) => (
                  <option key={m.value} value={m.value}>
                    {m.label}
                  </option>
                ))}
              </select>
            </div>
            {LIMIT_FIELDS.map((f) => (
              <PlanNumberField key={f.path} field={f} form={form} set={set} errors={errors} />
            ))}
          </div>
          <div className="flex flex-wrap items-end gap-3">
            {CONSTRAINT_FIELDS.map((f) => (
              <PlanNumberField key={f.path} field={f} form={form} set={set} errors={errors} />
            ))}
            <label className="flex items-center gap-2 self-center text-sm text-ink-800">
              <input type="checkbox" checked={form.atProbability} onChange={(e) => methods.setValue('atProbability', e.target.checked)} />
              Apply time and hold limits with the specification's confidence
            </label>
          </div>
          <div className="flex flex-wrap items-end gap-3">
            <Segmented<Rule>
              legend="Recommend"
              name="plan-rule"
              value={form.rule}
              onChange={(v) => methods.setValue('rule', v)}
              options={[
                { value: 'warmest', label: 'Warmest feasible' },
                { value: 'coldest', label: 'Coldest feasible' },
                { value: 'middle', label: 'Middle of window' },
              ]}
            />
            <button type="submit" className={buttonClass} disabled={save.isPending}>
              {save.isPending ? 'Planning…' : 'Plan and save'}
            </button>
            <Link className="text-sm text-fjord-700 underline" to={paths.compare.getHref(projectId)}>
              Compare campaigns →
            </Link>
          </div>
          {save.error && (
            <p role="alert" className="text-sm text-rose-700">
              {save.error.message}
            </p>
          )}
        </form>
      )}
      {plan.data ? (
        <>
          <PlanSummary plan={plan.data} />
          <OperatingWindowChart result={plan.data.result} maxTimeHours={plan.data.inputs.rate?.maxTime?.value ?? null} />
        </>
      ) : (
        plan.isSuccess && (
          <p className="text-sm text-ink-600">
            No plan saved yet{canEdit ? ': set a specification and the plant limits, then plan.' : '.'}
          </p>
        )
      )}
    </div>
  );
}
