/**
 * The one home for quantities, shared by the server and the browser (pure, no Node or DOM):
 * units and their conversion, seconds per time unit, the grammar of what people type (numbers with
 * a decimal comma or a true minus sign, ratios "a:b", bounds "≥ 99.8", "> 200:1", "99.8+"), the
 * checks on a reported selectivity, and how a selectivity is shown in the measure a campaign uses
 * (ee, er, dr, % de, % major, % A). Equations: api/science/README.md §2–3.
 *
 * Everything here returns null or a message instead of throwing, so forms, the file import and the
 * zod schemas can all phrase their own errors from the same answer.
 */
import { CELSIUS_OFFSET_K } from './constants';

export { CELSIUS_OFFSET_K };

// ── Units ─────────────────────────────────────────────────────────────────────────────────────

export const TEMPERATURE_UNITS = ['K', 'C', 'F'] as const;
export type TemperatureUnit = (typeof TEMPERATURE_UNITS)[number];

/** How a temperature unit is written for people. */
export const TEMPERATURE_UNIT_LABEL: Record<TemperatureUnit, string> = { K: 'K', C: '°C', F: '°F' };

/** Absolute zero in each temperature unit (−273.15 °C, −459.67 °F). */
export const ABSOLUTE_ZERO: Record<TemperatureUnit, number> = { K: 0, C: -CELSIUS_OFFSET_K, F: -459.67 };

/**
 * T in kelvin from a value and unit: T(K) = T(°C) + 273.15; T(K) = (T(°F) − 32)·5/9 + 273.15 (SI).
 * Never throws (the engine's temperatureToK adds the checks). Results are rounded to 1e-9 K so that
 * −50 °C is 223.15, not 223.14999999999998.
 */
export function toKelvin(value: number, unit: TemperatureUnit): number {
  const snap = (k: number) => Math.round(k * 1e9) / 1e9;
  if (unit === 'C') return snap(value + CELSIUS_OFFSET_K);
  if (unit === 'F') return snap(((value - 32) * 5) / 9 + CELSIUS_OFFSET_K);
  return value;
}

/** Kelvin to the given unit (inverse of {@link toKelvin}, without rounding). */
export function fromKelvin(kelvin: number, unit: TemperatureUnit): number {
  if (unit === 'C') return kelvin - CELSIUS_OFFSET_K;
  if (unit === 'F') return ((kelvin - CELSIUS_OFFSET_K) * 9) / 5 + 32;
  return kelvin;
}

export const celsiusFromKelvin = (kelvin: number): number => kelvin - CELSIUS_OFFSET_K;
export const kelvinFromCelsius = (celsius: number): number => celsius + CELSIUS_OFFSET_K;

/** Seconds per time unit; a year is the Julian year (365.25 d). */
export const SECONDS_PER = { s: 1, min: 60, h: 3600, d: 86_400, y: 365.25 * 86_400 } as const;
export type AnyTimeUnit = keyof typeof SECONDS_PER;

export function toSeconds(value: number, unit: AnyTimeUnit): number {
  return value * SECONDS_PER[unit];
}

export function fromSeconds(seconds: number, unit: AnyTimeUnit): number {
  return seconds / SECONDS_PER[unit];
}

// ── Typed numbers ─────────────────────────────────────────────────────────────────────────────

/** A strict decimal: optional sign, digits with at most one point, optional exponent. No 0x, 0b, 0o, Infinity. */
export const DECIMAL_PATTERN = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** The decimal mark a reader accepts: a point only, a comma only, or a comma when there is no point. */
export type DecimalMark = '.' | ',' | 'either';

/**
 * A number as typed: surrounding spaces dropped, a true minus (U+2212) read as "-", a decimal
 * comma accepted per `decimal`. Returns null when the text is empty or not a strict decimal.
 */
export function readDecimal(text: string, decimal: DecimalMark = 'either'): number | null {
  let t = text.trim().replace(/\u2212/g, '-');
  if (t === '') return null;
  if (decimal === ',' || (decimal === 'either' && !t.includes('.') && /^[^,]*,[^,]*$/.test(t))) {
    if (decimal === ',' && t.includes('.')) return null;
    t = t.replace(',', '.');
  }
  return DECIMAL_PATTERN.test(t) ? Number(t) : null;
}

/** True when a string is a strict decimal (after a true minus is read as "-"). */
export function isStrictDecimal(text: string): boolean {
  return DECIMAL_PATTERN.test(text.trim().replace(/\u2212/g, '-'));
}

// ── Ratios and bounds ─────────────────────────────────────────────────────────────────────────

const PART = String.raw`(\d+(?:\.\d*)?|\.\d+)`;
const PAIR = new RegExp(String.raw`^\s*${PART}\s*:\s*${PART}\s*$`);

/** Split "a:b" (parts are unsigned decimals, e.g. "95:5", "12.5 : 1", ".5:1") into its parts, or null. */
export function parseRatioPair(text: string, decimal: DecimalMark = '.'): { a: number; b: number } | null {
  const t = decimal === '.' ? text : text.replace(/,/g, '.');
  const m = PAIR.exec(t);
  return m ? { a: Number(m[1]), b: Number(m[2]) } : null;
}

export type BoundKind = 'lower' | 'upper';

/**
 * A bound written before or after a value: "≥ 99.8", ">=99.8", ">99.8", "99.8+" and "> 200:1" are
 * lower bounds (at least this selective, e.g. at the assay's quantitation limit); "≤", "<=", "<"
 * mark upper bounds. Returns the value text without its mark.
 */
export function splitBound(text: string): { text: string; bound: BoundKind | null } {
  const t = text.trim();
  const lead = /^(≥|>=|>|≤|<=|<)\s*/.exec(t);
  if (lead) return { text: t.slice(lead[0].length), bound: lead[1] === '≥' || lead[1].startsWith('>') ? 'lower' : 'upper' };
  if (t.length > 1 && t.endsWith('+') && !t.startsWith('+')) return { text: t.slice(0, -1).trim(), bound: 'lower' };
  return { text: t, bound: null };
}

// ── Selectivity measures ──────────────────────────────────────────────────────────────────────

/** The measures a selectivity can be reported in. */
export const SELECTIVITY_MEASURES = ['ee', 'er', 'dr', 'percentA', 'ratio'] as const;
export type SelectivityMeasure = (typeof SELECTIVITY_MEASURES)[number];

/** Measures whose value may be written "a:b". */
export const isPairMeasure = (measure: SelectivityMeasure): boolean => measure === 'er' || measure === 'dr' || measure === 'ratio';

/**
 * Check a selectivity value against its measure; returns a message, or null when it is acceptable.
 * Strings must be "a:b" ratios (numbers travel as numbers). Every entry point uses this check, so
 * ee = ±100 or a "0x10" string is refused the same way everywhere.
 */
export function selectivityProblem(measure: SelectivityMeasure, value: number | string): string | null {
  if (typeof value === 'string') {
    if (!isPairMeasure(measure)) return `${measure} must be a number, not "${value}"`;
    const pair = parseRatioPair(value);
    if (!pair) return `"${value}" is not a ratio; write it as a:b, e.g. 95:5`;
    if (!(pair.a > 0 && pair.b > 0))
      return `both parts of ${measure} ${value} must be greater than zero (a zero part means an infinite energy gap; report the detection limit instead)`;
    return null;
  }
  if (!Number.isFinite(value)) return `${measure} must be a finite number`;
  switch (measure) {
    case 'ee':
      if (Math.abs(value) > 100) return `ee ${value} % is outside −100 to 100 %`;
      if (Math.abs(value) === 100)
        return 'ee of ±100 % implies an infinite energy gap; enter the detection limit (e.g. 99.8) and mark it as a lower bound';
      return null;
    case 'percentA':
      if (value <= 0 || value >= 100) return `percent A must lie strictly between 0 and 100, got ${value}`;
      return null;
    default:
      if (value <= 0) return `${measure} must be greater than zero, got ${value}`;
      return null;
  }
}

/** A selectivity read from text: a number, or a normalised "a:b" for er, dr and ratio; `atLeast` for a lower bound. */
export type SelectivityText = { ok: true; value: number | string; atLeast: boolean } | { ok: false; message: string };

/**
 * Read a typed or pasted selectivity: an optional lower-bound mark (≥, >=, >, trailing +), then a
 * number (decimal comma per `decimal`, a trailing % allowed except for ratios) or an "a:b" ratio.
 */
export function readSelectivityText(text: string, measure: SelectivityMeasure, decimal: DecimalMark = 'either'): SelectivityText {
  const { text: body, bound } = splitBound(text);
  if (bound === 'upper')
    return {
      ok: false,
      message: `"${text.trim()}" is an upper bound; only lower bounds (≥, >, or a trailing +) can be recorded, e.g. "≥ 99.8"`,
    };
  const atLeast = bound === 'lower';
  if (body === '') return { ok: false, message: 'the selectivity is missing' };
  if (body.includes(':')) {
    const pair = parseRatioPair(body, decimal === '.' ? '.' : ',');
    const value = pair ? `${pair.a}:${pair.b}` : body;
    const problem = isPairMeasure(measure) ? selectivityProblem(measure, value) : `${measure} must be a number, not a ratio "${body}"`;
    return problem ? { ok: false, message: problem } : { ok: true, value, atLeast };
  }
  const n = readDecimal(isPairMeasure(measure) ? body : body.replace(/\s*%$/, ''), decimal);
  if (n === null) return { ok: false, message: `“${body}” is not a number${isPairMeasure(measure) ? ' or a ratio a:b' : ''}` };
  const problem = selectivityProblem(measure, n);
  if (problem) return { ok: false, message: problem };
  if (atLeast && measure === 'ee' && n < 0)
    return { ok: false, message: `a lower bound must be for product A (a positive ee), got "${text.trim()}"` };
  return { ok: true, value: n, atLeast };
}

/** ln r from a stored value: ee, % A, a ratio number, or an A:B pair (`valueB` not null). */
export function lnRatioOf(measure: SelectivityMeasure, value: number, valueB: number | null = null): number {
  if (valueB !== null) return Math.log(value) - Math.log(valueB);
  switch (measure) {
    case 'ee':
      return Math.log1p(value / 100) - Math.log1p(-value / 100);
    case 'percentA':
      return Math.log(value) - Math.log(100 - value);
    default:
      return Math.log(value);
  }
}

/** Signed ee (or % de) in percent from ln r: 100·tanh(ln r / 2). */
export const eeFromLnRatio = (lnR: number): number => 100 * Math.tanh(lnR / 2);
/** Percentage of A from ln r: 100/(1 + e^(−ln r)). */
export const percentAFromLnRatio = (lnR: number): number => 100 / (1 + Math.exp(-lnR));

/**
 * ee and %A from ln r and r = e^(ln r) together, where r is computed anyway: one exponential serves
 * all three measures instead of exp, exp and tanh (a fit's 60 predictions map about 300 values, a
 * forecast 200, and those calls were a third of their time). ee = 100·(r − 1)/(r + 1) loses digits
 * to cancellation as r → 1, so below |ln r| = 0.5 it is 100·tanh(ln r / 2) itself. Both agree with
 * the direct formulas above to within 3 units in the last place (checked over −50 ≤ ln r ≤ 50) and
 * saturate alike (±100; 0 and 100), also when r overflows to Infinity or underflows to 0.
 */
export const eeFromLnRatioAndRatio = (lnR: number, r: number): number =>
  Math.abs(lnR) < 0.5 ? eeFromLnRatio(lnR) : r === Infinity ? 100 : (100 * (r - 1)) / (r + 1);
export const percentAFromLnRatioAndRatio = (lnR: number, r: number): number => (lnR >= 0 ? 100 / (1 + 1 / r) : (100 * r) / (1 + r));

// ── Display ───────────────────────────────────────────────────────────────────────────────────

/**
 * The ways a selectivity is shown. ee and er belong to enantiomer pairs; dr, % de and % major to
 * diastereomers; % A and r to any two products.
 */
export type DisplayMeasure = 'ee' | 'er' | 'dr' | 'de' | 'major' | 'percentA' | 'ratio';

/** What a campaign reported in is shown as, first the measure itself. ee never appears for diastereomers. */
export const DISPLAY_MEASURES: Record<SelectivityMeasure, readonly DisplayMeasure[]> = {
  ee: ['ee', 'er'],
  er: ['er', 'ee'],
  dr: ['dr', 'de', 'major'],
  percentA: ['percentA', 'ratio'],
  ratio: ['ratio', 'percentA'],
};

/** Short labels for column heads and legends. */
export const DISPLAY_LABEL: Record<DisplayMeasure, string> = {
  ee: 'ee',
  er: 'er',
  dr: 'dr',
  de: 'de',
  major: 'major diastereomer',
  percentA: '% A',
  ratio: 'r (A/B)',
};

/** The unit shown after a value (for head cells): "%" for percentages, "" for ratios. */
export const DISPLAY_UNIT: Record<DisplayMeasure, string> = { ee: '%', er: '', dr: '', de: '%', major: '%', percentA: '%', ratio: '' };

/** Which percentage family a measure's chart uses: the signed one (ee, % de) or the share (% A, % major). */
export function chartMeasures(measure: SelectivityMeasure): { signed: DisplayMeasure; share: DisplayMeasure } {
  if (measure === 'dr') return { signed: 'de', share: 'major' };
  if (measure === 'ee' || measure === 'er') return { signed: 'ee', share: 'percentA' };
  return { signed: 'ee', share: 'percentA' };
}

const MINUS = '\u2212';
const withMinus = (text: string) => (/^-0(\.0*)?$/.test(text) ? text.slice(1) : text.startsWith('-') ? MINUS + text.slice(1) : text);

/** Decimals for a percentage that may approach 100: one up to 98, two up to 99.8, three beyond. */
export function percentDecimals(percent: number): number {
  const gap = 100 - Math.abs(percent);
  if (!(gap < 2)) return 1;
  return gap >= 0.2 ? 2 : 3;
}

function ratioText(r: number): string {
  if (!Number.isFinite(r)) return '—';
  const decimals = r >= 100 ? 0 : r >= 10 ? 1 : 2;
  return withMinus(r.toFixed(decimals));
}

/**
 * The value of one display measure from ln r, as text without its label: "18.5:1" (dr, the
 * major isomer first), "94.9:5.1" (er), "89.7 %" (ee, de, major, % A), "18.5" (r).
 * Signed measures keep their sign (negative ee/de favour B); % major is the larger share.
 */
export function formatMeasure(display: DisplayMeasure, lnR: number): string {
  if (!Number.isFinite(lnR)) return '—';
  const pct = (p: number) => `${withMinus(p.toFixed(percentDecimals(p)))} %`;
  switch (display) {
    case 'ee':
    case 'de':
      return pct(eeFromLnRatio(lnR));
    case 'percentA':
      return pct(percentAFromLnRatio(lnR));
    case 'major':
      return pct(percentAFromLnRatio(Math.abs(lnR)));
    case 'er': {
      const a = percentAFromLnRatio(lnR);
      const d = percentDecimals(a);
      return `${withMinus(a.toFixed(d))}:${withMinus((100 - a).toFixed(d))}`;
    }
    case 'dr':
      return lnR >= 0 ? `${ratioText(Math.exp(lnR))}:1` : `1:${ratioText(Math.exp(-lnR))}`;
    case 'ratio':
      return ratioText(Math.exp(lnR));
  }
}

/** "dr 18.5:1", "89.7 % de", "94.9 % major diastereomer", "ee 92.0 %", "% A 96.0 %", "r 18.5". */
export function formatDisplay(display: DisplayMeasure, lnR: number): string {
  const value = formatMeasure(display, lnR);
  switch (display) {
    case 'de':
      return `${value} de`;
    case 'major':
      return `${value} major diastereomer`;
    case 'percentA':
      return `${value} A`;
    case 'ratio':
      return `r = ${value}`;
    default:
      return `${DISPLAY_LABEL[display]} ${value}`;
  }
}

/**
 * A selectivity in the words of the campaign's measure: every display measure of its family,
 * e.g. dr → "dr 18.5:1 · 89.7 % de · 94.9 % major diastereomer"; ee → "ee 92.0 % · er 96.0:4.0".
 */
export function formatSelectivity(measure: SelectivityMeasure, lnR: number): string {
  return DISPLAY_MEASURES[measure].map((d) => formatDisplay(d, lnR)).join(' · ');
}

/**
 * An interval of ln r shown in a display measure: "12.1:1 to 25.3:1", "84.6 to 92.3 %". For
 * % major an interval that spans r = 1 starts at 50 % (the major isomer may be either one).
 */
export function formatMeasureRange(display: DisplayMeasure, lnLow: number, lnHigh: number): string {
  const [lo, hi] = lnLow <= lnHigh ? [lnLow, lnHigh] : [lnHigh, lnLow];
  if (display === 'major') {
    const a = lo >= 0 ? lo : hi <= 0 ? -hi : 0;
    const b = Math.max(Math.abs(lo), Math.abs(hi));
    return `${formatMeasure('major', a).replace(/ %$/, '')} to ${formatMeasure('major', b)}`;
  }
  const from = formatMeasure(display, lo);
  const to = formatMeasure(display, hi);
  return DISPLAY_UNIT[display] === '%' ? `${from.replace(/ %$/, '')} to ${to}` : `${from} to ${to}`;
}

/** Column-head text for a display measure: "ee (%)", "dr", "de (%)", "major diastereomer (%)", "% A", "r (A/B)". */
export function displayHeading(display: DisplayMeasure): string {
  if (display === 'percentA' || display === 'ratio' || DISPLAY_UNIT[display] === '') return DISPLAY_LABEL[display];
  return `${DISPLAY_LABEL[display]} (%)`;
}

/** The two percentage axes a chart offers: the signed excess (ee, % de) and the share (% A, % major). */
export type PercentAxis = 'ee' | 'percentA';

/**
 * Words for a chart's percentage axis in a campaign's measure: ee and % A for enantiomers, % de and
 * % major for diastereomers, "A − B" and % A for any two products (ee only for enantiomer pairs).
 */
export function axisText(measure: SelectivityMeasure, axis: PercentAxis): { button: string; axis: string; unit: string } {
  if (measure === 'dr') {
    return axis === 'ee'
      ? { button: '% de', axis: 'de (%)', unit: '% de' }
      : { button: '% major', axis: 'major diastereomer (%)', unit: '% major' };
  }
  if (axis === 'percentA') return { button: '% A', axis: 'A (% of A + B)', unit: '% A' };
  if (measure === 'ee' || measure === 'er') return { button: 'ee %', axis: 'ee (%)', unit: '% ee' };
  return { button: 'A − B %', axis: 'A − B (% of A + B)', unit: '% (A − B)' };
}

/** % major from % A: the larger share (for diastereomers, where either isomer may be the major one). */
export const majorShare = (percentA: number): number => Math.max(percentA, 100 - percentA);

/** An interval of % A as % major: it starts at 50 % when it spans an even split. */
export function majorShareRange(low: number, high: number): [number, number] {
  if (low >= 50) return [low, high];
  if (high <= 50) return [100 - high, 100 - low];
  return [50, Math.max(high, 100 - low)];
}
