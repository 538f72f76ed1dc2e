/**
 * Which column holds what: guess a mapping from the header names, and resolve the user's mapping
 * against the file's columns. Pure. The row-by-row checks that follow live in row-checks.ts.
 */
import {
  IMPORT_FIELDS,
  type ColumnRef,
  type ImportField,
  type ImportMapping,
  type SelectivityMeasure,
  type TemperatureUnit,
  type TimeUnit,
} from '../campaigns/schemas';
import type { ImportIssue } from './errors';
import { columnLetter, type ParsedTable } from './parse';

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

// ── Header recognition ─────────────────────────────────────────────────────────────────────

export function normaliseHeader(h: string): string {
  return h
    .toLowerCase()
    .replace(/[º˚]/g, '°')
    .replace(/℃/g, '°c')
    .replace(/℉/g, '°f')
    .replace(/[_\s]+/g, ' ')
    .trim();
}

/** A temperature unit written in a header or beside a number: "(°C)", "[K]", "/ degC", "Celsius". */
export function temperatureUnitIn(text: string): TemperatureUnit | undefined {
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
export function resolveColumns(
  table: Pick<ParsedTable, 'headers'>,
  mapping: ImportMapping,
): { columns: Partial<Record<ImportField, number>>; issues: ImportIssue[] } {
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
        issues.push({
          severity: 'error',
          row: null,
          column: null,
          message: `${field} is mapped to column ${columnLetter(ref)}, but the file has only ${width} columns.`,
        });
        continue;
      }
      index = ref;
    } else {
      const wanted = ref.trim().toLowerCase();
      const hits = table.headers.flatMap((h, i) => (h.trim().toLowerCase() === wanted ? [i] : []));
      if (hits.length === 0) {
        issues.push({
          severity: 'error',
          row: null,
          column: null,
          message: `${field} is mapped to a column named "${ref}", but the file has no such column (its columns are ${names}).`,
        });
        continue;
      }
      if (hits.length > 1) {
        issues.push({
          severity: 'error',
          row: null,
          column: null,
          message: `${field}: ${hits.length} columns are named "${ref}" (${hits.map(columnLetter).join(', ')}); map it by position instead.`,
        });
        continue;
      }
      index = hits[0];
    }
    const other = usedBy.get(index);
    if (other) {
      issues.push({
        severity: 'error',
        row: null,
        column: columnLabel(table, index),
        message: `column is mapped twice, to ${other} and to ${field}.`,
      });
      continue;
    }
    usedBy.set(index, field);
    columns[field] = index;
  }
  return { columns, issues };
}
