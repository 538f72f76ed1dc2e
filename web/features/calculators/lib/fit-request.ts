import type { FitRequestInput } from '../../../../api/features/calculators/schemas';
import { temperatureToK } from '../../../../api/science/units';
import type { ScreenRow, SelectivityMeasure, TemperatureUnit } from './parse-screen';
import { lnRatioOf } from '../../../../api/science/quantities';

/** Number of temperatures at which the API evaluates the line and its bands for the plot. */
export const GRID_SIZE = 60;

export interface FitSettings {
  measure: SelectivityMeasure;
  unit: TemperatureUnit;
  weighting: 'none' | 'uncertainty';
  uncertaintyScale: 'absolute' | 'relative';
  /** Proposed temperature in `unit`, or null. */
  proposed: number | null;
  /** Line numbers of runs the user excluded. */
  excludedLines: number[];
}

/**
 * Temperatures (K) spanning the screened range plus a margin (and the proposed temperature),
 * evenly spaced in 1/T so the Eyring plot is sampled evenly.
 */
export function predictionGridK(kelvins: number[], proposedK: number | null, size = GRID_SIZE): number[] {
  const all = proposedK !== null ? [...kelvins, proposedK] : kelvins;
  const lo = Math.min(...all);
  const hi = Math.max(...all);
  const margin = Math.max(5, 0.1 * (hi - lo));
  const kLo = Math.max(1, lo - margin);
  const kHi = hi + margin;
  const xHi = 1 / kLo;
  const xLo = 1 / kHi;
  return Array.from({ length: size }, (_, i) => 1 / (xLo + ((xHi - xLo) * i) / (size - 1)));
}

/** The fit request: the runs, the settings and the grid (followed by the proposed temperature) to predict at. */
export function buildFitRequest(rows: ScreenRow[], settings: FitSettings): FitRequestInput {
  const { unit, measure } = settings;
  const kelvins = rows.map((r) => temperatureToK(r.temperature, unit));
  const proposedK = settings.proposed !== null ? temperatureToK(settings.proposed, unit) : null;
  const grid = predictionGridK(kelvins, proposedK).map((k) => ({ value: Number(k.toFixed(4)), unit: 'K' as const }));
  const predict = proposedK !== null ? [...grid, { value: settings.proposed!, unit }] : grid;
  return {
    measurements: rows.map((r) => ({
      temperature: { value: r.temperature, unit },
      selectivity: { measure, value: r.selectivity, ...(r.atLeast ? { atLeast: true } : {}) },
      ...(r.uncertainty !== undefined ? { uncertainty: r.uncertainty } : {}),
      ...(settings.excludedLines.includes(r.line) ? { excluded: true } : {}),
      label: `line ${r.line}`,
    })),
    weighting: settings.weighting,
    uncertaintyScale: settings.uncertaintyScale,
    confidence: 0.95,
    predict,
  };
}

/**
 * ln r at the ends of a run's ±1 SD error bar, for drawing only (the fit itself is the API's).
 * ee and % A: value ± SD in percentage points; er, dr, ratio: r·(1 ± relative SD).
 * An end that would leave the physical range is returned as null (open bar).
 */
export function errorBarLnRatio(
  measure: SelectivityMeasure,
  lnRatio: number,
  value: number | string,
  sd: number | undefined,
): { low: number | null; high: number | null } | null {
  if (sd === undefined) return null;
  if (measure === 'ee') {
    const v = typeof value === 'number' ? value : NaN;
    const ln = (ee: number) => (ee > -100 && ee < 100 ? lnRatioOf('ee', ee) : null);
    return { low: ln(v - sd), high: ln(v + sd) };
  }
  if (measure === 'percentA') {
    const v = typeof value === 'number' ? value : NaN;
    const ln = (p: number) => (p > 0 && p < 100 ? lnRatioOf('percentA', p) : null);
    return { low: ln(v - sd), high: ln(v + sd) };
  }
  return { low: sd < 1 ? lnRatio + Math.log(1 - sd) : null, high: lnRatio + Math.log(1 + sd) };
}
