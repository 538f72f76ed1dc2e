/**
 * From a parsed table and a resolved mapping to measurement rows: read every cell, check every
 * row, and pack the checked rows for the trip back from a reading worker. Pure; every problem
 * names its row and column. Header guessing lives in mapping.ts.
 */
import { setImmediate } from 'node:timers/promises';
import {
  MAX_TEMPERATURE_K,
  SELECTIVITY_MEASURES,
  parseRatioPair,
  selectivityProblem,
  toKelvin,
  toSeconds,
  type ImportField,
  type ImportMapping,
  type SelectivityMeasure,
  type TemperatureUnit,
} from '../campaigns/schemas';
import { celsiusFromKelvin, DECIMAL_PATTERN, splitBound } from '../../science/quantities';
import type { ImportIssue } from './errors';
import { looksLikeKelvin } from '../calculators/temperatures';
import type { Cell, DecimalSeparator, ParsedTable } from './parse';
import { columnLabel, measureIn, normaliseHeader, resolveColumns, temperatureUnitIn } from './mapping';

/** A checked row, ready to insert (campaign id and author are added by the service). */
export interface ImportRow {
  sourceRow: number;
  temperatureK: number;
  measure: SelectivityMeasure;
  value: number;
  valueB: number | null;
  isLowerBound: boolean;
  uncertainty: number | null;
  replicateLabel: string | null;
  sampleId: string | null;
  conversionPercent: number | null;
  reactionTimeS: number | null;
  notes: string | null;
}

export interface ValidationResult {
  rows: ImportRow[];
  issues: ImportIssue[];
  errorCount: number;
  warningCount: number;
  /** Data rows read (rows that are blank in every mapped column are skipped and not counted as valid). */
  rowCount: number;
}

/** At most this many issues are listed; the counts stay exact. */
export const MAX_LISTED_ISSUES = 200;

// ── Reading cells ──────────────────────────────────────────────────────────────────────────

type Read<T> = { ok: true; value: T } | { ok: false; message: string };

const MINUS = /\u2212/g;

function cellText(cell: Cell): string {
  return typeof cell === 'number' ? String(cell) : (cell ?? '');
}

/** A number from a cell, honouring the file's decimal separator; `what` names it in messages. */
function readNumber(cell: Cell, decimal: DecimalSeparator, what: string): Read<number> {
  if (typeof cell === 'number')
    return Number.isFinite(cell) ? { ok: true, value: cell } : { ok: false, message: `${what} is not a finite number` };
  const raw = (cell ?? '').trim();
  let text = raw.replace(MINUS, '-').replace(/\s+/g, '');
  if (decimal === ',') {
    if (/^[+-]?\d{1,3}(\.\d{3})+(,\d+)?$/.test(text)) text = text.replace(/\./g, '');
    else if (/\d\.\d/.test(text))
      return {
        ok: false,
        message: `"${raw}" uses a decimal point, but this file uses decimal commas; write it ${raw.replace('.', ',')} or change the decimal setting`,
      };
    text = text.replace(',', '.');
  } else if (/^[+-]?\d+,\d+$/.test(text)) {
    return {
      ok: false,
      message: `"${raw}" uses a decimal comma, but this file uses decimal points; fix the cell or change the decimal setting`,
    };
  }
  if (!DECIMAL_PATTERN.test(text)) return { ok: false, message: `${what} "${raw}" is not a number` };
  return { ok: true, value: Number(text) };
}

const TEMPERATURE_UNIT_WORDS: Record<string, TemperatureUnit> = {
  k: 'K',
  kelvin: 'K',
  c: 'C',
  '°c': 'C',
  '° c': 'C',
  degc: 'C',
  'deg c': 'C',
  celsius: 'C',
  f: 'F',
  '°f': 'F',
  degf: 'F',
  fahrenheit: 'F',
};

function readTemperatureUnit(cell: Cell): TemperatureUnit | undefined {
  return TEMPERATURE_UNIT_WORDS[normaliseHeader(cellText(cell))];
}

const MEASURE_WORDS: Record<string, SelectivityMeasure> = Object.fromEntries([
  ...SELECTIVITY_MEASURES.map((m) => [m.toLowerCase(), m]),
  ['% ee', 'ee'],
  ['ee %', 'ee'],
  ['ee%', 'ee'],
  ['e.e.', 'ee'],
  ['e.r.', 'er'],
  ['d.r.', 'dr'],
  ['%a', 'percentA'],
  ['% a', 'percentA'],
  ['percent a', 'percentA'],
  ['r', 'ratio'],
]);

function unitLabel(unit: TemperatureUnit): string {
  return unit === 'K' ? 'K' : `°${unit}`;
}

function round(x: number, digits = 2): string {
  return String(Math.round(x * 10 ** digits) / 10 ** digits).replace('-', '−');
}

/** What every row check needs; built once per file (no closures per row: they cost at 50 000 rows). */
interface RowContext {
  table: ParsedTable;
  mapping: ImportMapping;
  columns: Partial<Record<ImportField, number>>;
  decimal: DecimalSeparator;
  issues: ImportIssue[];
  errorCount: number;
  warningCount: number;
}

function addIssue(
  ctx: RowContext,
  severity: ImportIssue['severity'],
  row: number | null,
  field: ImportField | null,
  message: string,
): void {
  if (severity === 'error') ctx.errorCount += 1;
  else ctx.warningCount += 1;
  if (ctx.issues.length < MAX_LISTED_ISSUES) {
    ctx.issues.push({ severity, row, column: field === null ? null : columnLabel(ctx.table, ctx.columns[field]!), message });
  }
}

function cellOf(ctx: RowContext, cells: Cell[], field: ImportField): Cell {
  const i = ctx.columns[field];
  return i === undefined ? null : cells[i];
}

/** Temperature in K from the temperature cell and its unit (unit column, unit in the cell, or the mapping's default); NaN after an error. */
function readTemperatureK(ctx: RowContext, cells: Cell[], row: number): number {
  const tCell = cellOf(ctx, cells, 'temperature');
  if (tCell === null) {
    addIssue(ctx, 'error', row, 'temperature', 'the temperature is missing.');
    return Number.NaN;
  }
  let unit: TemperatureUnit | undefined;
  let tValue: Cell = tCell;
  if (typeof tCell === 'string') {
    const m = CELL_WITH_UNIT.exec(tCell.trim());
    if (m && m[1] !== '') {
      tValue = m[1];
      unit = temperatureUnitIn(`(${m[2]})`);
    }
  }
  if (!unit) {
    const uCell = cellOf(ctx, cells, 'temperatureUnit');
    if (uCell !== null) {
      unit = readTemperatureUnit(uCell);
      if (!unit) addIssue(ctx, 'error', row, 'temperatureUnit', `unknown temperature unit "${cellText(uCell)}"; use K, °C or °F.`);
    } else {
      unit = ctx.mapping.temperatureUnit;
      if (!unit) addIssue(ctx, 'error', row, 'temperatureUnit', 'the temperature unit is missing.');
    }
  }
  const t = readNumber(tValue, ctx.decimal, 'temperature');
  if (!t.ok) {
    addIssue(ctx, 'error', row, 'temperature', `${t.message}.`);
    return Number.NaN;
  }
  if (!unit) return Number.NaN;
  const k = toKelvin(t.value, unit);
  if (!(k > 0)) {
    addIssue(
      ctx,
      'error',
      row,
      'temperature',
      `${round(t.value)} ${unitLabel(unit)} is at or below absolute zero${unit === 'K' ? '; is it in °C?' : '.'}`,
    );
    return Number.NaN;
  }
  if (k > MAX_TEMPERATURE_K) {
    addIssue(
      ctx,
      'error',
      row,
      'temperature',
      `${round(t.value)} ${unitLabel(unit)} is ${round(k, 0)} K, above the ${MAX_TEMPERATURE_K} K accepted; is the unit right?`,
    );
    return Number.NaN;
  }
  // Plausibility: screens run roughly between −100 and +150 °C, so these are probably the wrong unit.
  if (looksLikeKelvin(t.value, unit)) {
    addIssue(
      ctx,
      'warning',
      row,
      'temperature',
      `${round(t.value)} labelled ${unitLabel(unit)} would be ${round(k)} K; it looks like a kelvin value. Check the unit.`,
    );
  } else if (unit === 'K' && k < 150) {
    addIssue(
      ctx,
      'warning',
      row,
      'temperature',
      `${round(t.value)} K is ${round(celsiusFromKelvin(k))} °C, colder than any solution screen; it looks like a °C value. Check the unit.`,
    );
  }
  return k;
}

function readMeasure(ctx: RowContext, cells: Cell[], row: number): SelectivityMeasure | undefined {
  const mCell = cellOf(ctx, cells, 'measure');
  if (mCell === null) {
    if (!ctx.mapping.measure) addIssue(ctx, 'error', row, 'measure', 'the selectivity measure is missing.');
    return ctx.mapping.measure;
  }
  const measure = MEASURE_WORDS[normaliseHeader(cellText(mCell))] ?? measureIn(cellText(mCell));
  if (!measure)
    addIssue(ctx, 'error', row, 'measure', `unknown measure "${cellText(mCell)}"; use one of ${SELECTIVITY_MEASURES.join(', ')}.`);
  return measure;
}

/** The selectivity: a number, "a:b" for ratios, possibly a lower bound ("≥ 99.8") at an assay limit. Null after an error. */
function readSelectivity(
  ctx: RowContext,
  cells: Cell[],
  row: number,
  measure: SelectivityMeasure,
): { value: number; valueB: number | null; isLowerBound: boolean } | null {
  const vCell = cellOf(ctx, cells, 'value');
  if (vCell === null) {
    addIssue(ctx, 'error', row, 'value', 'the selectivity value is missing.');
    return null;
  }
  if (typeof vCell === 'number') {
    const problem = selectivityProblem(measure, vCell);
    if (problem) addIssue(ctx, 'error', row, 'value', `${problem.replace(/\.$/, '')}.`);
    return problem ? null : { value: vCell, valueB: null, isLowerBound: false };
  }
  // The shared grammar: "≥ 99.8", ">99.8", "99.8+" and "> 200:1" are lower bounds, as in the grid.
  const bound = splitBound(vCell);
  if (bound.bound === 'upper') {
    addIssue(
      ctx,
      'error',
      row,
      'value',
      `"${vCell.trim()}" is an upper bound; only lower bounds (≥, >, or a trailing +) can be imported, e.g. "≥ 99.8" at the detection limit.`,
    );
    return null;
  }
  const isLowerBound = bound.bound === 'lower';
  let text = bound.text;
  if (measure !== 'dr' && measure !== 'ratio') text = text.replace(/\s*%$/, '');
  let value: number;
  let valueB: number | null = null;
  let problem: string | null;
  if (text.includes(':')) {
    const normalised = ctx.decimal === ',' ? text.replace(/,/g, '.') : text;
    problem = selectivityProblem(measure, normalised);
    const pair = parseRatioPair(normalised);
    value = pair?.a ?? Number.NaN;
    valueB = pair?.b ?? null;
  } else {
    const n = readNumber(text, ctx.decimal, measure);
    value = n.ok ? n.value : Number.NaN;
    problem = n.ok ? selectivityProblem(measure, n.value) : n.message;
  }
  if (!problem && isLowerBound && measure === 'ee' && value < 0)
    problem = `a lower bound must be for product A (a positive ee), got "${vCell}"`;
  if (problem) {
    addIssue(ctx, 'error', row, 'value', `${problem.replace(/\.$/, '')}.`);
    return null;
  }
  return { value, valueB, isLowerBound };
}

/** An optional number within [min, max] (`%` after it allowed); undefined after an error, null when blank. */
function readOptionalNumber(
  ctx: RowContext,
  cells: Cell[],
  row: number,
  field: ImportField,
  what: string,
  min: number,
  max: number,
  unit: string,
): number | null | undefined {
  const cell = cellOf(ctx, cells, field);
  if (cell === null) return null;
  const n = readNumber(typeof cell === 'string' ? cell.trim().replace(/\s*%$/, '') : cell, ctx.decimal, what);
  if (!n.ok) {
    addIssue(ctx, 'error', row, field, `${n.message}.`);
    return undefined;
  }
  if (n.value < min || n.value > max) {
    const range =
      max === Infinity
        ? `must not be negative`
        : max === 100 && min === 0 && unit === ' %'
          ? 'must lie between 0 and 100 %'
          : `must be at least ${min} and below ${max}`;
    addIssue(ctx, 'error', row, field, `${what} ${round(n.value)}${unit} ${range}.`);
    return undefined;
  }
  return n.value;
}

function readOptionalText(ctx: RowContext, cells: Cell[], row: number, field: ImportField, max: number): string | null | undefined {
  const cell = cellOf(ctx, cells, field);
  if (cell === null) return null;
  const text = cellText(cell).trim();
  if (text.includes('\u0000')) {
    addIssue(ctx, 'error', row, field, 'the text contains a NUL character (U+0000), which cannot be stored; remove it from the file.');
    return undefined;
  }
  if (text.length > max) {
    addIssue(ctx, 'error', row, field, `the text is ${text.length} characters long; at most ${max} are kept.`);
    return undefined;
  }
  return text;
}

const CELL_WITH_UNIT = /^(.*?)\s*(°\s?[CcFf]|℃|℉|[Kk]|deg\s?[CcFf])$/;
const UNCERTAINTY_MAX = 100 - Number.EPSILON * 100;

/**
 * Validate every data row against the mapping. Errors make the import impossible; warnings
 * (a value that looks like the wrong unit, a repeated row, an unmapped column) need the
 * user's confirmation. Nothing is dropped silently.
 */
/** Rows checked between two pauses of the import on the server's main thread (a few milliseconds of work). */
export const ROWS_PER_STEP = 2_000;

/** Check every row of `table` against `mapping` (in one go: tests, the preview in its worker thread). */
export function validateRows(table: ParsedTable, mapping: ImportMapping): ValidationResult {
  const steps = validateRowsInSteps(table, mapping);
  let step = steps.next();
  while (!step.done) step = steps.next();
  return step.value;
}

/**
 * The same check, giving the event loop a turn every ROWS_PER_STEP rows: the import runs it on the main thread, where
 * 100 000 rows checked in one go would hold every other request for about a second.
 */
export async function validateRowsYielding(table: ParsedTable, mapping: ImportMapping): Promise<ValidationResult> {
  const steps = validateRowsInSteps(table, mapping);
  let step = steps.next();
  while (!step.done) {
    await setImmediate();
    step = steps.next();
  }
  return step.value;
}

/** Counts of issues found so far, sent with each batch of checked rows. */
export interface IssueCounts {
  errorCount: number;
  warningCount: number;
}

/**
 * The same check, handing the checked rows over in batches of `size` while no error has been
 * found (after an error no more rows are handed over; the check goes on to list the issues). The
 * result's `rows` are those after the last batch. The import's worker sends each batch to the
 * server's main thread, which inserts it while the rest of the file is checked.
 */
export function validateRowsInBatches(
  table: ParsedTable,
  mapping: ImportMapping,
  size: number,
  take: (rows: ImportRow[], counts: IssueCounts) => void,
): ValidationResult {
  const steps = validateRowsInSteps(table, mapping, { size, take });
  let step = steps.next();
  while (!step.done) step = steps.next();
  return step.value;
}

function* validateRowsInSteps(
  table: ParsedTable,
  mapping: ImportMapping,
  batches?: { size: number; take: (rows: ImportRow[], counts: IssueCounts) => void },
): Generator<void, ValidationResult, void> {
  const { columns, issues: mappingIssues } = resolveColumns(table, mapping);
  const ctx: RowContext = {
    table,
    mapping,
    columns,
    decimal: table.decimalSeparator,
    issues: [...mappingIssues],
    errorCount: mappingIssues.length,
    warningCount: 0,
  };
  if (ctx.errorCount > 0) return { rows: [], issues: ctx.issues, errorCount: ctx.errorCount, warningCount: 0, rowCount: table.rows.length };

  const mapped = Object.values(columns);
  table.headers.forEach((_h, i) => {
    if (mapped.includes(i)) return;
    if (table.rows.some((r) => r.cells[i] !== null)) {
      ctx.warningCount += 1;
      ctx.issues.push({
        severity: 'warning',
        row: null,
        column: columnLabel(table, i),
        message: 'this column is not mapped to any field; its values will not be imported.',
      });
    }
  });

  const rows: ImportRow[] = [];
  const seenRows = new Map<string, number>();
  const seenSamples = new Map<string, number>();
  let sinceStep = 0;
  for (const { rowNumber: row, cells } of table.rows) {
    if (++sinceStep === ROWS_PER_STEP) {
      sinceStep = 0;
      yield;
    }
    let blank = true;
    for (const i of mapped) if (cells[i] !== null) blank = false;
    if (blank) {
      addIssue(ctx, 'warning', row, null, 'the row is blank in every mapped column and is skipped.');
      continue;
    }
    const errorsBefore = ctx.errorCount;
    const temperatureK = readTemperatureK(ctx, cells, row);
    const measure = readMeasure(ctx, cells, row);
    const selectivity = measure ? readSelectivity(ctx, cells, row, measure) : null;
    const uncertainty = readOptionalNumber(ctx, cells, row, 'uncertainty', 'uncertainty', 0, UNCERTAINTY_MAX, '');
    const conversionPercent = readOptionalNumber(ctx, cells, row, 'conversionPercent', 'conversion', 0, 100, ' %');
    const time = readOptionalNumber(ctx, cells, row, 'reactionTime', 'reaction time', 0, Infinity, '');
    const sampleId = readOptionalText(ctx, cells, row, 'sampleId', 100);
    const replicateLabel = readOptionalText(ctx, cells, row, 'replicateLabel', 40);
    const notes = readOptionalText(ctx, cells, row, 'notes', 2000);
    if (ctx.errorCount > errorsBefore || !measure || !selectivity) continue;

    const { value, valueB, isLowerBound } = selectivity;
    const key = `${temperatureK.toFixed(3)}|${measure}|${value}|${valueB}|${isLowerBound}|${sampleId}|${replicateLabel}`;
    const firstRow = seenRows.get(key);
    if (firstRow !== undefined) {
      addIssue(
        ctx,
        'warning',
        row,
        null,
        `the row repeats row ${firstRow} (same temperature, selectivity, sample id and replicate). Import it only if it is a genuine repeat.`,
      );
    } else {
      seenRows.set(key, row);
      if (sampleId) {
        const sampleRow = seenSamples.get(sampleId);
        if (sampleRow !== undefined) addIssue(ctx, 'warning', row, 'sampleId', `sample id "${sampleId}" is also used in row ${sampleRow}.`);
        else seenSamples.set(sampleId, row);
      }
    }
    rows.push({
      sourceRow: row,
      temperatureK,
      measure,
      value,
      valueB,
      isLowerBound,
      uncertainty: uncertainty ?? null,
      replicateLabel: replicateLabel ?? null,
      sampleId: sampleId ?? null,
      conversionPercent: conversionPercent ?? null,
      reactionTimeS: time === null || time === undefined ? null : toSeconds(time, mapping.timeUnit),
      notes: notes ?? null,
    });
    if (batches && rows.length >= batches.size && ctx.errorCount === 0) {
      batches.take(rows.splice(0), { errorCount: ctx.errorCount, warningCount: ctx.warningCount });
    }
  }
  const { issues, errorCount, warningCount } = ctx;
  if (errorCount + warningCount > issues.length) {
    issues.push({
      severity: errorCount > 0 ? 'error' : 'warning',
      row: null,
      column: null,
      message: `${errorCount + warningCount - issues.length} more issues are not listed (${errorCount} errors and ${warningCount} warnings in all).`,
    });
  }
  return { rows, issues, errorCount, warningCount, rowCount: table.rows.length };
}

/**
 * Checked rows packed by column for the trip back from a reading worker: the numbers of all rows in
 * one Float64Array (NaN stands for "none": a checked number is never NaN), the text in plain
 * arrays. Copying this between threads costs a few milliseconds where 50 000 row objects cost
 * hundreds.
 */
export interface PackedRows {
  count: number;
  /** sourceRow, temperatureK, value, valueB, uncertainty, conversionPercent, reactionTimeS, isLowerBound (1/0), per row. */
  numbers: Float64Array;
  measure: SelectivityMeasure[];
  replicateLabel: (string | null)[];
  sampleId: (string | null)[];
  notes: (string | null)[];
}

const PACKED_NUMBERS = 8;
const packed = (x: number | null) => (x === null ? NaN : x);
const unpacked = (x: number) => (Number.isNaN(x) ? null : x);

export function packRows(rows: readonly ImportRow[]): PackedRows {
  const n = rows.length;
  const numbers = new Float64Array(n * PACKED_NUMBERS);
  const out: PackedRows = { count: n, numbers, measure: [], replicateLabel: [], sampleId: [], notes: [] };
  for (let i = 0; i < n; i++) {
    const r = rows[i]!;
    const o = i * PACKED_NUMBERS;
    numbers[o] = r.sourceRow;
    numbers[o + 1] = r.temperatureK;
    numbers[o + 2] = r.value;
    numbers[o + 3] = packed(r.valueB);
    numbers[o + 4] = packed(r.uncertainty);
    numbers[o + 5] = packed(r.conversionPercent);
    numbers[o + 6] = packed(r.reactionTimeS);
    numbers[o + 7] = r.isLowerBound ? 1 : 0;
    out.measure.push(r.measure);
    out.replicateLabel.push(r.replicateLabel);
    out.sampleId.push(r.sampleId);
    out.notes.push(r.notes);
  }
  return out;
}

export function unpackRows(p: PackedRows): ImportRow[] {
  const rows = new Array<ImportRow>(p.count);
  const x = p.numbers;
  for (let i = 0; i < p.count; i++) {
    const o = i * PACKED_NUMBERS;
    rows[i] = {
      sourceRow: x[o]!,
      temperatureK: x[o + 1]!,
      measure: p.measure[i]!,
      value: x[o + 2]!,
      valueB: unpacked(x[o + 3]!),
      isLowerBound: x[o + 7] === 1,
      uncertainty: unpacked(x[o + 4]!),
      replicateLabel: p.replicateLabel[i]!,
      sampleId: p.sampleId[i]!,
      conversionPercent: unpacked(x[o + 5]!),
      reactionTimeS: unpacked(x[o + 6]!),
      notes: p.notes[i]!,
    };
  }
  return rows;
}
