import { useForm } from 'react-hook-form';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { LineChart } from '../../components/charts/line-chart';
import { SafetyCaution } from '../../components/ui/caution';
import { VerdictMark } from '../../components/ui/verdict';
import { Page, Panel, UnreadyPage } from '../../components/ui/page';
import { paths } from '../../config/paths';
import { ApiError } from '../../lib/api-client';
import { fixed, percentColumn, probabilityPercent, sig } from '../../lib/format';
import { SignedInOnly } from '../../features/auth/components/signed-in-only';
import { ConventionNote, NumberField, buttonClass, inputClass } from '../../components/ui/fields';
import { useCampaigns } from '../../features/campaigns/api/campaigns';
import { useComparison, useCreateComparison, type ComparisonView } from '../../features/plan/api/plan';
import { EyringOverlay } from '../../features/plan/components/eyring-overlay';
import { specificationText } from '../../lib/specification';
import { readDecimal } from '../../../api/science/quantities';

const VERDICT: Record<string, string> = {
  first: 'the first is more selective',
  second: 'the second is more selective',
  'cannot-tell': 'the data cannot tell them apart',
};

function ComparisonBody({ view }: { view: ComparisonView }) {
  const r = view.result;
  const title = (id: string) => r.campaigns.find((c) => c.id === id)?.title ?? 'unavailable campaign';
  const unit = r.valueMeasure === 'dr' ? 'dr (r:1)' : r.valueMeasure === 'ee' ? '% ee' : '% major';
  // Percentages in the table share one number of decimals (raised near 100 %); a dr keeps four significant figures.
  const shownValues = r.campaigns.flatMap((c) => (c.fit ? [c.fit.at.value, ...c.fit.at.interval] : []));
  const cell = r.valueMeasure === 'dr' ? (v: number) => sig(v, 4) : percentColumn(shownValues);
  return (
    <div className="flex flex-col gap-4">
      <Panel title={`Selectivity against temperature (${unit})`}>
        <LineChart
          title="Selectivity of each campaign against temperature"
          yLabel={unit}
          formatY={(y) => sig(y, 4)}
          testId="comparison-chart"
          bandLabel="Shaded: the 95 % confidence band of each campaign's fitted line."
          series={r.campaigns
            .filter((c) => c.fit)
            .map((c) => ({
              key: c.id,
              label: c.title ?? c.id,
              points: c.fit!.curve.map((p) => ({ x: p.celsius, y: p.value })),
              band: c.fit!.curve.map((p) => ({ x: p.celsius, lo: Math.min(...p.interval), hi: Math.max(...p.interval) })),
            }))}
        />
      </Panel>
      <Panel title="Eyring plots (ln r against 1000/T)">
        <EyringOverlay result={r} />
      </Panel>
      <Panel title={`At ${fixed(r.temperature.celsius, 1)} °C`}>
        <div className="overflow-x-auto">
          <table className="tnum w-full text-sm" data-testid="comparison-campaigns">
            <thead className="text-left text-xs text-ink-600">
              <tr>
                <th className="py-1 pr-3">Campaign</th>
                <th className="py-1 pr-3">ΔΔH‡ (kJ/mol)</th>
                <th className="py-1 pr-3">ΔΔS‡ (J/(mol·K))</th>
                <th className="py-1 pr-3">
                  {unit} at {fixed(r.temperature.celsius, 1)} °C (95 % CI of the line)
                </th>
                <th className="py-1 pr-3">Its specification at {fixed(r.temperature.celsius, 1)} °C</th>
              </tr>
            </thead>
            <tbody>
              {r.campaigns.map((c) => (
                <tr key={c.id} className="border-t border-slate-100">
                  <td className="py-1 pr-3">{c.title ?? 'Not available to you'}</td>
                  {c.fit ? (
                    <>
                      <td className="py-1 pr-3">
                        {fixed(c.fit.ddH['kJ/mol'], 2)}
                        {c.fit.ddH.se !== null && ` ± ${fixed(c.fit.ddH.se, 2)}`}
                      </td>
                      <td className="py-1 pr-3">
                        {fixed(c.fit.ddS['J/(mol*K)'], 1)}
                        {c.fit.ddS.se !== null && ` ± ${fixed(c.fit.ddS.se, 1)}`}
                      </td>
                      <td className="py-1 pr-3">
                        {cell(c.fit.at.value)} ({cell(c.fit.at.interval[0])} to {cell(c.fit.at.interval[1])})
                      </td>
                      <td className="py-1 pr-3" data-testid="comparison-meets">
                        {c.specification ? (
                          <>
                            <VerdictMark meets={c.meetsAtTemperature === 'meets'} />{' '}
                            <span className="text-xs text-ink-600">({specificationText(c.specification, c.measure ?? 'ee')})</span>
                          </>
                        ) : (
                          <span className="text-ink-600">no specification set</span>
                        )}
                      </td>
                    </>
                  ) : (
                    <td className="py-1 pr-3 text-ink-600" colSpan={4}>
                      {c.problem}
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <ConventionNote className="mt-2" />
      </Panel>
      <Panel title="Which is better">
        <ul className="flex flex-col gap-3" data-testid="comparison-pairs">
          {r.pairs.map((p) => (
            <li key={`${p.first}-${p.second}`} className="rounded border border-slate-200 p-3 text-sm">
              <p className="font-medium">
                {title(p.first)} against {title(p.second)}: {p.verdict === 'cannot-tell' ? '≈ ' : p.verdict === 'first' ? '▲ ' : '▼ '}
                {VERDICT[p.verdict]}
              </p>
              <p className="tnum text-ink-700">
                Difference in ln r {sig(p.differenceLnR, 3)} (95 % interval {sig(p.interval[0], 3)} to {sig(p.interval[1], 3)}); in ΔΔG‡{' '}
                {fixed(p.differenceDdG['kJ/mol'], 2)} kJ/mol. Probability the first is more selective here:{' '}
                {probabilityPercent(p.probabilityFirstBetter)} %.
              </p>
              <p className="tnum text-ink-700">
                Equal slopes (extra sum of squares F test): F = {p.equalSlopes.F === null ? '—' : sig(p.equalSlopes.F, 3)}, p ={' '}
                {p.equalSlopes.p === null ? '—' : sig(p.equalSlopes.p, 2)}.{' '}
                {p.crossover
                  ? `The lines cross at ${fixed(p.crossover.celsius, 0)} °C (${p.crossover.bounded ? `Fieller 95 % interval ${fixed(p.crossover.interval[0]!.celsius, 0)} to ${fixed(p.crossover.interval[1]!.celsius, 0)} °C` : p.crossover.note}).`
                  : 'The lines do not cross within the screened range.'}
              </p>
              {p.verdict === 'cannot-tell' && (
                <p className="text-ink-600">
                  {p.runsToTellApart === null
                    ? 'More than 50 added runs at this temperature would be needed to tell them apart, if they differ at all.'
                    : `About ${p.runsToTellApart} added run(s) at this temperature in each campaign would tell them apart if the present difference is real.`}
                </p>
              )}
            </li>
          ))}
        </ul>
        <div className="mt-3">
          <SafetyCaution compact />
        </div>
      </Panel>
    </div>
  );
}

function ComparisonPage({ comparisonId }: { comparisonId: string }) {
  const q = useComparison(comparisonId);
  if (!q.isSuccess) return <UnreadyPage query={q} title="Comparison" missingTitle="Comparison not found" />;
  return (
    <Page
      title={q.data.name}
      lead={
        <Link className="text-fjord-700 underline" to={paths.project.getHref(q.data.projectId)}>
          ← Project
        </Link>
      }
    >
      <ComparisonBody view={q.data} />
    </Page>
  );
}

export function ComparisonRoute() {
  const { comparisonId = '' } = useParams();
  return <SignedInOnly title="Comparison">{() => <ComparisonPage comparisonId={comparisonId} />}</SignedInOnly>;
}

function CompareForm({ projectId }: { projectId: string }) {
  const campaigns = useCampaigns(projectId);
  const create = useCreateComparison();
  const navigate = useNavigate();
  const form = useForm({ defaultValues: { campaignIds: [] as string[], name: '', atC: '-20' } });
  const [chosen, atC] = form.watch(['campaignIds', 'atC']);
  const errors = create.error instanceof ApiError ? create.error.fieldErrors : [];
  const onSubmit = form.handleSubmit((v) =>
    create.mutate(
      // The typed-number grammar of the whole app (decimal comma, true minus); an unreadable number is sent as such and refused.
      { projectId, name: v.name, campaignIds: v.campaignIds, temperature: { value: readDecimal(v.atC) ?? Number.NaN, unit: 'C' } },
      { onSuccess: (view) => navigate(paths.comparison.getHref(view.id)) },
    ),
  );
  return (
    <Page
      title="Compare campaigns"
      lead={
        <Link className="text-fjord-700 underline" to={paths.project.getHref(projectId)}>
          ← Project
        </Link>
      }
    >
      <Panel>
        <form className="flex flex-col gap-3" onSubmit={onSubmit} aria-label="Compare campaigns">
          <fieldset>
            <legend className="mb-1 text-xs font-medium text-ink-700">Campaigns (2 to 6)</legend>
            <ul className="flex flex-col gap-1">
              {campaigns.data?.map((c) => (
                <li key={c.id}>
                  <label className="flex items-center gap-2 text-sm">
                    <input
                      type="checkbox"
                      checked={chosen.includes(c.id)}
                      onChange={(e) =>
                        form.setValue('campaignIds', e.target.checked ? [...chosen, c.id] : chosen.filter((x) => x !== c.id))
                      }
                    />
                    {c.title}{' '}
                    <span className="text-xs text-ink-500">
                      ({c.measure}, {c.includedCount} runs)
                    </span>
                  </label>
                </li>
              ))}
            </ul>
          </fieldset>
          <div className="flex flex-wrap items-end gap-3">
            <div className="flex flex-col gap-1">
              <label htmlFor="comparison-name" className="text-xs font-medium text-ink-700">
                Name
              </label>
              <input id="comparison-name" className={`${inputClass} w-64`} {...form.register('name')} />
            </div>
            <NumberField
              label="Compare at (°C)"
              path="temperature.value"
              value={atC}
              onChange={(t) => form.setValue('atC', t)}
              errors={errors}
              width="w-20"
            />
            <button type="submit" className={buttonClass} disabled={create.isPending}>
              Compare and save
            </button>
          </div>
          {create.error && (
            <p role="alert" className="text-sm text-rose-700">
              {create.error.message} {errors.map((e) => `${e.path}: ${e.message}`).join('; ')}
            </p>
          )}
        </form>
      </Panel>
    </Page>
  );
}

export function CompareRoute() {
  const { projectId = '' } = useParams();
  return <SignedInOnly title="Compare campaigns">{() => <CompareForm projectId={projectId} />}</SignedInOnly>;
}
