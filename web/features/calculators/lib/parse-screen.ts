import type { z } from 'zod';
import type { selectivityMeasureSchema, temperatureUnitSchema } from '../../../../api/features/compute/schemas';

export type SelectivityMeasure = z.infer<typeof selectivityMeasureSchema>;
export type TemperatureUnit = z.infer<typeof temperatureUnitSchema>;

/** One pasted run: line number (1-based) in the paste box and the values on it. */
export interface ScreenRow {
  line: number;
  temperature: number;
  /** A number, or an "a:b" string for er, dr and ratio. */
  selectivity: number | string;
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

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;
const RATIO_TEXT = /^\d+(\.\d+)?\s*:\s*\d+(\.\d+)?$/;
const ABSOLUTE_ZERO: Record<TemperatureUnit, number> = { K: 0, C: -273.15, F: -459.67 };
const UNIT_TEXT: Record<TemperatureUnit, string> = { K: 'K', C: '°C', F: '°F' };

function splitFields(line: string): { fields: string[]; decimalComma: boolean } {
  if (line.includes('\t')) return { fields: line.split('\t'), decimalComma: true };
  if (line.includes(';')) return { fields: line.split(';'), decimalComma: true };
  if (line.includes(',')) return { fields: line.split(','), decimalComma: false };
  return { fields: line.split(/\s+/), decimalComma: true };
}

function toNumber(text: string, decimalComma: boolean): number | null {
  let t = text.trim().replace(/\u2212/g, '-');
  if (decimalComma) t = t.replace(',', '.');
  return NUMBER.test(t) ? Number(t) : null;
}

/**
 * Parse a pasted temperature screen: one run per line, "temperature, selectivity[, uncertainty]",
 * separated by tab, semicolon, comma or spaces (with tab, semicolon or spaces a decimal comma is
 * accepted). Blank lines and lines starting with # are ignored; a first line of column headings is
 * skipped. Every problem is reported with its line number; nothing is sent until there are none.
 */
export function parseScreen(text: string, measure: SelectivityMeasure, unit: TemperatureUnit): ScreenParseResult {
  const rows: ScreenRow[] = [];
  const errors: ScreenParseError[] = [];
  let headerLine: number | null = null;
  let seenContent = false;
  const lines = text.split(/\r\n|\r|\n/);

  lines.forEach((raw, i) => {
    const line = i + 1;
    const trimmed = raw.trim();
    if (trimmed === '' || trimmed.startsWith('#')) return;
    const { fields: rawFields, decimalComma } = splitFields(trimmed);
    const fields = rawFields.map((f) => f.trim());
    while (fields.length > 0 && fields[fields.length - 1] === '') fields.pop();

    const first = !seenContent;
    seenContent = true;
    if (
      first &&
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
      errors.push({ line, message: `temperature ${fields[0]} ${UNIT_TEXT[unit]} is at or below absolute zero` });
      return;
    }

    let selectivity: number | string;
    const sText = fields[1].replace(/%$/, '').trim();
    if ((measure === 'er' || measure === 'dr' || measure === 'ratio') && RATIO_TEXT.test(sText)) {
      const [a, b] = sText.split(':').map(Number);
      if (!(a > 0 && b > 0)) {
        errors.push({ line, message: `ratio "${sText}" needs two positive parts` });
        return;
      }
      selectivity = sText.replace(/\s+/g, '');
    } else {
      const value = toNumber(sText, decimalComma);
      if (value === null) {
        const hint = measure === 'ee' || measure === 'percentA' ? '' : ' or an "a:b" ratio';
        errors.push({ line, message: `selectivity "${fields[1]}" is not a number${hint}` });
        return;
      }
      if (measure === 'ee' && !(value > -100 && value <= 100)) {
        errors.push({ line, message: `ee ${sText} % is outside −100 to 100 %` });
        return;
      }
      if (measure === 'percentA' && !(value > 0 && value <= 100)) {
        errors.push({ line, message: `% A ${sText} is outside 0 to 100 %` });
        return;
      }
      if ((measure === 'er' || measure === 'dr' || measure === 'ratio') && !(value > 0)) {
        errors.push({ line, message: `ratio ${sText} must be greater than zero` });
        return;
      }
      selectivity = value;
    }

    const row: ScreenRow = { line, temperature, selectivity };
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
