/**
 * Number and text rules shared by every export of a campaign (workbook, PDF, CSV, e-mail):
 * decimals chosen from the assay's precision, numbers written without float artefacts, the
 * campaign's own measure (dr campaigns read as dr, % de and % major; ee only for enantiomers),
 * and user text that no spreadsheet will evaluate.
 */
import type { SelectivityMeasure } from '../../science';

/** Round to `decimals` and write with a real minus sign; never prints 39.99999999999997. */
export function fixed(value: number, decimals: number): string {
  if (!Number.isFinite(value)) return value > 0 ? '∞' : value < 0 ? '−∞' : '—';
  const d = Math.max(0, Math.min(10, Math.round(decimals)));
  const text = value.toFixed(d);
  // −0.0 reads as a sign error: drop the sign when everything shown is zero.
  const shown = /^-0(\.0+)?$/.test(text) ? text.slice(1) : text;
  return shown.replace('-', '−');
}

/** Decimals that show one significant digit of `step` (0.5 → 1, 0.05 → 2, 2 → 0). */
export function decimalsForStep(step: number | null | undefined, fallback: number): number {
  if (step === null || step === undefined || !(step > 0) || !Number.isFinite(step)) return fallback;
  return Math.max(0, Math.min(6, Math.ceil(-Math.log10(step) - 1e-9)));
}

/** Decimals for an estimate whose standard error is `se`: two significant digits of the SE. */
export function decimalsForSe(se: number | null | undefined, fallback: number): number {
  if (se === null || se === undefined || !(se > 0) || !Number.isFinite(se)) return fallback;
  return Math.max(0, Math.min(6, Math.ceil(-Math.log10(se) - 1e-9) + 1));
}

/** An Excel number format with `decimals` places ("0", "0.0", "0.00", …). */
export function numFmt(decimals: number): string {
  return decimals <= 0 ? '0' : `0.${'0'.repeat(decimals)}`;
}

export type MeasureFamily = 'enantiomers' | 'diastereomers' | 'ratio';

/** ee and er describe enantiomers; dr diastereomers; percentA and plain ratios a pair of products. */
export function measureFamily(measure: SelectivityMeasure): MeasureFamily {
  if (measure === 'ee' || measure === 'er') return 'enantiomers';
  if (measure === 'dr') return 'diastereomers';
  return 'ratio';
}

/** A selectivity as the campaign's readers expect it, from r = [A]/[B]. */
export interface SelectivityReading {
  /** "18.5:1" (or "1:3.2" when B is favoured). */
  ratioText: string;
  /** ee (enantiomers) or de (diastereomers) in percent, signed towards A; null for plain ratios. */
  excessPercent: number | null;
  /** Percent of the major product. */
  majorPercent: number;
  /** Percent of A. */
  percentA: number;
}

export function readSelectivity(ratio: number, ratioDecimals: number): SelectivityReading {
  const ratioText = ratio >= 1 ? `${fixed(ratio, ratioDecimals)}:1` : `1:${fixed(1 / ratio, ratioDecimals)}`;
  const excess = (100 * (ratio - 1)) / (ratio + 1);
  const percentA = (100 * ratio) / (1 + ratio);
  return { ratioText, excessPercent: excess, majorPercent: Math.max(percentA, 100 - percentA), percentA };
}

/** What the exports call each measure column, for a campaign reported in `measure`. */
export interface MeasureLabels {
  family: MeasureFamily;
  /** "er (A:B)", "dr (A:B)" or "ratio A/B". */
  ratio: string;
  /** "ee (%)" or "de (%)"; null for a plain ratio. */
  excess: string | null;
  /** "% major" heading. */
  major: string;
  /** The short word in sentences: "ee", "dr", "ratio". */
  word: string;
}

export function measureLabels(measure: SelectivityMeasure): MeasureLabels {
  const family = measureFamily(measure);
  if (family === 'enantiomers')
    return { family, ratio: 'er (A:B)', excess: 'ee (%)', major: 'Major enantiomer (%)', word: measure === 'ee' ? 'ee' : 'er' };
  if (family === 'diastereomers') return { family, ratio: 'dr (A:B)', excess: 'de (%)', major: 'Major diastereomer (%)', word: 'dr' };
  return { family, ratio: 'Ratio A/B', excess: null, major: 'Major product (%)', word: 'ratio' };
}

/**
 * Decimals to show for selectivities in this campaign, from the assay's stated precision
 * (`defaultUncertainty`, in units of the measure): ee/percentA in percentage points; er, dr
 * and ratio as a relative SD of r (so 0.05 means ±5 % of the ratio).
 */
export function selectivityDecimals(measure: SelectivityMeasure, uncertainty: number | null): { percent: number; ratio: number } {
  if (measure === 'ee' || measure === 'percentA') {
    const percent = decimalsForStep(uncertainty, 1);
    return { percent, ratio: Math.max(1, percent) };
  }
  // A relative SD of r: ±5 % of 18.5:1 is ±0.9, so one decimal; percentages follow ±(Δr/r)·25 % at most.
  const percent = uncertainty ? Math.max(1, decimalsForStep(uncertainty * 25, 1)) : 1;
  return { percent, ratio: 1 };
}

const FORMULA_START = /^[=+\-@\t\r]/;

/**
 * User text for a spreadsheet or CSV cell. Text that a spreadsheet would read as a formula
 * (starting with =, +, -, @, tab or carriage return) gets a leading apostrophe, the usual
 * neutraliser [CP: OWASP "CSV Injection"]; workbook cells also carry the Text format so a
 * user who re-enters the cell still gets text.
 */
export function safeText(value: string | null | undefined): string | null {
  if (value === null || value === undefined) return null;
  return FORMULA_START.test(value) ? `'${value}` : value;
}

/** A file name safe on every common file system and in a Content-Disposition header. */
export function safeFileName(title: string, suffix: string): string {
  const slug =
    title
      .normalize('NFKD')
      .replace(/[\u0300-\u036f]/g, '')
      .replace(/[^A-Za-z0-9 _-]/g, '')
      .trim()
      .replace(/[\s_]+/g, '-')
      .replace(/-+/g, '-')
      .replace(/^[-.]+|[-.]+$/g, '')
      .slice(0, 60) || 'campaign';
  return `eyrie-${slug}-${suffix}`;
}

/**
 * ln r and r of a prediction or interval. The API carries ln r beside r because r is null when it is beyond what a
 * number can hold; snapshots saved before ln r was added carry r only.
 */
export const lnOf = (p: { lnRatio?: number; ratio: number | null }): number => p.lnRatio ?? Math.log(p.ratio ?? Number.NaN);
export const ratioOf = (p: { lnRatio?: number; ratio: number | null }): number => p.ratio ?? Math.exp(lnOf(p));
export const lnRange = (iv: { lnRatio?: [number, number]; ratio: [number | null, number | null] }): [number, number] =>
  iv.lnRatio ?? [Math.log(iv.ratio[0] ?? Number.NaN), Math.log(iv.ratio[1] ?? Number.NaN)];
export const ratioRange = (iv: { lnRatio?: [number, number]; ratio: [number | null, number | null] }): [number, number] => {
  const [a, b] = lnRange(iv);
  return [iv.ratio[0] ?? Math.exp(a), iv.ratio[1] ?? Math.exp(b)];
};
