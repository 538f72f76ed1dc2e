/**
 * The measurement grid's logic, free of React: cell text ⇄ API bodies, per-cell validation with
 * the shared zod schema, spreadsheet paste, and server field paths → cells.
 */
import {
  IMPORT_FIELDS,
  measurementCreateSchema,
  type ImportField,
  type MeasurementCreate,
  type MeasurementUpdate,
  type SelectivityMeasure,
  type TemperatureUnit,
  type TimeUnit,
} from '../../../../api/features/campaigns/schemas';
import { readPastedTable } from '../../../../api/features/imports/table-text';
import {
  eeFromLnRatio,
  fromKelvin,
  lnRatioOf,
  percentAFromLnRatio,
  readDecimal,
  SECONDS_PER,
  splitBound,
} from '../../../../api/science/quantities';
import { tidyMessage } from '../../../lib/field-errors';
import type { Measurement } from '../api/types';

/** The import's fields in the import's order, less the two the grid sets for the whole table (temperature unit, measure). */
export type GridColumn = Exclude<ImportField, 'temperatureUnit' | 'measure'>;
export const GRID_COLUMNS = IMPORT_FIELDS.filter((f): f is GridColumn => f !== 'temperatureUnit' && f !== 'measure');
export type GridCells = Record<GridColumn, string>;
export type CellErrors = Partial<Record<GridColumn, string>>;

/** Units the user picked per column; they apply to what is typed and to how stored values are shown. */
export interface ColumnUnits {
  temperature: TemperatureUnit;
  measure: SelectivityMeasure;
  time: TimeUnit;
}

export const emptyCells = (): GridCells => ({
  temperature: '',
  value: '',
  uncertainty: '',
  sampleId: '',
  replicateLabel: '',
  conversionPercent: '',
  reactionTime: '',
  notes: '',
});

export const isBlank = (cells: GridCells) => GRID_COLUMNS.every((c) => cells[c].trim() === '');

const MINUS = '\u2212';

/**
 * A number as typed (the shared grammar): true minus or hyphen, a decimal comma when there is no
 * point, surrounding spaces. Empty → null; anything else that is not a strict decimal → 'invalid'.
 */
export function parseNumber(text: string): number | null | 'invalid' {
  if (text.trim() === '') return null;
  return readDecimal(text) ?? 'invalid';
}

/** A number for an input cell: at most `decimals`, trailing zeros dropped, true minus sign. */
export function plain(value: number, decimals: number): string {
  const text = String(Number(value.toFixed(decimals)));
  return text.startsWith('-') ? MINUS + text.slice(1) : text;
}

/** "≥ 99.8", ">99.8" or "99.8+" mark a lower bound (e.g. at the assay's quantitation limit); the shared grammar. */
export function splitLowerBound(text: string): { text: string; atLeast: boolean } {
  const { text: rest, bound } = splitBound(text);
  return bound === 'lower' ? { text: rest, atLeast: true } : { text: text.trim(), atLeast: false };
}

// ── stored measurement → cells ────────────────────────────────────────────────────────────────

export function kelvinTo(kelvin: number, unit: TemperatureUnit): number {
  return fromKelvin(kelvin, unit);
}

function storedRatio(m: Pick<Measurement, 'measure' | 'value' | 'valueB'>): number {
  return Math.exp(lnRatioOf(m.measure, m.value, m.valueB));
}

/** The stored selectivity written in another measure (for display when the column's measure differs). */
export function selectivityAs(m: Pick<Measurement, 'measure' | 'value' | 'valueB'>, measure: SelectivityMeasure): string {
  if (m.measure === measure) return m.valueB !== null ? `${plain(m.value, 6)}:${plain(m.valueB, 6)}` : plain(m.value, 6);
  const r = storedRatio(m);
  switch (measure) {
    case 'ee':
      return plain(eeFromLnRatio(Math.log(r)), 2);
    case 'percentA':
      return plain(percentAFromLnRatio(Math.log(r)), 2);
    case 'er':
      return `${plain(percentAFromLnRatio(Math.log(r)), 2)}:${plain(percentAFromLnRatio(-Math.log(r)), 2)}`;
    case 'dr':
      return r >= 1 ? `${plain(r, 2)}:1` : `1:${plain(1 / r, 2)}`;
    default:
      return plain(r, 4);
  }
}

/**
 * A stored uncertainty written for another measure, through σ(ln r) (first-order propagation, as
 * the engine reads uncertainties): ee in points of ee, % A and er in points of % A, dr and ratio relative.
 */
export function uncertaintyAs(
  m: Pick<Measurement, 'measure' | 'value' | 'valueB' | 'uncertainty'>,
  measure: SelectivityMeasure,
): number | null {
  if (m.uncertainty === null) return null;
  if (m.measure === measure) return m.uncertainty;
  const r = storedRatio(m);
  const e = (r - 1) / (r + 1);
  const p = r / (1 + r);
  const kind = (x: SelectivityMeasure) => (x === 'ee' ? 'ee' : x === 'percentA' || x === 'er' ? 'p' : 'rel');
  const from = kind(m.measure);
  const to = kind(measure);
  if (from === to) return m.uncertainty;
  const sigmaLn =
    from === 'ee' ? (2 * (m.uncertainty / 100)) / (1 - e * e) : from === 'p' ? m.uncertainty / 100 / (p * (1 - p)) : m.uncertainty;
  return to === 'ee' ? (100 * sigmaLn * (1 - e * e)) / 2 : to === 'p' ? 100 * sigmaLn * p * (1 - p) : sigmaLn;
}

export function cellsFromMeasurement(m: Measurement, units: ColumnUnits): GridCells {
  return {
    temperature: plain(kelvinTo(m.temperatureK, units.temperature), 2),
    value: (m.isLowerBound ? '≥' : '') + selectivityAs(m, units.measure),
    uncertainty: m.uncertainty === null ? '' : plain(uncertaintyAs(m, units.measure)!, m.measure === units.measure ? 6 : 3),
    sampleId: m.sampleId ?? '',
    replicateLabel: m.replicateLabel ?? '',
    conversionPercent: m.conversionPercent === null ? '' : plain(m.conversionPercent, 2),
    reactionTime: m.reactionTimeS === null ? '' : plain(m.reactionTimeS / SECONDS_PER[units.time], 3),
    notes: m.notes ?? '',
  };
}

// ── cells → API body, with errors per cell ───────────────────────────────────────────────────

/** Which grid column an API or zod field path belongs to (null: not a cell). */
export function columnOfPath(path: string): GridColumn | null {
  const head = path
    .replace(/\[(\d+)\]/g, '.$1')
    .replace(/^\./, '')
    .split('.')[0];
  switch (head) {
    case 'temperature':
      return 'temperature';
    case 'selectivity':
      return 'value';
    case 'uncertainty':
    case 'sampleId':
    case 'replicateLabel':
    case 'conversionPercent':
    case 'reactionTime':
    case 'notes':
      return head;
    default:
      return null;
  }
}

type CreateInput = Record<string, unknown>;

/**
 * Build the create body from a row's cells and check it with the API's own schema.
 * Returns the body when every cell is acceptable, and the reason for each cell that is not.
 */
export function rowToCreate(cells: GridCells, units: ColumnUnits): { body: MeasurementCreate | null; errors: CellErrors } {
  const errors: CellErrors = {};
  const input: CreateInput = {};
  const numberCell = (col: GridColumn, what: string): number | null | undefined => {
    const n = parseNumber(cells[col]);
    if (n === 'invalid') {
      errors[col] = `${what} “${cells[col].trim()}” is not a number`;
      return undefined;
    }
    return n;
  };

  const t = numberCell('temperature', 'temperature');
  if (t === null) errors.temperature = 'temperature is required';
  else if (t !== undefined) input.temperature = { value: t, unit: units.temperature };

  const { text: valueText, atLeast } = splitLowerBound(cells.value);
  if (valueText === '') errors.value = `${units.measure === 'percentA' ? '% A' : units.measure} is required`;
  else if (valueText.includes(':')) {
    input.selectivity = { measure: units.measure, value: valueText.replace(/\s+/g, ''), ...(atLeast ? { atLeast } : {}) };
  } else {
    const v = parseNumber(valueText);
    if (v === 'invalid' || v === null)
      errors.value = `“${valueText}” is not a number${units.measure === 'er' || units.measure === 'dr' ? ' or a ratio a:b' : ''}`;
    else input.selectivity = { measure: units.measure, value: v, ...(atLeast ? { atLeast } : {}) };
  }

  const u = numberCell('uncertainty', 'uncertainty');
  if (u !== undefined) input.uncertainty = u;
  const c = numberCell('conversionPercent', 'conversion');
  if (c !== undefined) input.conversionPercent = c;
  const time = numberCell('reactionTime', 'time');
  if (time !== undefined) input.reactionTime = time === null ? null : { value: time, unit: units.time };
  input.sampleId = cells.sampleId;
  input.replicateLabel = cells.replicateLabel;
  input.notes = cells.notes;

  const parsed = measurementCreateSchema.safeParse(input);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const col = columnOfPath(issue.path.map(String).join('.'));
      // A missing object (from a cell that failed above) is already explained.
      if (col && !errors[col]) errors[col] = issue.message;
    }
  }
  const ok = Object.keys(errors).length === 0 && parsed.success;
  return { body: ok ? parsed.data : null, errors };
}

/** The PATCH body for a stored row: only the fields whose cells changed, with the version read. */
/** The changed fields of a stored row with its version; the caller adds the reason for the change. */
export function rowToUpdate(
  m: Measurement,
  cells: GridCells,
  units: ColumnUnits,
): { body: Omit<MeasurementUpdate, 'reason'> | null; errors: CellErrors } {
  const { body, errors } = rowToCreate(cells, units);
  if (!body) return { body: null, errors };
  const before = cellsFromMeasurement(m, units);
  const changed = (col: GridColumn) => before[col].trim() !== cells[col].trim();
  const update: Record<string, unknown> = { version: m.version };
  if (changed('temperature')) update.temperature = body.temperature;
  if (changed('value')) update.selectivity = body.selectivity;
  // A value re-entered in another measure takes the uncertainty as shown in that measure's unit.
  const measureChanges = changed('value') && m.measure !== units.measure;
  if (changed('uncertainty') || (measureChanges && m.uncertainty !== null)) update.uncertainty = body.uncertainty ?? null;
  if (changed('sampleId')) update.sampleId = body.sampleId ?? null;
  if (changed('replicateLabel')) update.replicateLabel = body.replicateLabel ?? null;
  if (changed('conversionPercent')) update.conversionPercent = body.conversionPercent ?? null;
  if (changed('reactionTime')) update.reactionTime = body.reactionTime ?? null;
  if (changed('notes')) update.notes = body.notes ?? null;
  return { body: Object.keys(update).length > 1 ? (update as Omit<MeasurementUpdate, 'reason'>) : null, errors: {} };
}

// ── paste ────────────────────────────────────────────────────────────────────────────────────

/**
 * A block copied from a spreadsheet, read by the shared table reader (tab, semicolon or comma, as
 * the file import splits text). Returns null for a single value (a normal paste): one line with no
 * tab or semicolon, where a comma is a decimal comma.
 */
export function parsePastedBlock(text: string): string[][] | null {
  const lines = text
    .replace(/\r\n?/g, '\n')
    .split('\n')
    .filter((l) => l.trim() !== '');
  if (lines.length === 0) return null;
  if (lines.length === 1 && !/[\t;]/.test(lines[0])) return null;
  const table = readPastedTable(text);
  return table.rows.map((r) => (table.delimiter === 'space' ? [r.cells.join(' ')] : r.cells));
}

/** A first pasted row that is all words (no number in any cell) is a header row. */
export function isHeaderRow(row: string[]): boolean {
  return row.some((c) => c !== '') && row.every((c) => c === '' || parseNumber(splitLowerBound(c).text) === 'invalid');
}

export interface GridEdits {
  /** Changed cells of stored rows, by measurement id. */
  edits: Record<string, Partial<GridCells>>;
  /** New rows not yet saved. */
  drafts: { key: string; cells: GridCells }[];
}

/**
 * Write a pasted block into the grid from the cell (row `startRow`, column `startCol`) down and
 * right. Rows past the end become new draft rows; cells past the last column are dropped.
 * `rowKeys` are the keys of the rows as shown (stored ids first, then draft keys).
 */
export function pasteBlock(
  state: GridEdits,
  rowKeys: string[],
  storedIds: Set<string>,
  startRow: number,
  startCol: number,
  block: string[][],
  newKey: () => string,
): { state: GridEdits; rows: number; droppedColumns: number; headerSkipped: boolean } {
  const headerSkipped = block.length > 1 && isHeaderRow(block[0]);
  const body = headerSkipped ? block.slice(1) : block;
  const edits = { ...state.edits };
  const drafts = state.drafts.map((d) => ({ ...d, cells: { ...d.cells } }));
  let droppedColumns = 0;
  body.forEach((cells, i) => {
    const target = startRow + i;
    const values: Partial<GridCells> = {};
    cells.forEach((text, j) => {
      const col = GRID_COLUMNS[startCol + j];
      if (col) values[col] = text;
      else if (text !== '') droppedColumns = Math.max(droppedColumns, startCol + j - GRID_COLUMNS.length + 1);
    });
    const key = rowKeys[target];
    if (key !== undefined && storedIds.has(key)) {
      edits[key] = { ...edits[key], ...values };
    } else if (key !== undefined) {
      const draft = drafts.find((d) => d.key === key);
      if (draft) Object.assign(draft.cells, values);
    } else {
      drafts.push({ key: newKey(), cells: { ...emptyCells(), ...values } });
    }
  });
  return { state: { edits, drafts }, rows: body.length, droppedColumns, headerSkipped };
}

/**
 * Server field errors of a batch create (`measurements.<i>.<field>`) onto draft cells, by the
 * index each draft had in the request. Errors that name no cell are returned apart.
 */
export function batchErrorsToCells(
  errors: { path: string; message: string }[],
  sentKeys: string[],
): { byKey: Record<string, CellErrors>; other: string[]; rowOther: Record<string, string> } {
  const byKey: Record<string, CellErrors> = {};
  const other: string[] = [];
  // Messages about a sent row that name none of its cells (e.g. its id), by that row's key.
  const rowOther: Record<string, string> = {};
  for (const e of errors) {
    const m = /^measurements[.[](\d+)\]?\.?(.*)$/.exec(e.path);
    const key = m ? sentKeys[Number(m[1])] : undefined;
    const col = m ? columnOfPath(m[2]) : null;
    if (key && col) {
      byKey[key] = { ...byKey[key], [col]: (byKey[key]?.[col] ? `${byKey[key]![col]}; ` : '') + tidy(m![2], e.message) };
    } else {
      other.push(m && key ? `row ${Number(m[1]) + 1}: ${e.message}` : e.message);
      if (key) rowOther[key] = rowOther[key] ? `${rowOther[key]} ${e.message}` : e.message;
    }
  }
  return { byKey, other, rowOther };
}

/** The keys of the rows a batched change's 409 names in `staleRows[].path` ("measurements.<i>"). */
export function staleRowKeys(problem: Record<string, unknown>, sentKeys: string[]): string[] {
  const stale = Array.isArray(problem.staleRows) ? (problem.staleRows as { path?: unknown }[]) : [];
  return stale.flatMap((s) => {
    const m = typeof s.path === 'string' ? /^measurements\.(\d+)$/.exec(s.path) : null;
    const key = m ? sentKeys[Number(m[1])] : undefined;
    return key ? [key] : [];
  });
}

/** Server errors of a single-row request (paths relative to the row) onto its cells. */
export function rowErrorsToCells(errors: { path: string; message: string }[]): { cells: CellErrors; other: string[] } {
  const cells: CellErrors = {};
  const other: string[] = [];
  for (const e of errors) {
    const col = columnOfPath(e.path);
    if (col) cells[col] = cells[col] ? `${cells[col]}; ${tidy(e.path, e.message)}` : tidy(e.path, e.message);
    else other.push(e.message);
  }
  return { cells, other };
}

/** "selectivity.value must be…" reads better beside the cell as "selectivity must be…". */
function tidy(path: string, message: string): string {
  return tidyMessage(path, message);
}
