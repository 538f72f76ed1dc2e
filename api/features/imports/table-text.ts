/**
 * The one reader of delimited text, used by the file import on the server and by both paste boxes
 * in the browser (the calculator's screen and the measurement grid), so both split text the same
 * way. The web build resolves `csv-parse/sync` to csv-parse's browser build (vite.config.ts), which
 * needs no Node Buffer; the server keeps the Node build, about three times faster on large files.
 */
import { CsvError, parse as parseCsv } from 'csv-parse/sync';

export { CsvError };

export type Delimiter = ',' | ';' | '\t';
/** `space` splits on runs of spaces (a table typed by hand); it never reads quotes. */
export type PasteDelimiter = Delimiter | 'space';

export const DELIMITER_NAMES: Record<PasteDelimiter, string> = { ',': 'comma', ';': 'semicolon', '\t': 'tab', space: 'space' };

/** Tab and semicolon first: with a decimal comma in the numbers, a comma split is the one to distrust. */
const DELIMITERS: Delimiter[] = ['\t', ';', ','];

export interface SplitOptions {
  /** Keep blank lines (as empty records) so that record i is line i + 1; default true. */
  keepBlankLines?: boolean;
  /** Longest field accepted, in characters; csv-parse throws CSV_MAX_RECORD_SIZE beyond it. */
  maxRecordSize?: number;
}

/** Split delimited text into records of trimmed fields (quotes as in RFC 4180, leniently). Throws CsvError. */
export function splitDelimited(text: string, delimiter: Delimiter, options: SplitOptions = {}): string[][] {
  return parseCsv(text, {
    delimiter,
    relax_column_count: true,
    relax_quotes: true,
    skip_empty_lines: options.keepBlankLines === false,
    trim: true,
    ...(options.maxRecordSize ? { max_record_size: options.maxRecordSize } : {}),
  });
}

/**
 * Pick the delimiter that splits the first lines into the most columns consistently: the
 * candidate whose most common field count (above 1) covers at least 80 % of non-blank lines
 * and is highest; on a tie tab, then semicolon, then comma. A decimal comma inside a semicolon
 * file splits numbers into two fields irregularly, so the semicolon wins there. Null when no
 * candidate splits the text consistently.
 */
export function detectDelimiterOrNull(text: string): Delimiter | null {
  const sample = text.split(/\r\n|\n|\r/, 60).join('\n');
  let best: { d: Delimiter; width: number; share: number } | null = null;
  for (const d of DELIMITERS) {
    let records: string[][];
    try {
      records = splitDelimited(sample, d, { keepBlankLines: false });
    } catch {
      continue;
    }
    const filled = records.filter((r) => r.some((c) => c.trim() !== ''));
    if (filled.length === 0) continue;
    const counts = new Map<number, number>();
    for (const r of filled) counts.set(r.length, (counts.get(r.length) ?? 0) + 1);
    let width = 1;
    let freq = 0;
    for (const [w, f] of counts) if (f > freq || (f === freq && w > width)) [width, freq] = [w, f];
    const share = freq / filled.length;
    if (width < 2 || share < 0.8) continue;
    if (!best || width > best.width || (width === best.width && share > best.share)) best = { d, width, share };
  }
  return best?.d ?? null;
}

/** The file import's rule: the consistent delimiter, else comma. */
export function detectDelimiter(text: string): Delimiter {
  return detectDelimiterOrNull(text) ?? ',';
}

export interface PastedTable {
  /** Non-blank lines, each with its 1-based line number in the pasted text (empty trailing cells kept). */
  rows: { line: number; cells: string[] }[];
  delimiter: PasteDelimiter;
  /** True when the delimiter leaves the comma free to be a decimal mark. */
  decimalComma: boolean;
}

/**
 * Read pasted text (from a spreadsheet, a CSV file or typed by hand) into rows of cells. The
 * delimiter is the consistent one when there is one; otherwise the separator found on most lines
 * (tab, semicolon, comma), else runs of spaces. Blank lines are skipped; with `comments`, so are
 * lines starting with #.
 */
export function readPastedTable(text: string, options: { comments?: boolean } = {}): PastedTable {
  const skip = (line: string) => line.trim() === '' || (options.comments === true && line.trim().startsWith('#'));
  const lines = text.replace(/\r\n?/g, '\n').split('\n');
  const content = lines.filter((l) => !skip(l));
  let delimiter: PasteDelimiter | null = detectDelimiterOrNull(content.join('\n'));
  if (!delimiter) {
    let most = 0;
    for (const d of DELIMITERS) {
      const n = content.filter((l) => l.includes(d)).length;
      if (n > most) [delimiter, most] = [d, n];
    }
  }
  delimiter ??= 'space';
  const rows: PastedTable['rows'] = [];
  lines.forEach((raw, i) => {
    if (skip(raw)) return;
    const trimmed = raw.trim();
    let cells: string[];
    if (delimiter === 'space') cells = trimmed.split(/\s+/);
    else {
      try {
        cells = splitDelimited(raw, delimiter)[0] ?? [];
      } catch {
        cells = raw.split(delimiter).map((c) => c.trim());
      }
    }
    rows.push({ line: i + 1, cells });
  });
  return { rows, delimiter, decimalComma: delimiter !== ',' };
}
