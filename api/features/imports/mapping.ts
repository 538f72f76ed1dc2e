/**
 * From a parsed table to measurement rows: guess which column holds what, apply the user's
 * mapping, and check every row. Pure; every problem names its row and column.
 */
import {
  IMPORT_FIELDS,
  MAX_TEMPERATURE_K,
  SELECTIVITY_MEASURES,
  parseRatioPair,
  selectivityProblem,
  toKelvin,
  toSeconds,
  type ColumnRef,
  type ImportField,
  type ImportMapping,
  type SelectivityMeasure,
  type TemperatureUnit,
  type TimeUnit,
} from '../campaigns/schemas';
import type { ImportIssue } from './errors';
import { columnLetter, type Cell, type DecimalSeparator, type ParsedTable } from './parse';

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

export interface MappingGuess {
  /** Column index per field, for the fields a header was recognised for. */
  columns: Partial<Record<ImportField, number>>;
  temperatureUnit?: TemperatureUnit;
  measure?: SelectivityMeasure;
  timeUnit?: TimeUnit;
  /** Columns with a header that matched no field. */
  unmapped: number[];
  /** Required choices still open (temperature, value, unit, measure). */
  missing: string[];
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

// ── Header recognition ─────────────────────────────────────────────────────────────────────

function normaliseHeader(h: string): string {
  return h
    .toLowerCase()
    .replace(/[º˚]/g, '°')
    .replace(/℃/g, '°c')
    .replace(/℉/g, '°f')
    .replace(/[_\s]+/g, ' ')
    .trim();
}

/** A temperature unit written in a header or beside a number: "(°C)", "[K]", "/ degC", "Celsius". */
function temperatureUnitIn(text: string): TemperatureUnit | undefined {
  const t = normaliseHeader(text);
  if (/°\s?c\b|\bdeg\.?\s?c\b|\bcelsius\b|[([/]\s*c\s*[)\]]?$/.test(t)) return 'C';
  if (/°\s?f\b|\bdeg\.?\s?f\b|\bfahrenheit\b|[([/]\s*f\s*[)\]]?$/.test(t)) return 'F';
  if (/\bkelvin\b|[([/]\s*k\s*[)\]]?$/.test(t)) return 'K';
  return undefined;
}

function timeUnitIn(text: string): TimeUnit | undefined {
  const t = normaliseHeader(text);
  if (/[([/]\s*(h|hr|hrs|hours?|std\.?)\s*[)\]]?$/.test(t) || /\bhours?\b|\bstunden\b/.test(t)) return 'h';
  if (/[([/]\s*(min|mins|minutes?)\s*[)\]]?$/.test(t) || /\bminutes?\b/.test(t)) return 'min';
  if (/[([/]\s*(s|sec|seconds?)\s*[)\]]?$/.test(t) || /\bseconds?\b/.test(t)) return 's';
  return undefined;
}

/** A measure named in a header or a cell: "ee", "% ee", "e.r.", "dr", "%A", "ratio". */
export function measureIn(text: string): SelectivityMeasure | undefined {
  const t = normaliseHeader(text).replace(/\./g, '');
  if (/(^|[^a-z])ee([^a-z]|$)/.test(t)) return 'ee';
  if (/(^|[^a-z])er([^a-z]|$)/.test(t)) return 'er';
  if (/(^|[^a-z])dr([^a-z]|$)/.test(t)) return 'dr';
  if (/^%\s*a\b|\bpercent ?a\b|\bpercenta\b|\b(share|fraction) of a\b/.test(t)) return 'percentA';
  if (/\bratio\b|\bverhältnis\b/.test(t)) return 'ratio';
  return undefined;
}

const FIELD_PATTERNS: [ImportField, RegExp][] = [
  ['uncertainty', /(^|[^a-z])(sd|s d|σ|sigma|±|\+\/-|uncertainty|std ?dev|stdev|std|error|err|unsicherheit|standardabweichung)([^a-z]|$)/],
  ['temperatureUnit', /^(t |temp |temperature |temperatur )?(unit|units|einheit)$/],
  ['measure', /^(measure|measured quantity|quantity|selectivity measure|type|messgröße)$/],
  ['sampleId', /\bsample\b|\bprobe\b|\bvial\b|\blims\b|\binjection\b|^id$/],
  ['replicateLabel', /\breplicate\b|^rep\b|^run\b|\bwiederholung\b|\bduplicate\b/],
  ['conversionPercent', /\bconv(ersion)?\b|\bumsatz\b|\byield\b/],
  ['notes', /\bnotes?\b|\bcomments?\b|\bremarks?\b|\bbemerkung(en)?\b|\bkommentar\b/],
  ['reactionTime', /^(reaction time|rxn time|time|duration|zeit|reaktionszeit|t rxn)\b/],
  ['temperature', /^(t|temp|temperature|temperatur|température|temperatura)\b/],
];

/** Guess a mapping from header names. Unknown headers stay unmapped; the user confirms or edits the guess. */
export function guessMapping(table: Pick<ParsedTable, 'headers'>): MappingGuess {
  const columns: Partial<Record<ImportField, number>> = {};
  const unmapped: number[] = [];
  const guess: MappingGuess = { columns, unmapped, missing: [] };
  table.headers.forEach((header, index) => {
    const h = normaliseHeader(header);
    if (h === '') return;
    let field: ImportField | undefined;
    for (const [f, pattern] of FIELD_PATTERNS) {
      if (!pattern.test(h)) continue;
      // "t (h)" is a time, "t (°C)" a temperature.
      if (f === 'temperature' && timeUnitIn(h) && !temperatureUnitIn(h)) field = 'reactionTime';
      else field = f;
      break;
    }
    if (!field && measureIn(h)) field = 'value';
    if (!field && /^(selectivity|value|wert|selektivität)\b/.test(h)) field = 'value';
    if (!field || columns[field] !== undefined) {
      unmapped.push(index);
      return;
    }
    columns[field] = index;
    if (field === 'temperature') guess.temperatureUnit = temperatureUnitIn(h) ?? guess.temperatureUnit;
    if (field === 'value') guess.measure = measureIn(h) ?? guess.measure;
    if (field === 'reactionTime') guess.timeUnit = timeUnitIn(h) ?? guess.timeUnit;
  });
  if (columns.temperature === undefined) guess.missing.push('temperature column');
  if (columns.value === undefined) guess.missing.push('selectivity value column');
  if (columns.temperatureUnit === undefined && !guess.temperatureUnit) guess.missing.push('temperature unit');
  if (columns.measure === undefined && !guess.measure) guess.missing.push('selectivity measure');
  return guess;
}

/** The guess as a mapping the import accepts, or null while a required choice is open. */
export function mappingFromGuess(guess: MappingGuess): ImportMapping | null {
  if (guess.missing.length > 0 || guess.columns.temperature === undefined || guess.columns.value === undefined) return null;
  return {
    columns: { ...guess.columns, temperature: guess.columns.temperature, value: guess.columns.value },
    temperatureUnit: guess.temperatureUnit,
    measure: guess.measure,
    timeUnit: guess.timeUnit ?? 'h',
  };
}

// ── Resolving the mapping against the file ─────────────────────────────────────────────────

export function columnLabel(table: Pick<ParsedTable, 'headers'>, index: number): string {
  const h = table.headers[index];
  return h ? `${columnLetter(index)} "${h}"` : columnLetter(index);
}

/** Column indices per mapped field, or issues when a column reference does not fit the file. */
export function resolveColumns(table: Pick<ParsedTable, 'headers'>, mapping: ImportMapping): { columns: Partial<Record<ImportField, number>>; issues: ImportIssue[] } {
  const issues: ImportIssue[] = [];
  const columns: Partial<Record<ImportField, number>> = {};
  const usedBy = new Map<number, ImportField>();
  const width = table.headers.length;
  const names = table.headers.map((h, i) => (h ? `"${h}"` : columnLetter(i))).join(', ');
  for (const field of IMPORT_FIELDS) {
    const ref: ColumnRef | undefined = mapping.columns[field];
    if (ref === undefined) continue;
    let index: number;
    if (typeof ref === 'number') {
      if (ref >= width) {
        issues.push({ severity: 'error', row: null, column: null, message: `${field} is mapped to column ${columnLetter(ref)}, but the file has only ${width} columns.` });
        continue;
      }
      index = ref;
    } else {
      const wanted = ref.trim().toLowerCase();
      const hits = table.headers.flatMap((h, i) => (h.trim().toLowerCase() === wanted ? [i] : []));
      if (hits.length === 0) {
        issues.push({ severity: 'error', row: null, column: null, message: `${field} is mapped to a column named "${ref}", but the file has no such column (its columns are ${names}).` });
        continue;
      }
      if (hits.length > 1) {
        issues.push({ severity: 'error', row: null, column: null, message: `${field}: ${hits.length} columns are named "${ref}" (${hits.map(columnLetter).join(', ')}); map it by position instead.` });
        continue;
      }
      index = hits[0];
    }
    const other = usedBy.get(index);
    if (other) {
      issues.push({ severity: 'error', row: null, column: columnLabel(table, index), message: `column is mapped twice, to ${other} and to ${field}.` });
      continue;
    }
    usedBy.set(index, field);
    columns[field] = index;
  }
  return { columns, issues };
}

// ── Reading cells ──────────────────────────────────────────────────────────────────────────

type Read<T> = { ok: true; value: T } | { ok: false; message: string };

const MINUS = /\u2212/g;

function cellText(cell: Cell): string {
  return typeof cell === 'number' ? String(cell) : (cell ?? '');
}

/** A number from a cell, honouring the file's decimal separator; `what` names it in messages. */
function readNumber(cell: Cell, decimal: DecimalSeparator, what: string): Read<number> {
  if (typeof cell === 'number') return Number.isFinite(cell) ? { ok: true, value: cell } : { ok: false, message: `${what} is not a finite number` };
  const raw = (cell ?? '').trim();
  let text = raw.replace(MINUS, '-').replace(/\s+/g, '');
  if (decimal === ',') {
    if (/^[+-]?\d{1,3}(\.\d{3})+(,\d+)?$/.test(text)) text = text.replace(/\./g, '');
    else if (/\d\.\d/.test(text)) return { ok: false, message: `"${raw}" uses a decimal point, but this file uses decimal commas; write it ${raw.replace('.', ',')} or change the decimal setting` };
    text = text.replace(',', '.');
  } else if (/^[+-]?\d+,\d+$/.test(text)) {
    return { ok: false, message: `"${raw}" uses a decimal comma, but this file uses decimal points; fix the cell or change the decimal setting` };
  }
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(text)) return { ok: false, message: `${what} "${raw}" is not a number` };
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

const SIGNS = /^(≥|>=|>|≤|<=|<)\s*/;
const LOWER_BOUND = new Set(['≥', '>=', '>']);

function unitLabel(unit: TemperatureUnit): string {
  return unit === 'K' ? 'K' : `°${unit}`;
}

function round(x: number, digits = 2): string {
  return String(Math.round(x * 10 ** digits) / 10 ** digits).replace('-', '−');
}

/**
 * Validate every data row against the mapping. Errors make the import impossible; warnings
 * (a value that looks like the wrong unit, a repeated row, an unmapped column) need the
 * user's confirmation. Nothing is dropped silently.
 */
export function validateRows(table: ParsedTable, mapping: ImportMapping): ValidationResult {
  const { columns, issues: mappingIssues } = resolveColumns(table, mapping);
  const issues: ImportIssue[] = [...mappingIssues];
  let errorCount = mappingIssues.length;
  let warningCount = 0;
  const add = (issue: ImportIssue) => {
    if (issue.severity === 'error') errorCount += 1;
    else warningCount += 1;
    if (issues.length < MAX_LISTED_ISSUES) issues.push(issue);
  };
  if (errorCount > 0) return { rows: [], issues, errorCount, warningCount, rowCount: table.rows.length };

  const mapped = new Set(Object.values(columns));
  table.headers.forEach((_h, i) => {
    if (mapped.has(i)) return;
    if (table.rows.some((r) => r.cells[i] !== null)) {
      add({ severity: 'warning', row: null, column: columnLabel(table, i), message: 'this column is not mapped to any field; its values will not be imported.' });
    }
  });

  const label = (field: ImportField) => columnLabel(table, columns[field]!);
  const cellOf = (cells: Cell[], field: ImportField): Cell => (columns[field] === undefined ? null : cells[columns[field]!]);
  const decimal = table.decimalSeparator;
  const rows: ImportRow[] = [];
  const seenRows = new Map<string, number>();
  const seenSamples = new Map<string, number>();

  for (const { rowNumber, cells } of table.rows) {
    const errorsBefore = errorCount;
    const error = (field: ImportField | null, message: string) => add({ severity: 'error', row: rowNumber, column: field ? label(field) : null, message });
    const warn = (field: ImportField | null, message: string) => add({ severity: 'warning', row: rowNumber, column: field ? label(field) : null, message });

    if ([...mapped].every((i) => cells[i] === null)) {
      warn(null, 'the row is blank in every mapped column and is skipped.');
      continue;
    }

    // Temperature and its unit (a unit column, a unit written in the cell, or the mapping's default).
    let temperatureK = Number.NaN;
    const tCell = cellOf(cells, 'temperature');
    if (tCell === null) {
      error('temperature', 'the temperature is missing.');
    } else {
      let cellUnit: TemperatureUnit | undefined;
      let tValue: Cell = tCell;
      if (typeof tCell === 'string') {
        const m = /^(.*?)\s*(°\s?[CcFf]|℃|℉|[Kk]|deg\s?[CcFf])$/.exec(tCell.trim());
        if (m && m[1] !== '') {
          tValue = m[1];
          cellUnit = temperatureUnitIn(`(${m[2]})`);
        }
      }
      let unit = cellUnit;
      if (!unit && columns.temperatureUnit !== undefined) {
        const uCell = cellOf(cells, 'temperatureUnit');
        if (uCell !== null) {
          unit = readTemperatureUnit(uCell);
          if (!unit) error('temperatureUnit', `unknown temperature unit "${cellText(uCell)}"; use K, °C or °F.`);
        }
      }
      if (!unit && (columns.temperatureUnit === undefined || cellOf(cells, 'temperatureUnit') === null)) {
        unit = mapping.temperatureUnit;
        if (!unit) error('temperatureUnit', 'the temperature unit is missing.');
      }
      const t = readNumber(tValue, decimal, 'temperature');
      if (!t.ok) error('temperature', `${t.message}.`);
      else if (unit) {
        temperatureK = toKelvin(t.value, unit);
        if (!(temperatureK > 0)) {
          error('temperature', `${round(t.value)} ${unitLabel(unit)} is at or below absolute zero${unit === 'K' ? '; is it in °C?' : '.'}`);
        } else if (temperatureK > MAX_TEMPERATURE_K) {
          error('temperature', `${round(t.value)} ${unitLabel(unit)} is ${round(temperatureK, 0)} K, above the ${MAX_TEMPERATURE_K} K accepted; is the unit right?`);
        } else if (unit === 'C' && t.value >= 190 && t.value <= 400) {
          warn('temperature', `${round(t.value)} labelled °C would be ${round(temperatureK)} K; it looks like a kelvin value. Check the unit.`);
        } else if (unit === 'F' && t.value >= 190 && t.value <= 400) {
          warn('temperature', `${round(t.value)} labelled °F would be ${round(temperatureK)} K; it looks like a kelvin value. Check the unit.`);
        } else if (unit === 'K' && temperatureK < 150) {
          warn('temperature', `${round(t.value)} K is ${round(temperatureK - 273.15)} °C, colder than any solution screen; it looks like a °C value. Check the unit.`);
        }
      }
    }

    // Measure: a measure column, or the mapping's default for the value column.
    let measure: SelectivityMeasure | undefined;
    const mCell = cellOf(cells, 'measure');
    if (mCell !== null) {
      measure = MEASURE_WORDS[normaliseHeader(cellText(mCell))] ?? measureIn(cellText(mCell));
      if (!measure) error('measure', `unknown measure "${cellText(mCell)}"; use one of ${SELECTIVITY_MEASURES.join(', ')}.`);
    } else {
      measure = mapping.measure;
      if (!measure) error('measure', 'the selectivity measure is missing.');
    }

    // Value: a number, "a:b" for ratios, possibly a lower bound (≥ 99.8) at an assay limit.
    let value = Number.NaN;
    let valueB: number | null = null;
    let isLowerBound = false;
    const vCell = cellOf(cells, 'value');
    if (vCell === null) {
      error('value', 'the selectivity value is missing.');
    } else if (measure) {
      let text = cellText(vCell).trim();
      const sign = SIGNS.exec(text);
      if (sign) {
        if (!LOWER_BOUND.has(sign[1])) error('value', `"${text}" is an upper bound; only lower bounds (≥, >) can be imported, e.g. "≥ 99.8" at the detection limit.`);
        isLowerBound = true;
        text = text.slice(sign[0].length);
      }
      if (measure !== 'dr' && measure !== 'ratio') text = text.replace(/\s*%$/, '');
      let problem: string | null = null;
      if (text.includes(':')) {
        const normalised = decimal === ',' ? text.replace(/,/g, '.') : text;
        const pair = parseRatioPair(normalised);
        problem = selectivityProblem(measure, normalised);
        if (!problem && pair) {
          value = pair.a;
          valueB = pair.b;
        }
      } else {
        const n = readNumber(typeof vCell === 'number' && !sign ? vCell : text, decimal, measure);
        if (!n.ok) problem = n.message;
        else {
          problem = selectivityProblem(measure, n.value);
          value = n.value;
        }
      }
      if (problem) error('value', `${problem.replace(/\.$/, '')}.`);
      else if (isLowerBound && measure === 'ee' && value < 0) error('value', `a lower bound must be for product A (a positive ee), got "${cellText(vCell)}".`);
    }

    const optionalNumber = (field: ImportField, what: string, check: (v: number) => string | null): number | null => {
      const cell = cellOf(cells, field);
      if (cell === null) return null;
      const text = typeof cell === 'string' ? cell.trim().replace(/\s*%$/, '') : cell;
      const n = readNumber(text, decimal, what);
      if (!n.ok) {
        error(field, `${n.message}.`);
        return null;
      }
      const problem = check(n.value);
      if (problem) {
        error(field, problem);
        return null;
      }
      return n.value;
    };
    const uncertainty = optionalNumber('uncertainty', 'uncertainty', (v) => (v >= 0 && v < 100 ? null : `uncertainty ${v} must be at least 0 and below 100.`));
    const conversionPercent = optionalNumber('conversionPercent', 'conversion', (v) => (v >= 0 && v <= 100 ? null : `conversion ${v} % must lie between 0 and 100 %.`));
    const time = optionalNumber('reactionTime', 'reaction time', (v) => (v >= 0 ? null : `reaction time ${v} must not be negative.`));
    const reactionTimeS = time === null ? null : toSeconds(time, mapping.timeUnit);

    const optionalText = (field: ImportField, max: number): string | null => {
      const cell = cellOf(cells, field);
      if (cell === null) return null;
      const text = cellText(cell).trim();
      if (text.length > max) {
        error(field, `the text is ${text.length} characters long; at most ${max} are kept.`);
        return null;
      }
      return text;
    };
    const sampleId = optionalText('sampleId', 100);
    const replicateLabel = optionalText('replicateLabel', 40);
    const notes = optionalText('notes', 2000);

    if (errorCount > errorsBefore || !measure) continue;

    const key = [temperatureK.toFixed(3), measure, value, valueB, isLowerBound, sampleId, replicateLabel].join('|');
    const firstRow = seenRows.get(key);
    if (firstRow !== undefined) {
      warn(null, `the row repeats row ${firstRow} (same temperature, selectivity, sample id and replicate). Import it only if it is a genuine repeat.`);
    } else {
      seenRows.set(key, rowNumber);
      if (sampleId !== null) {
        const sampleRow = seenSamples.get(sampleId);
        if (sampleRow !== undefined) warn('sampleId', `sample id "${sampleId}" is also used in row ${sampleRow}.`);
        else seenSamples.set(sampleId, rowNumber);
      }
    }

    rows.push({ sourceRow: rowNumber, temperatureK, measure, value, valueB, isLowerBound, uncertainty, replicateLabel, sampleId, conversionPercent, reactionTimeS, notes });
  }
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
