import { useId, useMemo, useState } from 'react';
import { useController, useForm, type Control } from 'react-hook-form';
import { savedForecastCreateSchema, type TemperatureUnit } from '../../../../api/features/campaigns/schemas';
import { SafetyCaution } from '../../../components/ui/caution';
import { Button, errorAria, LabelAbove } from '../../../components/ui/form';
import { StaleResult, useLastDefined, type StaleReason } from '../../../components/ui/stale';
import { applyServerErrors, errorAt, FORM_ERROR } from '../../../lib/form';
import { dateFormatter, enantiomericRatio, fixed, measureColumn, percent, sig, lnRatioOf, lnRatioRange } from '../../../lib/format';
import { PredictionBox } from '../../../components/fit/prediction-box';
import { useDeleteForecast, useForecasts, useSaveForecast } from '../api/forecasts';
import type { AnalysisResponse, FitPrediction, SavedForecastView } from '../api/types';
import { kelvinTo, parseNumber } from '../lib/grid';
import {
  DISPLAY_MEASURES,
  DISPLAY_UNIT,
  displayHeading,
  formatDisplay,
  formatMeasureRange,
  fromKelvin,
  TEMPERATURE_UNIT_LABEL as UNIT_TEXT,
  toKelvin,
  type DisplayMeasure,
  type SelectivityMeasure,
} from '../../../../api/science/quantities';

/** r, or a plain statement when it is beyond what a number can hold (far outside the data). */
/** The fields of the save form; a server error on another path shows under the form. */
const SAVE_FIELDS = ['label', 'notes', 'temperature'];

const ratioText = (r: number | null) => (r === null ? 'beyond any representable number' : sig(r, 3));

function toCelsius(value: number, unit: TemperatureUnit): number {
  return unit === 'C' ? value : fromKelvin(toKelvin(value, unit), 'C');
}

/** "the predicted ratio, ee and % A" or, for a dr campaign, "the predicted dr, % de and % major". */
function predictedWords(measure: SelectivityMeasure): string {
  if (measure === 'dr') return 'the predicted dr, % de and % major diastereomer';
  if (measure === 'ee' || measure === 'er') return 'the predicted ratio, ee and % A';
  return 'the predicted % A and ratio';
}

/**
 * Type a proposed temperature, see the forecast with its 95 % prediction interval (the page's
 * analysis at that temperature), and keep it with a note. `onAt` sets the temperature the
 * analysis is computed at (°C).
 */
export function ProposedTemperatureForecastPanel({
  campaignId,
  analysis,
  atCelsius,
  onAt,
  weighting,
  canEdit,
  measure = 'ee',
  failed = false,
  onRetry,
  retrying = false,
}: {
  campaignId: string;
  analysis: AnalysisResponse | undefined;
  /** The page's analysis request failed: the last forecast stays, greyed and labelled, with a retry. */
  failed?: boolean;
  onRetry?: () => void;
  retrying?: boolean;
  atCelsius: number | null;
  onAt: (celsius: number | null) => void;
  weighting: 'none' | 'uncertainty';
  canEdit: boolean;
  /** The campaign's measure: sets what the forecast is shown as (dr, % de, % major for diastereomers). */
  measure?: SelectivityMeasure;
}) {
  const id = useId();
  const atForm = useForm({ defaultValues: { text: atCelsius === null ? '' : String(atCelsius), unit: 'C' as TemperatureUnit } });
  const [text, unit] = atForm.watch(['text', 'unit']);
  const error = errorAt(atForm.formState.errors, 'text') ?? null;
  const setError = (message: string | null) =>
    message === null ? atForm.clearErrors('text') : atForm.setError('text', { type: 'validate', message });
  const saveForm = useForm<SaveText>({ defaultValues: { label: '', notes: '' } });
  const saveErrors = saveForm.formState.errors;
  const [savedNote, setSavedNote] = useState<string | null>(null);
  const save = useSaveForecast(campaignId);

  const submit = () => {
    setSavedNote(null);
    const n = parseNumber(text);
    if (n === null) {
      setError('type a temperature');
      return;
    }
    if (n === 'invalid') {
      setError(`“${text.trim()}” is not a number`);
      return;
    }
    const check = savedForecastCreateSchema.shape.temperature.safeParse({ value: n, unit });
    if (!check.success) {
      setError(check.error.issues[0].message);
      return;
    }
    setError(null);
    onAt(Math.round(toCelsius(n, unit) * 1e6) / 1e6);
  };

  const prediction = analysis?.at ?? null;
  const fit = analysis?.fit ?? null;
  const showing = prediction && atCelsius !== null && Math.abs(prediction.celsius - atCelsius) < 1e-6;
  // The forecast on screen: the current one, or the last one while the next is computed or after a failure.
  const current = useMemo(
    () => (fit && showing && prediction ? { prediction, confidence: fit.confidence } : null),
    [fit, showing, prediction],
  );
  const last = useLastDefined(current);
  const shown = atCelsius === null ? null : last;
  const typed = parseNumber(text);
  const typedCelsius = typeof typed === 'number' ? toCelsius(typed, unit) : null;
  const reason: StaleReason | null = !shown
    ? null
    : failed
      ? 'failed'
      : !current
        ? 'updating'
        : typedCelsius === null || Math.abs(typedCelsius - shown.prediction.celsius) > 1e-6
          ? 'changed'
          : null;

  const doSave = () => {
    if (!prediction) return;
    const body = { temperature: { value: prediction.celsius, unit: 'C' as const }, ...saveForm.getValues() };
    const parsed = savedForecastCreateSchema.safeParse(body);
    saveForm.clearErrors();
    if (!parsed.success) {
      for (const i of parsed.error.issues) saveForm.setError(String(i.path[0]) as 'label', { type: 'validate', message: i.message });
      return;
    }
    save.mutate(
      { body: parsed.data, weighting },
      {
        onSuccess: (f) => {
          saveForm.reset();
          setSavedNote(`Saved the forecast at ${fixed(f.celsius, 1)} °C.`);
        },
        onError: (err) => applyServerErrors(saveForm.setError, err, SAVE_FIELDS),
      },
    );
  };

  return (
    <div className="flex flex-col gap-3">
      <form
        noValidate
        className="flex flex-wrap items-end gap-2"
        onSubmit={(e) => {
          e.preventDefault();
          submit();
        }}
      >
        <LabelAbove id={id} label="Proposed temperature" roomy>
          <div className="flex items-center gap-1">
            <input
              id={id}
              inputMode="decimal"
              autoComplete="off"
              {...atForm.register('text')}
              placeholder="e.g. −30"
              {...errorAria(id, !!error)}
              className={`tnum w-24 rounded border px-2 py-1 text-right text-sm ${error ? 'border-rose-600 bg-rose-50' : 'border-slate-300 bg-white'}`}
            />
            <select
              aria-label="Unit of the forecast temperature"
              {...atForm.register('unit')}
              className="rounded border border-slate-300 bg-white px-1 py-1 text-sm"
            >
              {(['C', 'K', 'F'] as const).map((u) => (
                <option key={u} value={u}>
                  {UNIT_TEXT[u]}
                </option>
              ))}
            </select>
          </div>
        </LabelAbove>
        <Button type="submit" variant="primary">
          Forecast
        </Button>
        {atCelsius !== null && (
          <Button
            onClick={() => {
              atForm.setValue('text', '');
              onAt(null);
            }}
          >
            Clear
          </Button>
        )}
        {error && (
          <p id={`${id}-err`} className="w-full text-xs text-rose-700">
            <span aria-hidden="true">✕ </span>
            {error}
          </p>
        )}
      </form>

      {!fit && !shown && (
        <p className="text-sm text-ink-600">
          {/* Without an answer the analysis is loading or failed (said beside the result); never blame missing runs then. */}
          {analysis && !failed
            ? `A forecast needs a fit: ${analysis.problem?.message ?? 'add measurements first.'}`
            : 'A forecast needs the fit, which is not available right now (see the result above).'}
        </p>
      )}
      {fit && !showing && atCelsius === null && (
        <p className="text-sm text-ink-600">
          Type a temperature to get {predictedWords(measure)} with the 95 % prediction interval for one new run.
        </p>
      )}
      {fit && atCelsius !== null && !shown && <p className="text-sm text-ink-600">Computing…</p>}
      {shown && (
        <StaleResult reason={reason} action="Forecast" onRetry={onRetry} retrying={retrying}>
          <ForecastResult prediction={shown.prediction} confidence={shown.confidence} measure={measure} />
          {canEdit && reason === null && (
            <form
              noValidate
              aria-label="Save this forecast"
              className="flex flex-wrap items-end gap-2 rounded border border-slate-200 bg-slate-50 px-3 py-2"
              onSubmit={(e) => {
                e.preventDefault();
                doSave();
              }}
            >
              <SmallField control={saveForm.control} name="label" label="Label (optional)" width="w-48" />
              <SmallField control={saveForm.control} name="notes" label="Note" width="w-80" />
              <Button type="submit" disabled={save.isPending}>
                {save.isPending ? 'Saving…' : `Save forecast at ${fixed(shown.prediction.celsius, 1)} °C`}
              </Button>
              {errorAt(saveErrors, 'temperature') && <p className="w-full text-xs text-rose-700">✕ {errorAt(saveErrors, 'temperature')}</p>}
              {errorAt(saveErrors, FORM_ERROR) && (
                <p role="alert" className="w-full text-xs text-rose-700">
                  ✕ {errorAt(saveErrors, FORM_ERROR)}
                </p>
              )}
              {savedNote && (
                <p role="status" className="w-full text-xs text-fjord-700">
                  ✓ {savedNote}
                </p>
              )}
            </form>
          )}
        </StaleResult>
      )}
    </div>
  );
}

/** The prediction at the proposed temperature, with r and (for enantiomers) er. */
function ForecastResult({
  prediction,
  confidence,
  measure,
}: {
  prediction: FitPrediction;
  confidence: number;
  measure: SelectivityMeasure;
}) {
  return (
    <>
      <PredictionBox prediction={prediction} confidence={confidence} measure={measure} />
      <p className="tnum text-sm text-ink-700">
        Predicted ratio r = [A]/[B] = <span className="font-medium text-ink-950">{ratioText(prediction.ratio)}</span>
        {prediction.predictionInterval && (
          <>
            {' '}
            (95 % PI {ratioText(prediction.predictionInterval.ratio[0])} to {ratioText(prediction.predictionInterval.ratio[1])})
          </>
        )}
        {measure === 'ee' || measure === 'er' ? `, er ${enantiomericRatio(prediction.percentA)}` : ''}.
      </p>
    </>
  );
}

/** An interval in a column: percentages to the column's decimals, low to high; ratios and % major as before. */
function intervalText(display: DisplayMeasure, [a, b]: [number, number], cell: (lnR: number) => string): string {
  if (DISPLAY_UNIT[display] !== '%' || display === 'major') return formatMeasureRange(display, a, b);
  const [lo, hi] = a <= b ? [a, b] : [b, a];
  return `${cell(lo)} to ${cell(hi)}`;
}

/** The texts kept with a saved forecast. */
interface SaveText {
  label: string;
  notes: string;
}

/** A text input of the save form, bound to its field `name` (value and error). */
function SmallField({ control, name, label, width }: { control: Control<SaveText>; name: keyof SaveText; label: string; width: string }) {
  const id = useId();
  const { field, fieldState } = useController({ control, name });
  const error = fieldState.error?.message;
  return (
    <LabelAbove id={id} label={label}>
      <input
        id={id}
        value={field.value}
        onChange={(e) => field.onChange(e.target.value)}
        {...errorAria(id, !!error)}
        className={`${width} rounded border px-2 py-1 text-sm ${error ? 'border-rose-600 bg-rose-50' : 'border-slate-300 bg-white'}`}
      />
      {error && (
        <p id={`${id}-err`} className="text-xs text-rose-700">
          ✕ {error}
        </p>
      )}
    </LabelAbove>
  );
}

const dateFormat = dateFormatter({ dateStyle: 'medium', timeStyle: 'short' });

/** Kept forecasts, each against any run measured since within ±1 K of its temperature. */
export function SavedForecasts({
  campaignId,
  canEdit,
  measure = 'ee',
  assaySd = null,
}: {
  campaignId: string;
  canEdit: boolean;
  measure?: SelectivityMeasure;
  /** SD of one assay result in the unit of the percentage columns: sets their decimals. */
  assaySd?: number | null;
}) {
  const [primary, secondary] = DISPLAY_MEASURES[measure];
  const forecasts = useForecasts(campaignId);
  const remove = useDeleteForecast(campaignId);
  const columns = useMemo(() => forecastColumns(forecasts.data ?? [], measure, assaySd), [forecasts.data, measure, assaySd]);
  if (forecasts.isPending) return <p className="text-sm text-ink-500">Loading saved forecasts…</p>;
  if (forecasts.isError)
    return (
      <p role="alert" className="text-sm text-rose-700">
        {forecasts.error.message}
      </p>
    );
  if (forecasts.data.length === 0)
    return (
      <p className="text-sm text-ink-600">No saved forecasts yet.{canEdit ? ' Make a forecast above and save it with a note.' : ''}</p>
    );
  return (
    <div className="flex flex-col gap-2">
      <div className="overflow-x-auto rounded border border-slate-200">
        <table className="tnum w-full border-collapse text-sm" aria-label="Saved forecasts">
          <thead className="bg-slate-50 text-xs text-ink-600">
            <tr className="border-b border-slate-200">
              <th scope="col" className="px-2 py-1 text-right font-medium">
                T (°C)
              </th>
              <th scope="col" className="px-2 py-1 text-left font-medium">
                Label and note
              </th>
              <th scope="col" className="px-2 py-1 text-right font-medium">
                Forecast {primary === 'ee' ? 'ee (%)' : displayHeading(primary)}
              </th>
              <th scope="col" className="px-2 py-1 text-right font-medium">
                95 % PI ({primary === 'ee' ? '% ee' : displayHeading(primary).replace(/ \(%\)$/, '')})
              </th>
              <th scope="col" className="px-2 py-1 text-right font-medium">
                {primary === 'ee' ? 'A (%)' : displayHeading(secondary)}
              </th>
              <th scope="col" className="px-2 py-1 text-left font-medium">
                Measured since
              </th>
              <th scope="col" className="px-2 py-1 text-left font-medium">
                Saved
              </th>
              {canEdit && (
                <th scope="col" className="px-2 py-1">
                  <span className="sr-only">Actions</span>
                </th>
              )}
            </tr>
          </thead>
          <tbody>
            {forecasts.data.map((f) => (
              <ForecastRow
                key={f.id}
                f={f}
                columns={columns}
                measure={measure}
                canEdit={canEdit}
                onDelete={() => remove.mutate(f.id)}
                deleting={remove.isPending && remove.variables === f.id}
              />
            ))}
          </tbody>
        </table>
      </div>
      <p className="text-xs text-ink-600">
        A saved forecast is a snapshot of the fit when it was saved. Runs stored later within ±1 K of its temperature appear beside it,
        marked inside or outside its prediction interval.
      </p>
      <SafetyCaution compact />
    </div>
  );
}

/** One formatter per number column, so each column shows one number of decimals (see measureColumn). */
interface ForecastColumns {
  forecast: (lnR: number) => string;
  interval: (lnR: number) => string;
  other: (lnR: number) => string;
}

function forecastColumns(forecasts: SavedForecastView[], measure: SelectivityMeasure, assaySd: number | null): ForecastColumns {
  const [primary, secondary] = DISPLAY_MEASURES[measure];
  const lnRs = forecasts.map((f) => lnRatioOf(f.result));
  const ends = forecasts.flatMap((f) => (f.result.predictionInterval ? lnRatioRange(f.result.predictionInterval) : []));
  return {
    forecast: measureColumn(primary, lnRs, assaySd),
    interval: measureColumn(primary, ends, assaySd),
    // Enantiomers show % A beside ee; other pairs their second measure.
    other: measureColumn(primary === 'ee' ? 'percentA' : secondary, lnRs, assaySd),
  };
}

function ForecastRow({
  f,
  columns,
  measure,
  canEdit,
  onDelete,
  deleting,
}: {
  f: SavedForecastView;
  columns: ForecastColumns;
  measure: SelectivityMeasure;
  canEdit: boolean;
  onDelete: () => void;
  deleting: boolean;
}) {
  const pi = f.result.predictionInterval;
  const primary = DISPLAY_MEASURES[measure][0];
  const lnR = lnRatioOf(f.result);
  const enantiomers = primary === 'ee';
  return (
    <tr className="border-b border-slate-100 align-top">
      <td className="px-2 py-1 text-right font-medium">{fixed(f.celsius, 1)}</td>
      <td className="max-w-xs px-2 py-1">
        {f.label ? <span className="font-medium text-ink-900">{f.label}</span> : <span className="text-ink-500">—</span>}
        {f.notes && <span className="block text-xs text-ink-600">{f.notes}</span>}
        {f.result.model === 'segmented' && (
          <span className="block text-xs text-ink-600">
            two-branch model, {f.result.branch === 'low' ? 'low' : 'high'}-temperature branch
          </span>
        )}
        {f.result.extrapolated && <span className="block text-xs font-medium text-caution-700">⚠ extrapolated beyond the screen</span>}
      </td>
      <td className="px-2 py-1 text-right">{columns.forecast(lnR)}</td>
      <td className="px-2 py-1 text-right text-ink-700">{!pi ? '—' : intervalText(primary, lnRatioRange(pi), columns.interval)}</td>
      <td className="px-2 py-1 text-right">{columns.other(lnR)}</td>
      <td className="px-2 py-1 text-left">
        {f.measured.length === 0 ? (
          <span className="text-ink-500">no run yet</span>
        ) : (
          <ul>
            {f.measured.map((m) => (
              <li key={m.measurementId}>
                {enantiomers ? `${percent(m.eePercent)} % ee` : formatDisplay(primary, Math.log(m.ratio))} at{' '}
                {fixed(kelvinTo(m.kelvin, 'C'), 1)} °C{' '}
                {m.insidePredictionInterval === null ? (
                  <span className="text-ink-600">(no interval to compare)</span>
                ) : m.insidePredictionInterval ? (
                  <span className="font-medium text-fjord-700">✓ inside the interval</span>
                ) : (
                  <span className="font-medium text-rose-700">✕ outside the interval</span>
                )}
              </li>
            ))}
          </ul>
        )}
      </td>
      <td className="whitespace-nowrap px-2 py-1 text-left text-xs text-ink-600">
        {dateFormat(new Date(f.createdAt))}
        {f.createdBy && <span className="block">{f.createdBy.displayName ?? f.createdBy.login}</span>}
      </td>
      {canEdit && (
        <td className="px-2 py-1">
          <Button
            variant="danger"
            className="px-2 py-0.5 text-xs"
            disabled={deleting}
            onClick={onDelete}
            aria-label={`Delete the forecast at ${fixed(f.celsius, 1)} °C`}
          >
            Delete
          </Button>
        </td>
      )}
    </tr>
  );
}
