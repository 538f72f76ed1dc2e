import type { z } from 'zod';
import type { selectivityMeasureSchema, temperatureUnitSchema } from '../../../../api/features/calculators/schemas';
import { readPastedTable } from '../../../../api/features/imports/table-text';
import { ABSOLUTE_ZERO, isPairMeasure, readDecimal, readSelectivityText, TEMPERATURE_UNIT_LABEL } from '../../../../api/science/quantities';

export type SelectivityMeasure = z.infer<typeof selectivityMeasureSchema>;
export type TemperatureUnit = z.infer<typeof temperatureUnitSchema>;

/** One pasted run: line number (1-based) in the paste box and the values on it. */
export interface ScreenRow {
  line: number;
  temperature: number;
  /** A number, or an "a:b" string for er, dr and ratio. */
  selectivity: number | string;
  /** Written as a lower bound ("≥99.8", ">99.8", "99.8+", "> 200:1"): sent as a censored run. */
  atLeast?: boolean;
  uncertainty?: number;
}

export interface ScreenParseError {
  line: number;
  message: string;
}

export interface ScreenParseResult {
  rows: ScreenRow[];
  errors: ScreenParseError[];
  /** Line number of a column-heading line that was skipped, if any. */
  headerLine: number | null;
}

const toNumber = (text: string, decimalComma: boolean): number | null => readDecimal(text, decimalComma ? 'either' : '.');

/**
 * Parse a pasted temperature screen: one run per line, "temperature, selectivity[, uncertainty]",
 * separated by tab, semicolon, comma or spaces (read by the same table reader as the grid and the
 * file import; with tab, semicolon or spaces a decimal comma is accepted). A selectivity may be a
 * lower bound ("≥99.8", ">99.8", "99.8+", "> 200:1"), as in the grid and the importer. Blank lines
 * and lines starting with # are ignored; a first line of column headings is skipped. Every problem
 * is reported with its line number; nothing is sent until there are none.
 */
export function parseScreen(text: string, measure: SelectivityMeasure, unit: TemperatureUnit): ScreenParseResult {
  const rows: ScreenRow[] = [];
  const errors: ScreenParseError[] = [];
  let headerLine: number | null = null;
  const table = readPastedTable(text, { comments: true });
  const decimalComma = table.decimalComma;

  table.rows.forEach(({ line, cells }, i) => {
    const fields = [...cells];
    while (fields.length > 0 && fields[fields.length - 1] === '') fields.pop();
    if (
      i === 0 &&
      fields.length >= 2 &&
      /[a-z]/i.test(fields[0]) &&
      toNumber(fields[0], decimalComma) === null &&
      toNumber(fields[1].replace(/%$/, ''), decimalComma) === null
    ) {
      headerLine = line;
      return;
    }

    if (fields.length < 2 || fields.length > 3) {
      errors.push({ line, message: `expected 2 or 3 values (temperature, selectivity[, uncertainty]) but found ${fields.length}` });
      return;
    }

    const temperature = toNumber(fields[0], decimalComma);
    if (temperature === null) {
      errors.push({ line, message: `temperature "${fields[0]}" is not a number (choose the unit above the box)` });
      return;
    }
    if (temperature <= ABSOLUTE_ZERO[unit]) {
      errors.push({ line, message: `temperature ${fields[0]} ${TEMPERATURE_UNIT_LABEL[unit]} is at or below absolute zero` });
      return;
    }

    const read = readSelectivityText(fields[1], measure, decimalComma ? 'either' : '.');
    if (!read.ok) {
      const hint = isPairMeasure(measure) ? ' or an "a:b" ratio' : '';
      errors.push({
        line,
        message: /not a number/.test(read.message) ? `selectivity "${fields[1]}" is not a number${hint}` : read.message,
      });
      return;
    }

    const row: ScreenRow = { line, temperature, selectivity: read.value };
    if (read.atLeast) row.atLeast = true;
    if (fields.length === 3) {
      const u = toNumber(fields[2].replace(/%$/, ''), decimalComma);
      if (u === null || !(u > 0)) {
        errors.push({ line, message: `uncertainty "${fields[2]}" must be a number greater than zero` });
        return;
      }
      row.uncertainty = u;
    }
    rows.push(row);
  });

  return { rows, errors, headerLine };
}
