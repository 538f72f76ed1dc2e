import { useMemo, useState } from 'react';
import type { FitRequestInput, FitResponse } from '../../../../api/features/calculators/schemas';
import { EyringPlot, type EyringCurvePoint, type EyringPlotPoint } from '../../../components/charts/eyring-plot';
import { SelectivityChart, type SelectivityCurvePoint } from '../../../components/charts/selectivity-chart';
import { Panel } from '../../../components/ui/page';
import { sameInputs, StaleResult, useLastDefined, worthRetrying, type StaleReason } from '../../../components/ui/stale';
import { ApiError, type FieldError } from '../../../lib/api-client';
import { fixed } from '../../../lib/format';
import { useFit } from '../api/post-fit';
import { exampleScreen } from '../lib/example-screen';
import { normalisePath, tidyMessage } from '../../../lib/field-errors';
import { buildFitRequest, errorBarLnRatio, GRID_SIZE } from '../lib/fit-request';
import { parseScreen, type ScreenParseError, type ScreenRow, type SelectivityMeasure, type TemperatureUnit } from '../lib/parse-screen';
import { ChartControls, parseSpec } from '../../../components/charts/chart-controls';
import {
  buttonClass,
  measureOptions,
  NumberField,
  ProblemAlert,
  Segmented,
  secondaryButtonClass,
  SelectField,
  temperatureUnitOptions,
} from '../../../components/ui/fields';
import { FitParameterTable } from '../../../components/fit/fit-parameter-table';
import { FitWarnings, ResidualTable, TwoBranchBox, branchLines } from '../../../components/fit/fit-diagnostics';
import { PredictionBox } from '../../../components/fit/prediction-box';
import { ScreenPasteBox } from './screen-paste-box';
import { celsiusFromKelvin, eeFromLnRatio, readDecimal, TEMPERATURE_UNIT_LABEL as UNIT_TEXT } from '../../../../api/science/quantities';

const MEASURE_TEXT: Record<SelectivityMeasure, string> = { ee: 'ee %', er: 'er (A:B)', dr: 'dr (A:B)', percentA: '% A', ratio: 'r = A/B' };

interface Submitted {
  request: FitRequestInput;
  rows: ScreenRow[];
  measure: SelectivityMeasure;
  hasProposed: boolean;
  /** The form as it stood when sent, to tell when the result on screen no longer matches it. */
  inputs: FitInputs;
}

interface FitInputs {
  text: string;
  unit: TemperatureUnit;
  measure: SelectivityMeasure;
  weighting: 'none' | 'uncertainty';
  uncertaintyScale: 'absolute' | 'relative';
  proposedText: string;
  newRunText: string;
}

function numberOrNull(text: string): number | null | 'invalid' {
  if (text.trim() === '') return null;
  return readDecimal(text) ?? 'invalid';
}

/** An interval in ln r: the API's own lnRatio ends (ratio ends are null beyond the representable range). */
const lnOf = (
  iv: { lnRatio?: [number, number] | undefined; ratio: [number | null, number | null] } | undefined | null,
): [number, number] | null => (iv ? (iv.lnRatio ?? [Math.log(iv.ratio[0] ?? 0), Math.log(iv.ratio[1] ?? Infinity)]) : null);

/** The median SD of the pasted runs that carry one (the assay precision), or null. */
function medianUncertainty(rows: ScreenRow[]): number | null {
  const sds = rows
    .map((r) => r.uncertainty)
    .filter((u): u is number => typeof u === 'number' && u > 0)
    .sort((a, b) => a - b);
  if (sds.length === 0) return null;
  const mid = Math.floor(sds.length / 2);
  return sds.length % 2 ? sds[mid] : (sds[mid - 1] + sds[mid]) / 2;
}

/** Split the API's field errors: those on a measurement go to its pasted line, the rest to the form. */
function mapFitErrors(
  errors: FieldError[],
  submitted: Submitted | null,
): { lineErrors: ScreenParseError[]; proposed: string[]; other: FieldError[] } {
  const lineErrors: ScreenParseError[] = [];
  const proposed: string[] = [];
  const other: FieldError[] = [];
  for (const e of errors) {
    const path = normalisePath(e.path);
    const m = /^measurements\.(\d+)(?:\.(.+))?$/.exec(path);
    const row = m && submitted ? submitted.rows[Number(m[1])] : undefined;
    if (row) {
      const message = tidyMessage(e.path, e.message);
      const field = m![2] ? m![2].split('.')[0] : '';
      lineErrors.push({ line: row.line, message: field && !message.startsWith(field) ? `${field}: ${message}` : message });
    } else if (submitted?.hasProposed && path.startsWith(`predict.${GRID_SIZE}`)) {
      proposed.push(e.message);
    } else {
      other.push(e);
    }
  }
  return { lineErrors, proposed, other };
}

/** Fit panel: paste a screen, get the Eyring plot with bands, the parameters and a prediction. */
export function FitPanel() {
  const [text, setText] = useState('');
  const [unit, setUnit] = useState<TemperatureUnit>('C');
  const [measure, setMeasure] = useState<SelectivityMeasure>('ee');
  const [weighting, setWeighting] = useState<'none' | 'uncertainty'>('none');
  const [uncertaintyScale, setUncertaintyScale] = useState<'absolute' | 'relative'>('absolute');
  const [proposedText, setProposedText] = useState('');
  const [newRunText, setNewRunText] = useState('');
  const [excludedLines, setExcludedLines] = useState<number[]>([]);
  const [submitted, setSubmitted] = useState<Submitted | null>(null);
  const [formProblem, setFormProblem] = useState<string | null>(null);
  const [chartMeasure, setChartMeasure] = useState<'ee' | 'percentA'>('ee');
  const [specText, setSpecText] = useState('99');

  const parsed = useMemo(() => parseScreen(text, measure, unit), [text, measure, unit]);
  const query = useFit(submitted?.request ?? null);
  const apiErrors = query.error instanceof ApiError ? query.error.fieldErrors : [];
  const mapped = mapFitErrors(apiErrors, submitted);
  const proposed = numberOrNull(proposedText);
  const inputs: FitInputs = { text, unit, measure, weighting, uncertaintyScale, proposedText, newRunText };

  const send = (excluded: number[]) => {
    setFormProblem(null);
    if (parsed.errors.length > 0) {
      setFormProblem('Fix the lines listed under the screen first.');
      return;
    }
    if (parsed.rows.length < 2) {
      setFormProblem('Paste at least two runs (three or more temperatures give intervals).');
      return;
    }
    if (proposed === 'invalid') {
      setFormProblem('The proposed temperature is not a number.');
      return;
    }
    const newRun = numberOrNull(newRunText);
    if (newRun === 'invalid') {
      setFormProblem('The assay SD for a new run is not a number.');
      return;
    }
    const settings = { measure, unit, weighting, uncertaintyScale, proposed, excludedLines: excluded };
    const request = { ...buildFitRequest(parsed.rows, settings), ...(newRun === null ? {} : { newRunUncertainty: newRun }) };
    setSubmitted({ request, rows: parsed.rows, measure, hasProposed: proposed !== null, inputs });
  };

  const toggleExclude = (line: number) => {
    const next = excludedLines.includes(line) ? excludedLines.filter((l) => l !== line) : [...excludedLines, line];
    setExcludedLines(next);
    send(next);
  };

  const loadExample = () => {
    setText(exampleScreen.text);
    setUnit(exampleScreen.unit);
    setMeasure(exampleScreen.measure);
    setProposedText(exampleScreen.proposedTemperature);
    setExcludedLines([]);
  };

  // The fit on screen and the request it answers; it stays (greyed, labelled) after a failed request or an edit.
  const answered = useMemo(
    () => (query.data && !query.isPlaceholderData && submitted ? { fit: query.data, submitted } : null),
    [query.data, query.isPlaceholderData, submitted],
  );
  const shown = useLastDefined(answered);
  const fit = shown?.fit;
  const view = useMemo(() => (shown ? buildView(shown.fit, shown.submitted) : null), [shown]);
  const reason: StaleReason | null =
    query.isError && !query.data
      ? 'failed'
      : query.isFetching
        ? 'updating'
        : shown && !sameInputs(inputs, shown.submitted.inputs)
          ? 'changed'
          : null;

  return (
    <Panel title="Fit a temperature screen (Eyring plot)">
      <div className="grid gap-6 lg:grid-cols-[minmax(0,22rem)_minmax(0,1fr)]">
        <form
          aria-label="Screen inputs"
          noValidate
          className="flex flex-col gap-3"
          onSubmit={(e) => {
            e.preventDefault();
            send(excludedLines);
          }}
        >
          <div className="flex flex-wrap items-end gap-2">
            <div className="flex flex-col gap-1">
              <span className="text-xs font-medium text-ink-700">Temperature unit</span>
              <SelectField label="Temperature unit of the screen" value={unit} options={temperatureUnitOptions} onChange={setUnit} />
            </div>
            <div className="flex flex-col gap-1">
              <span className="text-xs font-medium text-ink-700">Selectivity as</span>
              <SelectField label="Selectivity measure of the screen" value={measure} options={measureOptions} onChange={setMeasure} />
            </div>
            <button type="button" className={`${secondaryButtonClass} ml-auto`} onClick={loadExample}>
              Load invented example
            </button>
          </div>
          <ScreenPasteBox
            value={text}
            onChange={(t) => {
              setText(t);
              setExcludedLines([]);
            }}
            lineErrors={[...parsed.errors, ...mapped.lineErrors]}
            runCount={parsed.rows.length}
            headerLine={parsed.headerLine}
            unitLabel={UNIT_TEXT[unit]}
            selectivityLabel={MEASURE_TEXT[measure]}
          />
          <Segmented
            legend="Weighting"
            name="weighting"
            value={weighting}
            onChange={setWeighting}
            options={[
              { value: 'none', label: 'None' },
              { value: 'uncertainty', label: 'By uncertainty (SD column)' },
            ]}
          />
          {weighting === 'uncertainty' && (
            <Segmented
              legend="The SDs are"
              name="uncertainty-scale"
              value={uncertaintyScale}
              onChange={setUncertaintyScale}
              options={[
                { value: 'absolute', label: 'Absolute (true SDs)' },
                { value: 'relative', label: 'Relative (only ratios matter)' },
              ]}
            />
          )}
          <NumberField
            label="Proposed temperature"
            path="predict.proposed"
            value={proposedText}
            onChange={setProposedText}
            errors={mapped.proposed.map((message) => ({ path: 'predict.proposed', message }))}
            placeholder="e.g. −50"
            unit={<span className="text-sm text-ink-600">{UNIT_TEXT[unit]}</span>}
            hint="Forecast with a 95 % prediction interval for one new run."
          />
          <NumberField
            label="Assay SD of the new run (optional)"
            path="newRunUncertainty"
            value={newRunText}
            onChange={setNewRunText}
            errors={mapped.other.filter((e) => normalisePath(e.path) === 'newRunUncertainty')}
            placeholder="e.g. 0.2"
            unit={<span className="text-sm text-ink-600">{MEASURE_TEXT[measure]}</span>}
            hint="Propagated at the predicted value; blank: the median SD of the pasted runs, or their scatter."
          />
          <div>
            <button type="submit" className={buttonClass} disabled={query.isFetching}>
              {query.isFetching ? 'Fitting…' : 'Fit screen'}
            </button>
          </div>
          {formProblem && <ProblemAlert title="Not sent" detail={formProblem} />}
          {query.error && (mapped.other.length > 0 || mapped.lineErrors.length === 0) && (
            <ProblemAlert
              title={query.error instanceof ApiError ? query.error.problem.title : 'The fit failed'}
              detail={query.error.message}
              errors={mapped.other}
            />
          )}
        </form>

        <div className="flex min-w-0 flex-col gap-4" aria-live="polite">
          {!fit && !query.isFetching && (
            <p className="rounded border border-dashed border-slate-300 px-3 py-6 text-center text-sm text-ink-500">
              {query.error
                ? 'No fit: see the messages beside the inputs.'
                : 'Paste a screen (or load the invented example), then press Fit screen.'}
            </p>
          )}
          {fit && view && shown && (
            <StaleResult
              reason={reason}
              action="Fit screen"
              onRetry={worthRetrying(query.error) ? () => void query.refetch() : undefined}
              retrying={query.isFetching}
              className="gap-4"
            >
              <EyringPlot
                title="Eyring plot of the screen: ln r against 1000/T with the fitted line and bands"
                points={view.points}
                curve={view.curve}
                branches={branchLines(fit.twoBranch)}
                mark={view.proposed ? { kelvin: view.proposed.kelvin, label: `proposed ${fixed(view.proposed.celsius, 0)} °C` } : null}
                confidenceLevel={fit.confidence}
              />
              <FitWarnings
                warnings={
                  // The band grid runs past the data on purpose: keep the extrapolation warning only
                  // when the proposed temperature itself lies outside the screen.
                  [
                    ...fit.warnings.filter((w) => w.code !== 'extrapolation'),
                    ...(view.proposed?.extrapolated
                      ? [
                          {
                            code: 'extrapolation',
                            message: `${fixed(view.proposed.celsius, 1)} °C lies outside the screened range: the forecast assumes the ${view.proposed.model === 'segmented' ? 'nearest branch' : 'same straight line'} continues, which a change of mechanism would break.`,
                          },
                        ]
                      : []),
                  ]
                }
              />
              {view.proposed ? (
                <PredictionBox prediction={view.proposed} confidence={fit.confidence} measure={shown.submitted.measure} />
              ) : (
                <p className="text-sm text-ink-500">Enter a proposed temperature to get a prediction with its interval.</p>
              )}
              <FitParameterTable fit={fit} />
              <TwoBranchBox twoBranch={fit.twoBranch} />
              <div className="flex flex-col gap-2">
                <h3 className="text-sm font-semibold text-ink-900">Selectivity against temperature from the fit</h3>
                <ChartControls
                  name="fit"
                  measure={chartMeasure}
                  onMeasure={setChartMeasure}
                  spec={specText}
                  onSpec={setSpecText}
                  family={shown.submitted.measure}
                />
                <SelectivityChart
                  title="Fitted selectivity against temperature with the prediction band"
                  curve={view.selectivityCurve}
                  points={view.selectivityPoints}
                  measure={chartMeasure}
                  family={shown.submitted.measure}
                  spec={parseSpec(specText)}
                  curveLabel="fitted line"
                  bandLabel={`${fixed(fit.confidence * 100, 0)} % prediction band (new run)`}
                  mark={view.proposed ? { celsius: view.proposed.celsius, label: `proposed ${fixed(view.proposed.celsius, 0)} °C` } : null}
                  height={260}
                />
              </div>
              <div className="flex flex-col gap-1">
                <h3 className="text-sm font-semibold text-ink-900">Runs and residuals</h3>
                <ResidualTable
                  fit={fit}
                  lines={shown.submitted.rows.map((r) => r.line)}
                  assaySd={shown.submitted.measure === 'ee' ? medianUncertainty(shown.submitted.rows) : null}
                  excludedLines={excludedLines}
                  onToggleExclude={toggleExclude}
                />
                <p className="text-xs text-ink-500">
                  Excluding a run refits at once; the run stays on the plot as a hollow circle. Note why you excluded it in your records.
                </p>
              </div>
            </StaleResult>
          )}
        </div>
      </div>
    </Panel>
  );
}

/** Shape the API's answer for the charts (ln of the API's ratios; no statistics here). */
function buildView(fit: FitResponse, submitted: Submitted) {
  const grid = fit.predictions.slice(0, GRID_SIZE);
  const proposed = submitted.hasProposed ? (fit.predictions[GRID_SIZE] ?? null) : null;
  const points: EyringPlotPoint[] = fit.residuals.map((r) => {
    const row = submitted.rows[r.index];
    const bar = row && r.status !== 'censored' ? errorBarLnRatio(submitted.measure, r.lnRatio, row.selectivity, row.uncertainty) : null;
    return {
      id: r.index,
      kelvin: r.kelvin,
      lnRatio: r.lnRatio,
      lnRatioLow: bar?.low ?? null,
      lnRatioHigh: bar?.high ?? null,
      status: r.status,
      flagged: r.flags.length > 0,
      label: row ? `line ${row.line}` : undefined,
    };
  });
  const curve: EyringCurvePoint[] = grid.map((p) => ({
    kelvin: p.kelvin,
    lnRatio: p.lnRatio ?? Math.log(p.ratio ?? Infinity),
    confidence: lnOf(p.confidenceInterval),
    prediction: lnOf(p.predictionInterval),
  }));
  const selectivityCurve: SelectivityCurvePoint[] = grid.map((p) => ({
    celsius: p.celsius,
    eePercent: p.eePercent,
    percentA: p.percentA,
    band: p.predictionInterval ? { eePercent: p.predictionInterval.eePercent, percentA: p.predictionInterval.percentA } : null,
  }));
  const selectivityPoints = fit.residuals.map((r) => ({
    id: r.index,
    celsius: celsiusFromKelvin(r.kelvin),
    eePercent: eeFromLnRatio(r.lnRatio),
    percentA: 100 / (1 + Math.exp(-r.lnRatio)),
    status: r.status,
  }));
  return { points, curve, proposed, selectivityCurve, selectivityPoints };
}
