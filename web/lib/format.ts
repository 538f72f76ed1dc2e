/**
 * Number formatting for the instrument look: true minus signs, significant figures
 * chosen for the quantity, and uncertainty rounded to two significant figures with
 * the value rounded to the same decimal place.
 */
import { highLeverageLimit } from '../../api/science/flag-rules';
import {
  DISPLAY_UNIT,
  eeFromLnRatio,
  formatMeasure,
  percentAFromLnRatio,
  percentDecimals,
  type DisplayMeasure,
} from '../../api/science/quantities';

const MINUS = '\u2212';

function withMinus(text: string): string {
  return text.startsWith('-') ? MINUS + text.slice(1) : text;
}

/** Fixed decimals with a true minus sign; "−0.0" becomes "0.0". */
export function fixed(value: number, decimals: number): string {
  if (!Number.isFinite(value)) return '—';
  const text = value.toFixed(Math.max(0, Math.min(20, decimals)));
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : withMinus(text);
}

/** Superscript digits for powers of ten. */
const SUPERSCRIPT: Record<string, string> = {
  '-': '⁻',
  '0': '⁰',
  '1': '¹',
  '2': '²',
  '3': '³',
  '4': '⁴',
  '5': '⁵',
  '6': '⁶',
  '7': '⁷',
  '8': '⁸',
  '9': '⁹',
};

/** `sig` significant figures; very large or small magnitudes as a × 10ⁿ. */
export function sig(value: number, figures = 3): string {
  if (!Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const magnitude = Math.floor(Math.log10(Math.abs(value)));
  if (magnitude >= 5 || magnitude <= -4) return scientific(value, figures);
  return fixed(value, Math.max(0, figures - 1 - magnitude));
}

/** a × 10ⁿ with `figures` significant figures, a true minus and superscript digits. */
export function scientific(value: number, figures = 3): string {
  const [mantissa, exponent] = value.toExponential(figures - 1).split('e');
  const power = String(Number(exponent))
    .split('')
    .map((c) => SUPERSCRIPT[c] ?? c)
    .join('');
  return `${withMinus(mantissa!)} × 10${power}`;
}

/**
 * Decimals for a percentage that may approach 100 (ee, % A): one decimal up to 98, two up to
 * 99.8, three beyond, so a value just short of a 99 % specification never rounds onto it.
 * Shared with the server's formatters (api/science/quantities.ts).
 */
export { percentDecimals };

export function percent(value: number): string {
  return fixed(value, percentDecimals(value));
}

/**
 * Decimals that show a small limit, and the values compared with it, to two significant digits
 * (at least `min`): a column of leverages beside the limit 4/n, which on a 1 000-run screen is
 * 0.0040, where two fixed decimals showed 0.00 in every row.
 */
export function decimalsBeside(limit: number, min = 2): number {
  if (!(limit > 0) || !Number.isFinite(limit)) return min;
  return Math.max(min, Math.ceil(-Math.log10(limit)) + 1);
}

/** Decimals for a column of leverages: two significant digits of the fit's high-leverage limit (2p/n). */
export function leverageDecimals(nFitted: number): number {
  return decimalsBeside(highLeverageLimit(nFitted));
}

/**
 * A model probability as a percentage to one decimal, for text followed by " %". One that would
 * round to 100.0 or 0.0 reads "> 99.9" or "< 0.1": the model never makes an outcome certain.
 */
export function probabilityPercent(probability: number): string {
  const pct = 100 * probability;
  if (pct >= 99.95) return '> 99.9';
  if (pct < 0.05) return '< 0.1';
  return fixed(pct, 1);
}

/** A value and its standard error: the SE to two significant figures, the value to the same decimal place. */
export function withUncertainty(value: number, se: number | null | undefined, fallbackDecimals = 2): string {
  if (se === null || se === undefined || !Number.isFinite(se) || se <= 0) return fixed(value, fallbackDecimals);
  const decimals = Math.max(0, 1 - Math.floor(Math.log10(se)));
  return `${fixed(value, decimals)} ± ${fixed(se, decimals)}`;
}

/** Decimals that match an uncertainty's two significant figures (for intervals beside it). */
export function decimalsFor(se: number | null | undefined, fallback = 2): number {
  if (se === null || se === undefined || !Number.isFinite(se) || se <= 0) return fallback;
  return Math.max(0, 1 - Math.floor(Math.log10(se)));
}

/** er written A:B normalised to 100. */
export function enantiomericRatio(percentA: number): string {
  const d = percentDecimals(percentA);
  return `${fixed(percentA, d)}:${fixed(100 - percentA, d)}`;
}

/** Signed number with an explicit plus for positive values (for signed differentials). */
export function signed(value: number, decimals: number): string {
  const text = fixed(value, decimals);
  return value > 0 && !/^0(\.0*)?$/.test(text) ? `+${text}` : text;
}

/**
 * ln r of a prediction or interval end. The API sends ln r beside r because r itself is null when it is beyond
 * what a number can hold (far outside the data); older saved forecasts carry r only.
 */
export function lnRatioOf(p: { lnRatio?: number; ratio: number | null }): number {
  return p.lnRatio ?? Math.log(p.ratio ?? Number.NaN);
}

/** ln r at both ends of an interval (see lnRatioOf). */
export function lnRatioRange(iv: { lnRatio?: [number, number]; ratio: [number | null, number | null] }): [number, number] {
  return iv.lnRatio ?? [Math.log(iv.ratio[0] ?? Number.NaN), Math.log(iv.ratio[1] ?? Number.NaN)];
}

/**
 * Decimals that show a result to its assay precision (the SD of one result, in the same unit): the last
 * digit shown is the first one the SD leaves uncertain (SD 2 → 0, 0.3 → 1, 0.05 → 2). No precision: `fallback`.
 */
export function decimalsFromPrecision(sd: number | null | undefined, fallback = 1, max = 3): number {
  if (sd === null || sd === undefined || !Number.isFinite(sd) || sd <= 0) return fallback;
  return Math.min(max, Math.max(0, -Math.floor(Math.log10(sd))));
}

/**
 * One number of decimals for a whole column of percentages, so every cell lines up: the assay precision's
 * (decimalsFromPrecision), raised where a value close to 100 needs more (percentDecimals), so no cell just
 * short of a 99 % specification rounds onto it.
 */
export function percentColumnDecimals(values: readonly (number | null | undefined)[], assaySd?: number | null, max = 3): number {
  let decimals = decimalsFromPrecision(assaySd, 1, max);
  for (const v of values) {
    // percentDecimals asks for more than one decimal only close to 100; below that the precision rules.
    if (v !== null && v !== undefined && Number.isFinite(v) && percentDecimals(v) > 1) decimals = Math.max(decimals, percentDecimals(v));
  }
  return Math.min(max, decimals);
}

/** A formatter for a column of percentages, all to the same decimals (see percentColumnDecimals). */
export function percentColumn(values: readonly (number | null | undefined)[], assaySd?: number | null): (value: number) => string {
  const decimals = percentColumnDecimals(values, assaySd);
  return (value) => fixed(value, decimals);
}

/**
 * A formatter for a column of a display measure given as ln r: percentages (ee, % de, % major, % A) share
 * one number of decimals (see percentColumnDecimals); ratios keep their own formatting. Cells carry no "%"
 * (it belongs in the column head).
 */
export function measureColumn(display: DisplayMeasure, lnRatios: readonly number[], assaySd?: number | null): (lnRatio: number) => string {
  if (DISPLAY_UNIT[display] !== '%') return (lnR) => formatMeasure(display, lnR);
  const percentOf = (lnR: number) =>
    display === 'percentA' ? percentAFromLnRatio(lnR) : display === 'major' ? percentAFromLnRatio(Math.abs(lnR)) : eeFromLnRatio(lnR);
  const column = percentColumn(lnRatios.map(percentOf), assaySd);
  return (lnR) => (Number.isFinite(lnR) ? column(percentOf(lnR)) : '—');
}

/**
 * A British-English date formatter made on its first use: the first Intl.DateTimeFormat a page makes
 * loads the locale's data (some 15 ms), which at module level falls on the load of every page that
 * imports the module, before anything is drawn.
 */
export function dateFormatter(options: Intl.DateTimeFormatOptions): (date: Date) => string {
  let format: Intl.DateTimeFormat | null = null;
  return (date) => (format ??= new Intl.DateTimeFormat('en-GB', options)).format(date);
}
