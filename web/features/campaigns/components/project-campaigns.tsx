import { useId, useState, type ReactNode } from 'react';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import { SafetyCaution } from '../../../components/ui/caution';
import { Button, errorAria, LabelAbove } from '../../../components/ui/form';
import { paths } from '../../../config/paths';
import { enantiomericRatio, fixed, percentColumn, withUncertainty, lnRatioOf, lnRatioRange } from '../../../lib/format';
import { ConventionNote } from '../../../components/ui/fields';
import { useCampaigns } from '../api/campaigns';
import { OPENING_COMPARISON_CELSIUS, useComparison } from '../api/comparison';
import type { CampaignListItem, ComparisonCampaign } from '../api/types';
import { parseNumber } from '../lib/grid';
import { CELSIUS, STATUS_MARK } from '../lib/labels';
import { NewCampaignForm } from './new-campaign-form';
import {
  ABSOLUTE_ZERO,
  celsiusFromKelvin,
  DISPLAY_MEASURES,
  formatDisplay,
  formatMeasureRange,
  type SelectivityMeasure,
} from '../../../../api/science/quantities';
import { ListHead } from '../../../components/ui/table-head';

const plus = (v: number, text: string) => (v > 0 && !text.startsWith('+') ? `+${text}` : text);

function DdH({ c }: { c: ComparisonCampaign | undefined }) {
  if (!c?.ddH) return <span className="text-ink-500">—</span>;
  return <>{plus(c.ddH['kJ/mol'], withUncertainty(c.ddH['kJ/mol'], c.ddH.se?.['kJ/mol'], 1))}</>;
}

const isEnantiomers = (measure: SelectivityMeasure | undefined) => measure === undefined || measure === 'ee' || measure === 'er';

/** The forecast in the campaign's own measure: ee for enantiomers; dr (with its PI) for diastereomers; % A otherwise. */
function SelectivityAt({
  c,
  measure,
  eeCell,
}: {
  c: ComparisonCampaign | undefined;
  measure: SelectivityMeasure | undefined;
  eeCell: EeCell;
}) {
  if (isEnantiomers(measure)) return <EeAt c={c} cell={eeCell} />;
  const p = c?.prediction;
  if (!p) return <span className="text-ink-500">{c?.problem ? 'no fit' : '—'}</span>;
  const primary = DISPLAY_MEASURES[measure!][0];
  const pi = p.predictionInterval;
  return (
    <span>
      <span className="font-medium text-ink-950">{formatDisplay(primary, lnRatioOf(p))}</span>
      {pi && <span className="block text-xs text-ink-600">PI {formatMeasureRange(primary, ...lnRatioRange(pi))}</span>}
      {p.extrapolated && <span className="block text-xs font-medium text-caution-700">⚠ extrapolated</span>}
    </span>
  );
}

type EeCell = (percent: number) => string;

/**
 * One number of decimals for every ee on show (forecasts and interval ends), from the finest assay SD among
 * the enantiomer campaigns (see percentColumn), so the figures line up.
 */
function eeCellFor(shown: ComparisonCampaign[], campaigns: CampaignListItem[]): EeCell {
  const sds = campaigns.filter((c) => c.measure === 'ee' && c.defaultUncertainty !== null).map((c) => c.defaultUncertainty as number);
  const values = shown.flatMap((c) =>
    c.prediction ? [c.prediction.eePercent, ...(c.prediction.predictionInterval?.eePercent ?? [])] : [],
  );
  return percentColumn(values, sds.length ? Math.min(...sds) : null);
}

function EeAt({ c, cell }: { c: ComparisonCampaign | undefined; cell: EeCell }) {
  const p = c?.prediction;
  if (!p) return <span className="text-ink-500">{c?.problem ? 'no fit' : '—'}</span>;
  const pi = p.predictionInterval;
  return (
    <span>
      <span className="font-medium text-ink-950">{cell(p.eePercent)}</span>
      {pi && (
        <span className="block text-xs text-ink-600">
          PI {cell(pi.eePercent[0])} to {cell(pi.eePercent[1])}
        </span>
      )}
      {p.extrapolated && <span className="block text-xs font-medium text-caution-700">⚠ extrapolated</span>}
    </span>
  );
}

/** The project's campaigns with their fitted ΔΔH‡ and the forecast at one chosen temperature, and a side-by-side comparison. */
export function ProjectCampaigns({ projectId, canEdit }: { projectId: string; canEdit: boolean }) {
  const atId = useId();
  // Checked as typed (the field turns red at once), so the form keeps no error state of its own.
  const atForm = useForm({ defaultValues: { at: '−20' } });
  const atText = atForm.watch('at');
  const [creating, setCreating] = useState(false);
  const [picked, setPicked] = useState<string[] | null>(null);
  const parsedAt = parseNumber(atText);
  const atValid = typeof parsedAt === 'number' && parsedAt > ABSOLUTE_ZERO.C && parsedAt <= celsiusFromKelvin(1000);
  const [atCelsius, setAtCelsius] = useState(OPENING_COMPARISON_CELSIUS);
  const campaigns = useCampaigns(projectId);
  const comparison = useComparison(projectId, atCelsius);
  const byId = new Map((comparison.data?.campaigns ?? []).map((c) => [c.id, c]));

  if (campaigns.isPending) return <p className="text-sm text-ink-500">Loading campaigns…</p>;
  if (campaigns.isError)
    return (
      <p role="alert" className="text-sm text-rose-700">
        {campaigns.error.message}
      </p>
    );
  const list = campaigns.data;
  const chosen = picked ?? list.slice(0, 4).map((c) => c.id);
  const eeCell = eeCellFor(comparison.data?.campaigns ?? [], list);

  return (
    <div className="flex flex-col gap-5">
      <section aria-labelledby="campaigns-h" className="flex flex-col gap-3 rounded-lg border border-slate-200 bg-white p-4 shadow-sm">
        <div className="flex flex-wrap items-end justify-between gap-3">
          <h2 id="campaigns-h" className="text-sm font-semibold uppercase tracking-wide text-ink-600">
            Campaigns
          </h2>
          <form
            noValidate
            className="flex items-end gap-2"
            onSubmit={(e) => {
              e.preventDefault();
              if (atValid) setAtCelsius(parsedAt);
            }}
          >
            <LabelAbove id={atId} label="Forecast at">
              <div className="flex items-center gap-1">
                <input
                  id={atId}
                  inputMode="decimal"
                  {...atForm.register('at')}
                  {...errorAria(atId, !atValid)}
                  className={`tnum w-20 rounded border px-2 py-1 text-right text-sm ${atValid ? 'border-slate-300' : 'border-rose-600 bg-rose-50'}`}
                />
                <span className="text-sm text-ink-600">°C</span>
              </div>
            </LabelAbove>
            <Button type="submit">Compare</Button>
            {!atValid && (
              <p id={`${atId}-err`} className="text-xs text-rose-700">
                ✕ a temperature in °C above −273.15
              </p>
            )}
          </form>
        </div>
        {list.length === 0 ? (
          <p className="text-sm text-ink-600">
            No campaigns yet.{canEdit ? ' Start one below: a temperature screen of one reaction.' : ''}
          </p>
        ) : (
          <div className="overflow-x-auto">
            <table className="tnum w-full border-collapse text-sm" aria-label="Campaigns of the project">
              <ListHead
                density="compact"
                columns={[
                  { label: 'Campaign', align: 'left' },
                  { label: 'Status', align: 'left' },
                  { label: 'n (in fit)', align: 'right' },
                  { label: 'T range (°C)', align: 'right' },
                  { label: 'ΔΔH‡ ± SE (kJ/mol)', align: 'right' },
                  {
                    label: (
                      <>
                        {list.every((c) => isEnantiomers(c.measure)) ? 'ee' : 'Selectivity'} at{' '}
                        {fixed(comparison.data?.at.celsius ?? atCelsius, 1)} °C ({list.every((c) => isEnantiomers(c.measure)) ? '%, ' : ''}
                        95 % PI)
                      </>
                    ),
                    align: 'right',
                  },
                  { label: 'Compare', align: 'left' },
                ]}
              />
              <tbody>
                {list.map((c) => (
                  <CampaignRow
                    key={c.id}
                    c={c}
                    cmp={byId.get(c.id)}
                    picked={chosen.includes(c.id)}
                    onPick={(on) => setPicked(on ? [...chosen, c.id] : chosen.filter((id) => id !== c.id))}
                    eeCell={eeCell}
                  />
                ))}
              </tbody>
            </table>
          </div>
        )}
        {comparison.isError && (
          <p role="alert" className="text-sm text-rose-700">
            Comparison unavailable: {comparison.error.message}
          </p>
        )}
        {canEdit && !creating && (
          <div>
            <Button variant="primary" onClick={() => setCreating(true)}>
              New campaign
            </Button>
          </div>
        )}
        {canEdit && creating && (
          <section aria-label="New campaign" className="rounded border border-slate-200 bg-slate-50 p-3">
            <h3 className="mb-2 text-sm font-semibold text-ink-900">New campaign</h3>
            <NewCampaignForm projectId={projectId} onCancel={() => setCreating(false)} />
          </section>
        )}
      </section>

      {comparison.data && chosen.length > 0 && (
        <Comparison
          at={comparison.data.at}
          campaigns={comparison.data.campaigns.filter((c) => chosen.includes(c.id))}
          measures={new Map(list.map((c) => [c.id, c.measure]))}
          eeCell={eeCellFor(
            comparison.data.campaigns.filter((c) => chosen.includes(c.id)),
            list,
          )}
          stale={comparison.isPlaceholderData}
        />
      )}
    </div>
  );
}

function CampaignRow({
  c,
  cmp,
  picked,
  onPick,
  eeCell,
}: {
  c: CampaignListItem;
  cmp: ComparisonCampaign | undefined;
  picked: boolean;
  onPick: (on: boolean) => void;
  eeCell: EeCell;
}) {
  const range = c.temperatureRangeK;
  return (
    <tr className="border-b border-slate-100 align-top">
      <td className="py-2 pr-3">
        <Link to={paths.campaign.getHref(c.id)} className="font-medium text-fjord-700 underline">
          {c.title}
        </Link>
        <span className="block text-xs text-ink-600">
          A = {c.productNameA} · B = {c.productNameB}
        </span>
      </td>
      <td className="whitespace-nowrap py-2 pr-3">
        <span aria-hidden="true">{STATUS_MARK[c.status]} </span>
        {c.status}
      </td>
      <td className="py-2 pr-3 text-right">
        {c.measurementCount}
        {c.includedCount !== c.measurementCount && <span className="text-ink-600"> ({c.includedCount})</span>}
        <span className="block text-xs text-ink-500">
          {c.distinctTemperatures} T{c.distinctTemperatures === 1 ? '' : 's'}
        </span>
      </td>
      <td className="whitespace-nowrap py-2 pr-3 text-right">
        {range ? `${fixed(range.min - CELSIUS, 0)} to ${fixed(range.max - CELSIUS, 0)}` : <span className="text-ink-500">—</span>}
      </td>
      <td className="whitespace-nowrap py-2 pr-3 text-right">
        <DdH c={cmp} />
        {cmp?.breakAt && <span className="block text-xs text-ink-600">{breakText(cmp.breakAt)}</span>}
      </td>
      <td className="whitespace-nowrap py-2 pr-3 text-right">
        <SelectivityAt c={cmp} measure={c.measure} eeCell={eeCell} />
      </td>
      <td className="py-2">
        <input type="checkbox" checked={picked} onChange={(e) => onPick(e.target.checked)} aria-label={`Compare ${c.title} side by side`} />
      </td>
    </tr>
  );
}

function breakText(b: NonNullable<ComparisonCampaign['breakAt']>): string {
  return b.claim === 'isoinversion'
    ? `isoinversion at ${fixed(b.celsius, 0)} °C (r ${b.extremum})`
    : `change of slope at ${fixed(b.celsius, 0)} °C`;
}

/** Chosen campaigns as columns, the quantities that tell catalysts or solvents apart as rows. */
function Comparison({
  at,
  campaigns,
  measures,
  eeCell,
  stale,
}: {
  at: { kelvin: number; celsius: number };
  campaigns: ComparisonCampaign[];
  measures: Map<string, SelectivityMeasure>;
  eeCell: EeCell;
  stale: boolean;
}) {
  // ee only for enantiomer pairs: with a dr (or % A) campaign among the columns, each column speaks its own measure.
  const allEnantiomers = campaigns.every((c) => isEnantiomers(measures.get(c.id)));
  const also = (c: ComparisonCampaign) => {
    const m = measures.get(c.id) ?? 'ee';
    if (!c.prediction) return '—';
    if (isEnantiomers(m)) return `er ${enantiomericRatio(c.prediction.percentA)}`;
    const lnR = lnRatioOf(c.prediction);
    return DISPLAY_MEASURES[m]
      .slice(1)
      .map((d) => formatDisplay(d, lnR))
      .join(' · ');
  };
  const selectivityRows: { name: string; cell: (c: ComparisonCampaign) => ReactNode }[] = allEnantiomers
    ? [
        { name: `ee at ${fixed(at.celsius, 1)} °C (%)`, cell: (c) => <EeAt c={c} cell={eeCell} /> },
        { name: 'er (A:B)', cell: (c) => (c.prediction ? enantiomericRatio(c.prediction.percentA) : '—') },
      ]
    : [
        {
          name: `Selectivity at ${fixed(at.celsius, 1)} °C`,
          cell: (c) => <SelectivityAt c={c} measure={measures.get(c.id)} eeCell={eeCell} />,
        },
        { name: 'Also as', cell: also },
      ];
  const rows: { name: string; cell: (c: ComparisonCampaign) => ReactNode }[] = [
    { name: 'Runs in the fit (n)', cell: (c) => c.n },
    {
      name: 'ΔΔH‡ (kJ/mol)',
      cell: (c) => (c.ddH ? plus(c.ddH['kJ/mol'], withUncertainty(c.ddH['kJ/mol'], c.ddH.se?.['kJ/mol'], 1)) : '—'),
    },
    {
      name: 'ΔΔH‡ (kcal/mol)',
      cell: (c) => (c.ddH ? plus(c.ddH['kcal/mol'], withUncertainty(c.ddH['kcal/mol'], c.ddH.se?.['kcal/mol'], 2)) : '—'),
    },
    {
      name: 'ΔΔS‡ (J/(mol·K))',
      cell: (c) => (c.ddS ? plus(c.ddS['J/(mol*K)'], withUncertainty(c.ddS['J/(mol*K)'], c.ddS.se?.['J/(mol*K)'], 1)) : '—'),
    },
    {
      name: `ΔΔG‡ at ${fixed(at.celsius, 1)} °C (kJ/mol)`,
      cell: (c) =>
        c.prediction
          ? plus(c.prediction.ddG['kJ/mol'], withUncertainty(c.prediction.ddG['kJ/mol'], c.prediction.ddGSe?.['kJ/mol'], 2))
          : '—',
    },
    ...selectivityRows,
    {
      name: 'Model',
      cell: (c) =>
        c.preferred === 'two-branch'
          ? `two branches${c.prediction?.branch ? ` (${c.prediction.branch === 'low' ? 'low' : 'high'}-T branch at ${fixed(at.celsius, 0)} °C)` : ''}`
          : c.preferred === 'one-line'
            ? 'one line'
            : '—',
    },
    // A break row only when some campaign claims one (an isoinversion only with slopes of opposite sign).
    ...(campaigns.some((c) => c.breakAt)
      ? [{ name: 'Break (°C)', cell: (c: ComparisonCampaign) => (c.breakAt ? breakText(c.breakAt) : '—') }]
      : []),
    { name: 'Warnings', cell: (c) => (c.problem ? c.problem.message : c.warnings ? `⚠ ${c.warnings}` : 'none') },
  ];
  return (
    <section
      aria-labelledby="compare-h"
      className={`flex flex-col gap-3 rounded-lg border border-slate-200 bg-white p-4 shadow-sm ${stale ? 'opacity-60' : ''}`}
    >
      <h2 id="compare-h" className="text-sm font-semibold uppercase tracking-wide text-ink-600">
        Side by side at {fixed(at.celsius, 1)} °C ({fixed(at.kelvin, 2)} K)
      </h2>
      <div className="overflow-x-auto">
        <table className="tnum w-full border-collapse text-sm" aria-label="Side-by-side comparison">
          <thead className="border-b border-slate-200 text-xs text-ink-600">
            <tr>
              <th scope="col" className="py-1.5 pr-3 text-left font-medium">
                Quantity (B − A)
              </th>
              {campaigns.map((c) => (
                <th key={c.id} scope="col" className="py-1.5 pr-3 text-right font-medium text-ink-900">
                  {c.title}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.name} className="border-b border-slate-100 align-top">
                <th scope="row" className="whitespace-nowrap py-1 pr-3 text-left font-medium text-ink-700">
                  {r.name}
                </th>
                {campaigns.map((c) => (
                  <td key={c.id} className="py-1 pr-3 text-right">
                    {r.cell(c)}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <ConventionNote />
      <SafetyCaution compact />
    </section>
  );
}
