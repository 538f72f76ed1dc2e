/** The fit panel's request bookkeeping and the shaping of the API's answer for its charts (no statistics here). */
import type { FitRequestInput, FitResponse } from '../../../../api/features/calculators/schemas';
import type { EyringCurvePoint, EyringPlotPoint } from '../../../components/charts/eyring-plot';
import type { SelectivityCurvePoint } from '../../../components/charts/selectivity-chart';
import type { FieldError } from '../../../lib/api-client';
import { normalisePath, tidyMessage } from '../../../lib/field-errors';
import { errorBarLnRatio, GRID_SIZE } from './fit-request';
import type { ScreenParseError, ScreenRow, SelectivityMeasure, TemperatureUnit } from './parse-screen';
import { celsiusFromKelvin, eeFromLnRatio, readDecimal } from '../../../../api/science/quantities';

export interface Submitted {
  request: FitRequestInput;
  rows: ScreenRow[];
  measure: SelectivityMeasure;
  hasProposed: boolean;
  /** The form as it stood when sent, to tell when the result on screen no longer matches it. */
  inputs: FitInputs;
}

export interface FitInputs {
  text: string;
  unit: TemperatureUnit;
  measure: SelectivityMeasure;
  weighting: 'none' | 'uncertainty';
  uncertaintyScale: 'absolute' | 'relative';
  proposedText: string;
  newRunText: string;
}

export function numberOrNull(text: string): number | null | 'invalid' {
  if (text.trim() === '') return null;
  return readDecimal(text) ?? 'invalid';
}

/** An interval in ln r: the API's own lnRatio ends (ratio ends are null beyond the representable range). */
const lnOf = (
  iv: { lnRatio?: [number, number] | undefined; ratio: [number | null, number | null] } | undefined | null,
): [number, number] | null => (iv ? (iv.lnRatio ?? [Math.log(iv.ratio[0] ?? 0), Math.log(iv.ratio[1] ?? Infinity)]) : null);

/** The median SD of the pasted runs that carry one (the assay precision), or null. */
export function medianUncertainty(rows: ScreenRow[]): number | null {
  const sds = rows
    .map((r) => r.uncertainty)
    .filter((u): u is number => typeof u === 'number' && u > 0)
    .sort((a, b) => a - b);
  if (sds.length === 0) return null;
  const mid = Math.floor(sds.length / 2);
  return sds.length % 2 ? sds[mid] : (sds[mid - 1] + sds[mid]) / 2;
}

/** Split the API's field errors: those on a measurement go to its pasted line, the rest to the form. */
export function mapFitErrors(
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

/** Shape the API's answer for the charts (ln of the API's ratios; no statistics here). */
export function buildView(fit: FitResponse, submitted: Submitted) {
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
