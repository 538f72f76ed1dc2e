/**
 * Reading uploaded tables: CSV (and TSV/TXT) through the shared table reader (table-text.ts, also
 * used by the browser's paste boxes), workbooks through exceljs.
 * Pure apart from decoding: no database, no HTTP. Everything the parser decides on its own
 * (encoding, delimiter, decimal separator, header row) is reported back so the user can
 * override it.
 */
import ExcelJS from 'exceljs';
import { Readable } from 'node:stream';
import { isMainThread } from 'node:worker_threads';
import { AppError, PayloadTooLargeError } from '../../lib/errors';
import type { ImportParseOptions } from '../campaigns/schemas';
import { UnreadableFileError } from './errors';
import { CsvError, DELIMITER_NAMES, detectDelimiter, splitDelimited, type Delimiter } from './table-text';

export { detectDelimiter, type Delimiter };
import { inspectZip, ZIP_LIMITS, type ZipLimits } from './zip-guard';

export interface ImportLimits {
  /** Largest file accepted, in bytes. */
  maxBytes: number;
  /** Most data rows accepted (below the header). */
  maxRows: number;
  /** Widest table accepted. */
  maxColumns: number;
  /** Limits on a workbook's ZIP archive (default ZIP_LIMITS). */
  zip?: ZipLimits;
}

/** Defaults sized so a 50 000-row screen fits with room to spare; the upload middleware uses maxBytes too. */
export const IMPORT_LIMITS: ImportLimits = { maxBytes: 10 * 1024 * 1024, maxRows: 100_000, maxColumns: 100 };

/** A cell as read: text from CSV (and text cells of workbooks), numbers from numeric workbook cells. */
export type Cell = string | number | null;

export interface DataRow {
  /** The row number a spreadsheet program shows for this row (1-based, blank rows counted). */
  rowNumber: number;
  cells: Cell[];
}

export type DecimalSeparator = '.' | ',';

export interface ParsedTable {
  format: 'csv' | 'xlsx';
  fileName: string;
  /** Text encoding the CSV was read with; null for workbooks. */
  encoding: string | null;
  delimiter: Delimiter | null;
  decimalSeparator: DecimalSeparator;
  /** 1-based row of the header, or null when the file has none. */
  headerRow: number | null;
  /** One entry per column: the header text, or "" when the column has none. */
  headers: string[];
  rows: DataRow[];
  sheetName: string | null;
  sheetNames: string[];
  /** What was detected rather than given, in words for the preview. */
  detected: string[];
}

export interface UploadedFile {
  /** The file name the user's browser sent (only its extension is used). */
  name: string;
  buffer: Buffer;
}

const TEXT_EXTENSIONS = new Set(['csv', 'tsv', 'txt']);

/** Spreadsheet-style column letter for a 0-based index: 0 → A, 26 → AA. */
export function columnLetter(index: number): string {
  let n = index + 1;
  let s = '';
  while (n > 0) {
    const r = (n - 1) % 26;
    s = String.fromCharCode(65 + r) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
}

function formatBytes(n: number): string {
  if (n >= 1024 * 1024) return `${(n / (1024 * 1024)).toFixed(1)} MB`;
  if (n >= 1024) return `${(n / 1024).toFixed(1)} KB`;
  return `${n} bytes`;
}

export function extensionOf(name: string): string {
  const m = /\.([A-Za-z0-9]+)$/.exec(name.trim());
  return m ? m[1].toLowerCase() : '';
}

/** What a non-workbook binary looks like, from its first bytes, for the error message. */
function describeContent(buf: Buffer): string {
  const starts = (...bytes: number[]) => bytes.every((b, i) => buf[i] === b);
  if (starts(0x25, 0x50, 0x44, 0x46)) return 'a PDF document';
  if (starts(0x89, 0x50, 0x4e, 0x47)) return 'a PNG image';
  if (starts(0xff, 0xd8, 0xff)) return 'a JPEG image';
  if (starts(0x47, 0x49, 0x46, 0x38)) return 'a GIF image';
  if (starts(0x1f, 0x8b)) return 'a gzip archive';
  if (starts(0x7f, 0x45, 0x4c, 0x46)) return 'a program (ELF executable)';
  if (starts(0x4d, 0x5a)) return 'a Windows program';
  if (looksLikeText(buf)) return 'plain text (perhaps a CSV file given an .xlsx name; rename it .csv)';
  return 'binary data of an unknown kind';
}

const isZip = (buf: Buffer) => buf.length >= 4 && buf[0] === 0x50 && buf[1] === 0x4b && buf[2] === 0x03 && buf[3] === 0x04;
const isOleCompound = (buf: Buffer) =>
  buf.length >= 8 && buf.subarray(0, 8).equals(Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]));

function looksLikeText(buf: Buffer): boolean {
  const sample = buf.subarray(0, 4096);
  if (sample.length >= 2 && ((sample[0] === 0xff && sample[1] === 0xfe) || (sample[0] === 0xfe && sample[1] === 0xff))) return true;
  let control = 0;
  for (const b of sample) {
    if (b === 0) return false;
    if (b < 0x09 || (b > 0x0d && b < 0x20)) control += 1;
  }
  return control <= sample.length * 0.01;
}

/** Text files up to this size are read in the calling thread (a few milliseconds); larger ones and every workbook in a worker. */
export const IN_THREAD_MAX_BYTES = 256 * 1024;

/**
 * Whether `file` is read in a worker thread: every workbook and text files over IN_THREAD_MAX_BYTES,
 * unless this is a reading worker already (a whole preview runs there) or the file is refused by
 * its size before any reading.
 */
export function readsInWorker(file: UploadedFile, limits: ImportLimits = IMPORT_LIMITS): boolean {
  if (!isMainThread || file.buffer.length > limits.maxBytes) return false;
  return extensionOf(file.name) === 'xlsx' || file.buffer.length > IN_THREAD_MAX_BYTES;
}

/**
 * Read an uploaded file into a table of cells: workbooks and large text files in a worker thread
 * with a memory cap (parse-pool.ts), small text files here. Errors as for `readUpload`.
 */
export async function parseUpload(
  file: UploadedFile,
  options: ImportParseOptions = {},
  limits: ImportLimits = IMPORT_LIMITS,
): Promise<ParsedTable> {
  if (!readsInWorker(file, limits)) return readUpload(file, options, limits);
  const { readInPool } = await import('./parse-pool');
  return (await readInPool(file, options, limits)).table;
}

/**
 * Read an uploaded CSV/TSV/TXT or XLSX file into a table of cells, in the calling thread.
 * Throws PayloadTooLargeError (413) for files or tables over the limits and UnreadableFileError (400)
 * for anything that is not a readable table; both name the file and say what to do.
 */
export async function readUpload(
  file: UploadedFile,
  options: ImportParseOptions = {},
  limits: ImportLimits = IMPORT_LIMITS,
): Promise<ParsedTable> {
  const { name, buffer } = file;
  if (buffer.length > limits.maxBytes) {
    throw new PayloadTooLargeError(
      `${name} is ${formatBytes(buffer.length)}; the largest file accepted is ${formatBytes(limits.maxBytes)}. Split it, or remove columns you do not need.`,
    );
  }
  const ext = extensionOf(name);
  if (ext === 'xls') {
    throw new UnreadableFileError(`${name} is in the old .xls format, which is not read here; save it as .xlsx or as CSV.`);
  }
  if (ext !== 'xlsx' && !TEXT_EXTENSIONS.has(ext)) {
    throw new UnreadableFileError(
      `${name}: only .csv, .tsv, .txt and .xlsx files can be imported${ext ? ` (this one ends in .${ext})` : ''}.`,
    );
  }
  if (
    buffer.length === 0 ||
    (TEXT_EXTENSIONS.has(ext) &&
      buffer
        .toString('utf8')
        .replace(/^\uFEFF/, '')
        .trim() === '')
  ) {
    throw new UnreadableFileError(`${name} is empty: there is nothing to import.`);
  }
  if (ext === 'xlsx') {
    if (isOleCompound(buffer)) {
      throw new UnreadableFileError(
        `${name} is not an .xlsx workbook: it is an older .xls file or a password-protected workbook. Save it as .xlsx without a password, or as CSV.`,
      );
    }
    if (!isZip(buffer)) throw new UnreadableFileError(`${name} is not an Excel workbook: its content is ${describeContent(buffer)}.`);
    return parseWorkbook(name, buffer, options, limits);
  }
  if (isZip(buffer) || isOleCompound(buffer)) {
    throw new UnreadableFileError(
      `${name} is named .${ext} but contains a workbook or archive, not text; if it is an Excel workbook, rename it .xlsx.`,
    );
  }
  if (!looksLikeText(buffer)) {
    throw new UnreadableFileError(`${name} is not a text table: its content is ${describeContent(buffer)}.`);
  }
  return parseDelimited(name, buffer, options, limits);
}

// ── Text ───────────────────────────────────────────────────────────────────────────────────

function decode(buffer: Buffer): { text: string; encoding: string } {
  if (buffer[0] === 0xef && buffer[1] === 0xbb && buffer[2] === 0xbf)
    return { text: buffer.subarray(3).toString('utf8'), encoding: 'UTF-8' };
  if (buffer[0] === 0xff && buffer[1] === 0xfe)
    return { text: new TextDecoder('utf-16le').decode(buffer.subarray(2)), encoding: 'UTF-16LE' };
  if (buffer[0] === 0xfe && buffer[1] === 0xff)
    return { text: new TextDecoder('utf-16be').decode(buffer.subarray(2)), encoding: 'UTF-16BE' };
  try {
    return { text: new TextDecoder('utf-8', { fatal: true }).decode(buffer), encoding: 'UTF-8' };
  } catch {
    // Older spreadsheet programs on Windows save CSV as Windows-1252 ("°" is one byte, 0xB0).
    return { text: new TextDecoder('windows-1252').decode(buffer), encoding: 'Windows-1252' };
  }
}

function csvFailure(name: string, err: unknown): UnreadableFileError {
  if (err instanceof CsvError) {
    const line = (err as CsvError & { lines?: number }).lines;
    const at = line ? ` at line ${line}` : '';
    if (err.code === 'CSV_QUOTE_NOT_CLOSED')
      return new UnreadableFileError(`${name} could not be read${at}: a quoted field is opened but never closed.`);
    if (err.code === 'CSV_MAX_RECORD_SIZE')
      return new UnreadableFileError(`${name} could not be read${at}: one field is longer than 64 KB.`);
    return new UnreadableFileError(`${name} could not be read${at}: ${err.message}`);
  }
  return new UnreadableFileError(`${name} could not be read as CSV.`);
}

function parseDelimited(name: string, buffer: Buffer, options: ImportParseOptions, limits: ImportLimits): ParsedTable {
  const detected: string[] = [];
  const { text, encoding } = decode(buffer);
  if (encoding !== 'UTF-8') detected.push(`read as ${encoding} text`);
  const nul = text.indexOf('\0');
  if (nul >= 0) {
    const line = text.slice(0, nul).split(/\r\n|\n|\r/).length;
    throw new UnreadableFileError(
      `${name} contains a NUL character (a zero byte) at line ${line}; a text table cannot hold one. Remove it, or export the table again.`,
    );
  }
  const delimiter = options.delimiter ?? detectDelimiter(text);
  if (!options.delimiter) detected.push(`${DELIMITER_NAMES[delimiter]}-separated`);

  let records: string[][];
  try {
    records = splitDelimited(text, delimiter, { maxRecordSize: 64 * 1024 });
  } catch (err) {
    throw csvFailure(name, err);
  }
  const grid: Cell[][] = records.map((r) => r.map((c) => (c === '' ? null : c)));
  return finishTable(name, 'csv', grid, null, [], encoding, delimiter, options, limits, detected);
}

// ── Workbooks ──────────────────────────────────────────────────────────────────────────────

function cellValue(v: ExcelJS.CellValue): Cell {
  if (v === null || v === undefined) return null;
  if (typeof v === 'number') return Number.isFinite(v) ? v : null;
  if (typeof v === 'string') return v.trim() === '' ? null : v.trim();
  if (typeof v === 'boolean') return v ? 'TRUE' : 'FALSE';
  if (v instanceof Date) return v.toISOString();
  if (typeof v === 'object') {
    if ('richText' in v && Array.isArray(v.richText)) return cellValue(v.richText.map((p) => p.text).join(''));
    if ('error' in v) return String(v.error);
    if ('formula' in v || 'sharedFormula' in v) return cellValue((v as ExcelJS.CellFormulaValue).result as ExcelJS.CellValue);
    if ('text' in v) return cellValue((v as ExcelJS.CellHyperlinkValue).text);
  }
  return String(v);
}

/** Rows above the data that may hold titles and the header; the streaming reader allows for them before it stops. */
const HEAD_ROWS_ALLOWANCE = 30;

/**
 * Read one worksheet row by row with exceljs's streaming reader, after the archive has passed the
 * ZIP checks (zip-guard.ts). Parsing stops as soon as the chosen sheet has more filled rows than
 * the limit allows, so a million-row sheet costs the time of the first hundred thousand rows.
 */
async function parseWorkbook(name: string, buffer: Buffer, options: ImportParseOptions, limits: ImportLimits): Promise<ParsedTable> {
  await inspectZip(name, buffer, limits.zip ?? ZIP_LIMITS);
  const unreadable = () =>
    new UnreadableFileError(
      `${name} is a ZIP archive but not a readable Excel workbook (it may be another kind of document renamed .xlsx, or damaged).`,
    );
  const reader = new ExcelJS.stream.xlsx.WorkbookReader(Readable.from([buffer]), {
    worksheets: 'emit',
    sharedStrings: 'cache',
    styles: 'cache',
    hyperlinks: 'ignore',
    entries: 'ignore',
  });
  const maxFilledRows = limits.maxRows + HEAD_ROWS_ALLOWANCE;
  const maxRowNumber = limits.maxRows * 2 + 1000;
  const seenSheets: string[] = [];
  let chosen: { name: string; grid: Cell[][] } | null = null;
  try {
    for await (const sheet of reader) {
      const sheetName = (sheet as unknown as { name: string }).name;
      seenSheets.push(sheetName);
      const wanted = chosen === null && (options.sheet ? sheetName === options.sheet : true);
      const grid: Cell[][] = [];
      let filled = 0;
      for await (const row of sheet as unknown as AsyncIterable<ExcelJS.Row>) {
        if (!wanted) continue;
        if (row.number > maxRowNumber) {
          throw new PayloadTooLargeError(
            `${name} (worksheet "${sheetName}") has cells in row ${row.number}; at most ${limits.maxRows} data rows can be imported at once.`,
          );
        }
        const values = row.values as ExcelJS.CellValue[];
        const cells: Cell[] = [];
        const width = Math.min(values.length - 1, limits.maxColumns + 1);
        for (let c = 1; c <= width; c++) {
          const cell = cellValue(values[c]);
          if (typeof cell === 'string' && cell.includes('\0')) {
            throw new UnreadableFileError(
              `${name}: cell ${columnLetter(c - 1)}${row.number} of worksheet "${sheetName}" contains a NUL character (a zero byte); remove it and save again.`,
            );
          }
          cells.push(cell);
        }
        if (cells.every((c) => c === null)) continue;
        filled += 1;
        if (filled > maxFilledRows) {
          throw new PayloadTooLargeError(
            `${name} (worksheet "${sheetName}") has more than ${limits.maxRows} rows; at most ${limits.maxRows} data rows can be imported at once. Split the file.`,
          );
        }
        while (grid.length < row.number - 1) grid.push([]);
        grid.push(cells);
      }
      if (wanted && (options.sheet || filled > 0)) {
        chosen = { name: sheetName, grid };
        // The chosen sheet is read; the rest of the archive is not needed.
        break;
      }
    }
  } catch (err) {
    if (err instanceof AppError) throw err;
    throw unreadable();
  }
  const model = (reader as unknown as { model?: { sheets?: { name: string }[] } }).model;
  const sheetNames = model?.sheets?.map((s) => s.name) ?? seenSheets;
  if (sheetNames.length === 0) throw new UnreadableFileError(`${name} contains no worksheets.`);
  if (!chosen) {
    if (options.sheet)
      throw new UnreadableFileError(
        `${name} has no worksheet named "${options.sheet}"; it has ${sheetNames.map((s) => `"${s}"`).join(', ')}.`,
      );
    throw new UnreadableFileError(`${name} is empty: none of its worksheets has any cells filled.`);
  }
  const detected = sheetNames.length > 1 && !options.sheet ? [`worksheet "${chosen.name}" of ${sheetNames.length}`] : [];
  return finishTable(name, 'xlsx', chosen.grid, chosen.name, sheetNames, null, null, options, limits, detected);
}

// ── Shared: header row, decimal separator, limits ───────────────────────────────────────────

const NUMBER_DOT = /^[+\-\u2212]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const NUMBER_COMMA = /^[+\-\u2212]?(\d+,?\d*|,\d+)([eE][+-]?\d+)?$/;

/** Strip what may decorate a number in a lab table: a bound sign before it, a % or unit after it. */
function numericCore(text: string): string {
  return text
    .trim()
    .replace(/^(≥|>=|>|≤|<=|<|~|ca\.?)\s*/i, '')
    .replace(/\s*(%|°\s?[CF]|K|h|min|s)$/i, '')
    .trim();
}

function looksNumeric(cell: Cell): boolean {
  if (cell === null) return false;
  if (typeof cell === 'number') return true;
  const core = numericCore(cell);
  return NUMBER_DOT.test(core) || NUMBER_COMMA.test(core) || /^\d+(?:[.,]\d+)?\s*:\s*\d+(?:[.,]\d+)?$/.test(core);
}

const isBlankRow = (cells: Cell[]) => cells.every((c) => c === null);

/**
 * The header is the first row with at least two filled cells, none of them numeric, followed
 * (within three non-blank rows) by a row with a numeric cell. Title lines above it are skipped.
 */
export function detectHeaderRow(grid: Cell[][]): number | null {
  const limit = Math.min(grid.length, 30);
  for (let i = 0; i < limit; i++) {
    const filled = grid[i].filter((c) => c !== null);
    if (filled.length < 2 || filled.some(looksNumeric)) continue;
    let seen = 0;
    for (let j = i + 1; j < grid.length && seen < 3; j++) {
      if (isBlankRow(grid[j])) continue;
      seen += 1;
      if (grid[j].some(looksNumeric)) return i + 1;
    }
    // A lone all-text row is a header with nothing below it (reported as "no data rows").
    if (seen === 0) return i + 1;
  }
  return null;
}

/** Decimal comma when text cells written like 12,5 outnumber those written like 12.5. */
export function detectDecimalSeparator(rows: Cell[][]): DecimalSeparator {
  let dot = 0;
  let comma = 0;
  for (const cells of rows) {
    for (const cell of cells) {
      if (typeof cell !== 'string') continue;
      const core = numericCore(cell).replace(/:.*$/, '');
      if (/^[+\-\u2212]?\d*\.\d+$/.test(core)) dot += 1;
      else if (/^[+\-\u2212]?\d*,\d+$/.test(core)) comma += 1;
    }
  }
  return comma > dot ? ',' : '.';
}

function finishTable(
  fileName: string,
  format: 'csv' | 'xlsx',
  grid: Cell[][],
  sheetName: string | null,
  sheetNames: string[],
  encoding: string | null,
  delimiter: Delimiter | null,
  options: ImportParseOptions,
  limits: ImportLimits,
  detected: string[],
): ParsedTable {
  let last = grid.length;
  while (last > 0 && isBlankRow(grid[last - 1])) last -= 1;
  if (last === 0) throw new UnreadableFileError(`${fileName} is empty: there is nothing to import.`);
  const width = grid.slice(0, last).reduce((w, r) => {
    let n = r.length;
    while (n > 0 && r[n - 1] === null) n -= 1;
    return Math.max(w, n);
  }, 0);
  if (width > limits.maxColumns) {
    throw new UnreadableFileError(
      `${fileName} has ${width} columns; at most ${limits.maxColumns} can be read. Remove the columns you do not need.`,
    );
  }

  let headerRow: number | null;
  if (options.headerRow !== undefined) {
    headerRow = options.headerRow === 0 ? null : options.headerRow;
    if (headerRow !== null && headerRow > last) {
      throw new UnreadableFileError(`${fileName} has ${last} rows, so row ${headerRow} cannot be its header.`);
    }
  } else {
    headerRow = detectHeaderRow(grid.slice(0, last));
    detected.push(headerRow === null ? 'no header row' : `header in row ${headerRow}`);
  }

  const pad = (cells: Cell[]) => (cells.length === width ? cells : Array.from({ length: width }, (_, i) => cells[i] ?? null));
  const headers =
    headerRow === null ? Array.from({ length: width }, () => '') : pad(grid[headerRow - 1]).map((c) => (c === null ? '' : String(c)));
  const rows: DataRow[] = [];
  for (let i = headerRow ?? 0; i < last; i++) {
    if (isBlankRow(grid[i])) continue;
    rows.push({ rowNumber: i + 1, cells: pad(grid[i]) });
  }
  if (rows.length === 0) {
    throw new UnreadableFileError(`${fileName} has a header row (row ${headerRow}) but no data rows below it.`);
  }
  if (rows.length > limits.maxRows) {
    throw new PayloadTooLargeError(
      `${fileName} has ${rows.length} data rows; at most ${limits.maxRows} can be imported at once. Split the file.`,
    );
  }

  let decimalSeparator = options.decimalSeparator;
  if (!decimalSeparator) {
    decimalSeparator = detectDecimalSeparator(rows.slice(0, 500).map((r) => r.cells));
    if (decimalSeparator === ',') detected.push('decimal commas');
  }
  return { format, fileName, encoding, delimiter, decimalSeparator, headerRow, headers, rows, sheetName, sheetNames, detected };
}
