import { useCallback, useMemo, useRef } from 'react';
import { useVirtualizer } from '@tanstack/react-virtual';
import { TableHead } from '../../../components/ui/table-head';
import { AfterFirstPaint } from '../../../components/ui/after-first-paint';
import { EyringPlot, type EyringCurvePoint, type EyringPlotPoint } from '../../../components/charts/eyring-plot';
import { SelectivityChart, type SelectivityCurvePoint, type SelectivityMeasuredPoint } from '../../../components/charts/selectivity-chart';
import { SignConvention } from '../../../components/ui/sign-convention';
import { VerdictMark } from '../../../components/ui/verdict';
import { fixed, leverageDecimals, measureColumn, percent, withUncertainty, lnRatioOf, lnRatioRange } from '../../../lib/format';
import { ChartControls, useChartControls } from '../../../components/charts/chart-controls';
import { FitWarnings, RunNote, TwoBranchBox, branchLines } from '../../../components/fit/fit-diagnostics';
import { FitParameterTable } from '../../../components/fit/fit-parameter-table';
import type { AnalysisResponse, FitPrediction, Measurement } from '../api/types';
import { measureRowAfterLayout, observeBoxAfterLayout, scrollBoxTo } from '../../../lib/virtual-rows';
import { CELSIUS } from '../lib/labels';
import { specificationLn, specificationOnAxis, specificationText, verdictOf, type StoredSpecification } from '../../../lib/specification';
import {
  DISPLAY_MEASURES,
  displayHeading,
  formatMeasure,
  formatMeasureRange,
  type SelectivityMeasure,
} from '../../../../api/science/quantities';

/** An interval in ln r: the API's own lnRatio ends (ratio ends are null beyond the representable range). */
const lnOf = (
  iv: { lnRatio?: [number, number] | undefined; ratio: [number | null, number | null] } | undefined | null,
): [number, number] | null => (iv ? (iv.lnRatio ?? [Math.log(iv.ratio[0] ?? 0), Math.log(iv.ratio[1] ?? Infinity)]) : null);

/** Shape the analysis for the shared charts (logarithms of the API's ratios; no statistics here). */
export function chartData(analysis: AnalysisResponse) {
  const points: EyringPlotPoint[] = analysis.points.map((p) => ({
    id: p.measurementId,
    kelvin: p.kelvin,
    lnRatio: p.lnRatio,
    // A bound has no two-sided uncertainty: its caret says "at least", a bar would mislead.
    lnRatioLow: p.status === 'censored' || p.lnRatioLow === p.lnRatio ? null : p.lnRatioLow,
    lnRatioHigh: p.status === 'censored' || p.lnRatioHigh === p.lnRatio ? null : p.lnRatioHigh,
    status: p.status,
    flagged: p.flagged,
    label: [p.label, p.exclusionReason ? `excluded: ${p.exclusionReason}` : null].filter(Boolean).join(' · ') || undefined,
  }));
  const curve: EyringCurvePoint[] = analysis.curve.map((c) => ({
    kelvin: c.kelvin,
    lnRatio: c.lnRatio ?? Math.log(c.ratio ?? Infinity),
    confidence: lnOf(c.confidenceInterval),
    prediction: lnOf(c.predictionInterval),
  }));
  const selectivityCurve: SelectivityCurvePoint[] = analysis.curve.map((c) => ({
    celsius: c.celsius,
    eePercent: c.eePercent,
    percentA: c.percentA,
    band: c.predictionInterval ? { eePercent: c.predictionInterval.eePercent, percentA: c.predictionInterval.percentA } : null,
  }));
  const selectivityPoints: SelectivityMeasuredPoint[] = analysis.points.map((p) => ({
    id: p.measurementId,
    celsius: p.celsius,
    eePercent: p.eePercent,
    percentA: p.percentA,
    status: p.status,
  }));
  return { points, curve, selectivityCurve, selectivityPoints };
}

/** Eyring plot, selectivity chart, parameter table and residual diagnostics of a stored campaign. */
export function CampaignAnalysis({
  analysis,
  measurements,
  stale,
  measure = 'ee',
  specification = null,
  assaySd = null,
}: {
  analysis: AnalysisResponse;
  measurements: Measurement[];
  /** SD of one assay result in the unit of the percentage columns: sets their decimals. */
  assaySd?: number | null;
  /** A newer answer is on its way (the old one stays on screen, dimmed). */
  stale: boolean;
  /** The campaign's measure: a dr campaign is shown in dr, % de and % major, never ee. */
  measure?: SelectivityMeasure;
  /** The stored specification (the campaign's own or the project's default): the chart's line and each run's pass/fail. */
  specification?: StoredSpecification | null;
}) {
  const chart = useChartControls('');
  // A line typed in the chart controls wins; otherwise the stored specification is drawn.
  const chartSpec = chart.spec ?? (specification ? specificationOnAxis(specification, chart.measure) : null);
  const view = useMemo(() => chartData(analysis), [analysis]);
  const fit = analysis.fit;
  // Memoised with the analysis: a new array on every render would redraw the plot's scales and marks.
  const branches = useMemo(() => branchLines(analysis.fit?.twoBranch), [analysis]);
  const at = analysis.at;
  const markLabel = at ? `${fixed(at.celsius, 0)} °C` : '';
  const twoBranchPreferred = fit?.twoBranch?.preferred === 'two-branch';

  if (!fit) {
    return (
      <div className="flex flex-col gap-3">
        <p role="status" className="rounded border border-dashed border-slate-300 px-3 py-6 text-center text-sm text-ink-600">
          No fit yet: {analysis.problem?.message ?? 'add measurements at two or more temperatures.'}
        </p>
        {analysis.points.length > 0 && (
          <EyringPlot title="Eyring plot of the campaign's measurements (no fit yet)" points={view.points} height={260} />
        )}
      </div>
    );
  }

  return (
    <div className={`flex flex-col gap-5 transition-opacity ${stale ? 'opacity-60' : ''}`} aria-busy={stale}>
      <div className="grid gap-5 xl:grid-cols-2">
        <figure className="flex min-w-0 flex-col gap-1">
          <figcaption className="text-sm font-semibold text-ink-900">Eyring plot · ln r against 1000/T</figcaption>
          <EyringPlot
            title="Eyring plot: ln r against 1000/T with the fitted line, confidence and prediction bands"
            points={view.points}
            curve={view.curve}
            branches={branches}
            mark={at ? { kelvin: at.kelvin, label: markLabel } : null}
            confidenceLevel={fit.confidence}
            height={320}
          />
        </figure>
        <figure className="flex min-w-0 flex-col gap-1">
          <figcaption className="flex flex-wrap items-end justify-between gap-2">
            <span className="text-sm font-semibold text-ink-900">Selectivity against temperature</span>
            <ChartControls name="campaign" family={measure} {...chart.controls} />
          </figcaption>
          <SelectivityChart
            title="Selectivity against temperature: fitted curve with the 95 % prediction band and the measured runs"
            curve={view.selectivityCurve}
            points={view.selectivityPoints}
            measure={chart.measure}
            family={measure}
            spec={chartSpec}
            curveLabel={twoBranchPreferred ? 'two-branch fit' : 'fitted line'}
            bandLabel={`${fixed(fit.confidence * 100, 0)} % prediction band (new run)`}
            mark={at ? { celsius: at.celsius, label: markLabel } : null}
            height={282}
          />
          {twoBranchPreferred && <p className="text-xs text-ink-600">Curve and band follow the two branches, which meet at the break.</p>}
        </figure>
      </div>
      <FitWarnings warnings={fit.warnings} />
      <div className="grid grid-cols-[minmax(0,1fr)] gap-5 xl:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
        <section aria-label="Fitted parameters" className="flex min-w-0 flex-col gap-3">
          <h3 className="text-sm font-semibold text-ink-900">
            {twoBranchPreferred ? 'One-line parameters (B − A), for comparison only' : 'Parameters (B − A)'}
          </h3>
          {twoBranchPreferred && (
            <p role="note" className="rounded border border-amber-300 bg-caution-50 px-3 py-2 text-sm text-caution-700">
              <span aria-hidden="true">⚠ </span>Two straight branches describe this screen better than one line: the single ΔΔH‡ and ΔΔS‡
              below average over the break. Forecasts use the two branches; read each branch's values in the curvature check, each only
              within its own temperature range.
            </p>
          )}
          <FitParameterTable fit={fit} />
          <SignConvention />
          {at ? (
            <DdGAt prediction={at} confidence={fit.confidence} measure={measure} />
          ) : (
            <p className="text-xs text-ink-600">ΔΔG‡ at another temperature: type it in the forecast panel below.</p>
          )}
        </section>
        <div className="flex min-w-0 flex-col gap-3">
          <TwoBranchBox twoBranch={fit.twoBranch} />
        </div>
      </div>
      {/* Below the charts and the parameters: laid out and painted as it nears the screen. */}
      <section aria-label="Residual diagnostics" className="laid-out-near-screen flex min-w-0 flex-col gap-2">
        <h3 className="text-sm font-semibold text-ink-900">Residual diagnostics</h3>
        {specification && (
          <p className="text-xs text-ink-700" data-testid="campaign-specification">
            Specification: {specificationText(specification, measure)}. Each run below says whether it meets it.
          </p>
        )}
        {/* A row per run, read after the charts and the parameters: built once the page is first idle. */}
        <AfterFirstPaint>
          <ResidualDiagnostics
            analysis={analysis}
            measurements={measurements}
            measure={measure}
            specification={specification}
            assaySd={assaySd}
          />
        </AfterFirstPaint>
        <p className="text-xs text-ink-600">
          Residuals are in ln r (measured − fitted). A run is flagged (⚑, ringed on the plot) when its studentized residual exceeds 3 in
          size, its leverage is high or its Cook’s distance exceeds 1, and only when at least 3 residual degrees of freedom leave room to
          tell an odd run from scatter. A flag asks for a second look at the run’s record; it is not by itself a reason to exclude the run.
        </p>
      </section>
    </div>
  );
}

/** ΔΔG‡ at the chosen temperature, with its SE from the full covariance. */
function DdGAt({ prediction, confidence, measure }: { prediction: FitPrediction; confidence: number; measure: SelectivityMeasure }) {
  const primary = DISPLAY_MEASURES[measure][0];
  const pi = prediction.predictionInterval;
  return (
    <dl
      className="tnum grid grid-cols-[auto_1fr] gap-x-4 gap-y-0.5 rounded border border-slate-200 px-3 py-2 text-sm"
      aria-label="Free-energy gap at the chosen temperature"
    >
      <dt className="text-ink-600">
        ΔΔG‡ at {fixed(prediction.celsius, 1)} °C ({fixed(prediction.kelvin, 2)} K)
      </dt>
      <dd className="text-ink-950">
        {withUncertainty(prediction.ddG['kJ/mol'], prediction.ddGSe?.['kJ/mol'])} kJ/mol ·{' '}
        {withUncertainty(prediction.ddG['kcal/mol'], prediction.ddGSe?.['kcal/mol'])} kcal/mol
      </dd>
      <dt className="text-ink-600">{primary === 'ee' ? 'ee' : displayHeading(primary).replace(/ \(%\)$/, '')} there</dt>
      <dd className="text-ink-950">
        {primary === 'ee' ? `${percent(prediction.eePercent)} %` : formatMeasure(primary, lnRatioOf(prediction))}
        {pi && (
          <span className="text-ink-600">
            {' '}
            ({fixed(confidence * 100, 0)} % PI{' '}
            {primary === 'ee'
              ? `${percent(pi.eePercent[0])} to ${percent(pi.eePercent[1])} %`
              : formatMeasureRange(primary, ...lnRatioRange(pi))}
            )
          </span>
        )}
        {prediction.extrapolated && <span className="ml-1 font-medium text-caution-700">⚠ extrapolated</span>}
      </dd>
    </dl>
  );
}

/** Above this many runs only the rows in view of the table's own scroll box are drawn. */
const VIRTUAL_FROM_ROWS = 120;
/** Height of one row before it is measured (px), and the box's size before it is measured. */
const estimateRowHeight = () => 21;
const RESIDUALS_INITIAL_RECT = { width: 900, height: 384 };

const FLAG_TEXT: Record<string, string> = {
  outlier: 'outlier (|t| > 3)',
  'high-leverage': 'high leverage',
  influential: "influential (Cook's D > 1)",
};

/** One row per run: residual in ln r, studentized residual, leverage, Cook's distance, flags. */
function ResidualDiagnostics({
  analysis,
  measurements,
  measure,
  specification,
  assaySd,
}: {
  analysis: AnalysisResponse;
  measurements: Measurement[];
  measure: SelectivityMeasure;
  specification: StoredSpecification | null;
  assaySd: number | null;
}) {
  const primary = DISPLAY_MEASURES[measure][0];
  const specLn = specification ? specificationLn(specification) : null;
  const selectivityCell = measureColumn(
    primary,
    analysis.points.map((p) => p.lnRatio),
    assaySd,
  );
  const byId = useMemo(() => new Map(measurements.map((m) => [m.id, m])), [measurements]);
  const residuals = analysis.fit?.residuals ?? [];
  // Leverages read against the fit's high-leverage limit (0.004 on a screen of 1 000 runs).
  const leverageDigits = analysis.fit ? leverageDecimals(analysis.fit.n) : 2;
  const points = analysis.points;
  const scrollRef = useRef<HTMLDivElement>(null);
  const virtual = points.length >= VIRTUAL_FROM_ROWS;
  const getItemKey = useCallback((i: number) => points[i]?.measurementId ?? i, [points]);
  const virtualizer = useVirtualizer({
    count: virtual ? points.length : 0,
    getScrollElement: () => scrollRef.current,
    estimateSize: estimateRowHeight,
    overscan: 10,
    initialRect: RESIDUALS_INITIAL_RECT,
    getItemKey,
    measureElement: measureRowAfterLayout,
    observeElementRect: observeBoxAfterLayout,
    scrollToFn: scrollBoxTo,
  });
  const items = virtual ? virtualizer.getVirtualItems() : points.map((_, index) => ({ index, start: 0, end: 0 }));
  const padTop = virtual && items.length ? items[0]!.start : 0;
  const padBottom = virtual && items.length ? virtualizer.getTotalSize() - items[items.length - 1]!.end : 0;
  return (
    // Focusable so the table can be scrolled from the keyboard.
    <div
      ref={scrollRef}
      className="max-h-96 overflow-auto rounded border border-slate-200"
      tabIndex={0}
      role="region"
      aria-label="Residuals and flags for each run"
    >
      <table className="tnum w-full border-collapse text-right text-xs" aria-rowcount={points.length + 1}>
        <caption className="sr-only">Residuals and flags for each run</caption>
        <TableHead
          className="sticky top-0 bg-slate-50 text-ink-600"
          columns={[
            { label: 'Run', align: 'left' },
            { label: 'T (°C)' },
            { label: displayHeading(primary) },
            { label: 'ln r' },
            { label: 'Residual (ln r)' },
            { label: 'Studentized (internal)' },
            { label: 'Leverage' },
            { label: 'Cook’s D' },
            { label: 'Status', align: 'left' },
            ...(specLn !== null ? [{ label: 'Specification', align: 'left' as const }] : []),
          ]}
        />
        <tbody>
          {padTop > 0 && <tr aria-hidden="true" style={{ height: padTop }} />}
          {items.map(({ index: i }) => {
            const p = points[i]!;
            const r = residuals[i];
            const m = byId.get(p.measurementId);
            // Exclusions and bounds are shown as the status; only the diagnostic flags go beside it.
            const flags = (r?.flags ?? []).filter((f) => !/^(excluded|censored|lower-bound)/.test(f));
            const flagged = p.flagged;
            return (
              <tr
                key={p.measurementId}
                data-index={i}
                ref={virtual ? virtualizer.measureElement : undefined}
                aria-rowindex={i + 2}
                className={`border-b border-slate-100 ${flagged ? 'bg-caution-50' : ''} ${p.status === 'excluded' ? 'text-ink-500' : ''}`}
              >
                <td className="px-2 py-0.5 text-left">{p.label ?? m?.sampleId ?? i + 1}</td>
                <td className="px-2 py-0.5">{fixed(p.kelvin - CELSIUS, 1)}</td>
                <td className="px-2 py-0.5">
                  {p.status === 'censored' ? '≥ ' : ''}
                  {selectivityCell(p.lnRatio)}
                </td>
                <td className="px-2 py-0.5">{fixed(p.lnRatio, 3)}</td>
                <td className="px-2 py-0.5">{r?.residual == null ? '—' : fixed(r.residual, 3)}</td>
                <td className="px-2 py-0.5">{r?.studentizedInternal == null ? '—' : fixed(r.studentizedInternal, 2)}</td>
                <td className="px-2 py-0.5">{r?.leverage == null ? '—' : fixed(r.leverage, leverageDigits)}</td>
                <td className="px-2 py-0.5">{r?.cooksDistance == null ? '—' : fixed(r.cooksDistance, 2)}</td>
                {/* A floor on its width: on a phone the table scrolls sideways instead of wrapping a run's note into a tower. */}
                <td className="min-w-[16rem] px-2 py-0.5 text-left">
                  {p.status === 'excluded' ? (
                    <span>
                      <span aria-hidden="true">○ </span>excluded{p.exclusionReason ? `: ${p.exclusionReason}` : ''}
                    </span>
                  ) : p.status === 'censored' ? (
                    <span>
                      <span aria-hidden="true">◆ </span>lower bound
                    </span>
                  ) : (
                    <span>
                      <span aria-hidden="true">● </span>fitted
                    </span>
                  )}
                  {flags.length > 0 && (
                    <span className="ml-1 font-medium text-caution-700">⚑ {flags.map((f) => FLAG_TEXT[f] ?? f).join(', ')}</span>
                  )}
                  {r && <RunNote residual={r} />}
                </td>
                {specLn !== null && (
                  <td className="px-2 py-0.5 text-left">
                    <VerdictMark meets={verdictOf(p.lnRatio, specLn) === 'meets'} />
                  </td>
                )}
              </tr>
            );
          })}
          {padBottom > 0 && <tr aria-hidden="true" style={{ height: padBottom }} />}
        </tbody>
      </table>
    </div>
  );
}
