import { describe, expect, it } from 'vitest';
import { deflateRawSync } from 'node:zlib';
import { columnLetter, detectDelimiter, IMPORT_LIMITS, parseUpload } from '../../../api/features/imports/parse';
import { UnreadableFileError } from '../../../api/features/imports/errors';
import { PayloadTooLargeError } from '../../../api/lib/errors';
import { parseText, rejection, sample, textFile } from './helpers';

describe('parseUpload: the sample files', () => {
  it('when the clean kelvin CSV is read, then it is comma-separated with a header in row 1 and 12 data rows', async () => {
    const t = await parseUpload(sample('kestrelmoor-skylark-screen.csv'));
    expect(t.format).toBe('csv');
    expect(t.delimiter).toBe(',');
    expect(t.decimalSeparator).toBe('.');
    expect(t.headerRow).toBe(1);
    expect(t.headers).toEqual(['sample_id', 'replicate', 'T (K)', 'ee (%)', 'sd (% ee)', 'conversion (%)', 'time (h)', 'notes']);
    expect(t.rows).toHaveLength(12);
    expect(t.rows[0]).toEqual({ rowNumber: 2, cells: ['KL7702-S-001', 'a', '313.15', '95.5', '0.3', '100', '1', null] });
  });

  it('when the German export is read, then the BOM, title line, semicolons and decimal commas are all detected', async () => {
    const t = await parseUpload(sample('kestrelmoor-merlin-screen-de.csv'));
    expect(t.delimiter).toBe(';');
    expect(t.decimalSeparator).toBe(',');
    expect(t.headerRow).toBe(3);
    expect(t.headers[0]).toBe('Probe');
    expect(t.headers[1]).toBe('Temperatur (°C)');
    expect(t.rows).toHaveLength(9);
    expect(t.rows[0].rowNumber).toBe(4);
    expect(t.rows[0].cells.slice(0, 3)).toEqual(['KL7702-M-001', '40', '84,6']);
    expect(t.detected).toEqual(expect.arrayContaining(['semicolon-separated', 'header in row 3', 'decimal commas']));
  });

  it('when the workbook is read, then the data sheet is chosen, numbers stay numbers and the censored cell stays text', async () => {
    const t = await parseUpload(sample('kestrelmoor-skylark-methf-screen.xlsx'));
    expect(t.format).toBe('xlsx');
    expect(t.sheetName).toBe('Screen');
    expect(t.sheetNames).toEqual(['Screen', 'About']);
    expect(t.headerRow).toBe(1);
    expect(t.rows).toHaveLength(10);
    expect(t.rows[0].cells[2]).toBe(25);
    expect(typeof t.rows[0].cells[3]).toBe('number');
    expect(t.rows[9].cells[3]).toBe('≥99.8');
  });

  it('when a worksheet is named that does not exist, then the error lists the sheets there are', async () => {
    const err = await rejection(parseUpload(sample('kestrelmoor-skylark-methf-screen.xlsx'), { sheet: 'Data' }), 400);
    expect(err.message).toContain('no worksheet named "Data"');
    expect(err.message).toContain('"Screen", "About"');
  });

  it('when the errors sample is read, then it still parses (its problems are row-level, not file-level)', async () => {
    const t = await parseUpload(sample('kestrelmoor-screen-with-errors.csv'));
    expect(t.rows).toHaveLength(13);
    expect(t.headers[6]).toBe('Operator');
  });
});

describe('parseUpload: delimiter, decimal separator and header detection', () => {
  it('when a file is tab-separated, then tab is detected', async () => {
    const t = await parseText('T (°C)\tee (%)\n25\t96.5\n0\t97.9\n');
    expect(t.delimiter).toBe('\t');
    expect(t.rows.map((r) => r.cells)).toEqual([
      ['25', '96.5'],
      ['0', '97.9'],
    ]);
  });

  it('when semicolons separate fields that contain decimal commas, then the semicolon wins over the comma', () => {
    expect(detectDelimiter('T;ee;sample\n-20,5;98,1;A1\n0;97,35;A2\n25;96,5;A3\n')).toBe(';');
  });

  it('when a comma file quotes decimal-comma numbers, then the decimal comma is detected', async () => {
    const t = await parseText('T (°C),ee (%)\n"25,0","96,5"\n"0,0","97,9"\n');
    expect(t.delimiter).toBe(',');
    expect(t.decimalSeparator).toBe(',');
  });

  it('when a file has no header row, then the first row is data and the headers are blank', async () => {
    const t = await parseText('25,96.5\n0,97.9\n');
    expect(t.headerRow).toBeNull();
    expect(t.headers).toEqual(['', '']);
    expect(t.rows[0].rowNumber).toBe(1);
  });

  it('when the user says the header is in row 2, then row 1 is skipped whatever it looks like', async () => {
    const t = await parseText('exported 2026-12-01,by T. Reyes\nT (°C),ee (%)\n25,96.5\n', { headerRow: 2 });
    expect(t.headerRow).toBe(2);
    expect(t.headers).toEqual(['T (°C)', 'ee (%)']);
    expect(t.rows).toHaveLength(1);
  });

  it('when the user overrides the delimiter and decimal separator, then they are used and not reported as detected', async () => {
    const u = await parseText('T;ee\n25;96,5\n', { delimiter: ';', decimalSeparator: '.' });
    expect(u.decimalSeparator).toBe('.');
    expect(u.detected).not.toContain('semicolon-separated');
  });

  it('when blank lines sit between rows, then row numbers still match what a spreadsheet shows', async () => {
    const t = await parseText('T (°C),ee (%)\n25,96.5\n\n0,97.9\n');
    expect(t.rows.map((r) => r.rowNumber)).toEqual([2, 4]);
  });

  it('when a CSV was saved as Windows-1252, then "°C" in the header is read correctly', async () => {
    const bytes = Buffer.concat([Buffer.from('T ('), Buffer.from([0xb0]), Buffer.from('C);ee (%)\r\n25;96,5\r\n0;97,9\r\n')]);
    const t = await parseUpload({ name: 'screen.csv', buffer: bytes });
    expect(t.encoding).toBe('Windows-1252');
    expect(t.headers[0]).toBe('T (°C)');
  });

  it('column letters run A…Z, AA…', () => {
    expect([0, 25, 26, 27, 701, 702].map(columnLetter)).toEqual(['A', 'Z', 'AA', 'AB', 'ZZ', 'AAA']);
  });
});

describe('parseUpload: files that cannot be imported', () => {
  it('when the file is empty (0 bytes), then it says so', async () => {
    const err = await rejection(parseUpload({ name: 'screen.csv', buffer: Buffer.alloc(0) }), 400);
    expect(err).toBeInstanceOf(UnreadableFileError);
    expect(err.message).toBe('screen.csv is empty: there is nothing to import.');
  });

  it('when the file holds only a BOM and blank lines, then it is empty too', async () => {
    const err = await rejection(parseUpload(textFile('screen.csv', '\uFEFF\r\n \r\n')), 400);
    expect(err.message).toContain('is empty');
  });

  it('when the file has a header but no data rows, then it says which row the header is', async () => {
    const err = await rejection(parseText('sample,T (°C),ee (%)\n'), 400);
    expect(err.message).toBe('screen.csv has a header row (row 1) but no data rows below it.');
  });

  it('when a 200 MB file arrives, then it is refused with 413 naming its size and the limit', async () => {
    const huge = Buffer.alloc(200 * 1024 * 1024, 0x41);
    const err = await rejection(parseUpload({ name: 'plant-log.csv', buffer: huge }), 413);
    expect(err).toBeInstanceOf(PayloadTooLargeError);
    expect(err.message).toContain('plant-log.csv is 200.0 MB');
    expect(err.message).toContain(`${IMPORT_LIMITS.maxBytes / (1024 * 1024)}.0 MB`);
  });

  it('when a file has more rows than the limit, then it is refused with 413 naming both counts', async () => {
    const text = 'T (°C),ee (%)\n' + Array.from({ length: 6 }, (_, i) => `${i},90`).join('\n');
    const err = await rejection(parseText(text, {}, { ...IMPORT_LIMITS, maxRows: 5 }), 413);
    expect(err.message).toBe('screen.csv has 6 data rows; at most 5 can be imported at once. Split the file.');
  });

  it('when a PNG image is renamed .xlsx, then it is rejected as "not an Excel workbook: a PNG image"', async () => {
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0x0d, 0x49, 0x48, 0x44, 0x52]);
    const err = await rejection(parseUpload({ name: 'screen.xlsx', buffer: png }), 400);
    expect(err.message).toBe('screen.xlsx is not an Excel workbook: its content is a PNG image.');
  });

  it('when a CSV is renamed .xlsx, then the message suggests renaming it .csv', async () => {
    const err = await rejection(parseUpload(textFile('screen.xlsx', 'T,ee\n25,96\n')), 400);
    expect(err.message).toContain('not an Excel workbook');
    expect(err.message).toContain('plain text');
    expect(err.message).toContain('rename it .csv');
  });

  it('when a ZIP archive that is not a workbook is named .xlsx, then it is rejected clearly', async () => {
    // A one-entry ZIP (local header only) holding notes.txt: the magic bytes match, the content does not.
    const data = deflateRawSync(Buffer.from('not a workbook'));
    const nameBytes = Buffer.from('notes.txt');
    const header = Buffer.alloc(30);
    header.writeUInt32LE(0x04034b50, 0);
    header.writeUInt16LE(20, 4);
    header.writeUInt16LE(8, 8);
    header.writeUInt32LE(data.length, 18);
    header.writeUInt32LE(14, 22);
    header.writeUInt16LE(nameBytes.length, 26);
    const zip = Buffer.concat([header, nameBytes, data]);
    const err = await rejection(parseUpload({ name: 'screen.xlsx', buffer: zip }), 400);
    expect(err.message).toContain('is a ZIP archive but not a readable Excel workbook');
  });

  it('when an old .xls (or password-protected) workbook is named .xlsx, then it says how to save it', async () => {
    const ole = Buffer.concat([Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]), Buffer.alloc(512)]);
    const err = await rejection(parseUpload({ name: 'screen.xlsx', buffer: ole }), 400);
    expect(err.message).toContain('older .xls file or a password-protected workbook');
  });

  it('when the extension is neither CSV nor XLSX, then the accepted kinds are listed', async () => {
    const err = await rejection(parseUpload(textFile('screen.pdf', 'T,ee\n25,96\n')), 400);
    expect(err.message).toBe('screen.pdf: only .csv, .tsv, .txt and .xlsx files can be imported (this one ends in .pdf).');
    const xls = await rejection(parseUpload(textFile('screen.xls', 'x')), 400);
    expect(xls.message).toContain('old .xls format');
  });

  it('when a binary file is named .csv, then it is refused as not a text table', async () => {
    const err = await rejection(parseUpload({ name: 'screen.csv', buffer: Buffer.from([0x25, 0x50, 0x44, 0x46, 0, 1, 2, 3, 0, 0]) }), 400);
    expect(err.message).toBe('screen.csv is not a text table: its content is a PDF document.');
  });

  it('when a quoted field is never closed, then the line is named', async () => {
    const err = await rejection(parseText('T (°C),ee (%),notes\n25,96.5,ok\n0,97.9,"left open\n'), 400);
    expect(err.message).toMatch(/^screen\.csv could not be read at line \d+: a quoted field is opened but never closed\.$/);
  });

  it('when a table is wider than the column limit, then it is refused', async () => {
    const row = Array.from({ length: 8 }, (_, i) => `c${i}`).join(',');
    const err = await rejection(parseText(`${row}\n${row.replace(/c/g, '1')}\n`, {}, { ...IMPORT_LIMITS, maxColumns: 5 }), 400);
    expect(err.message).toBe('screen.csv has 8 columns; at most 5 can be read. Remove the columns you do not need.');
  });
});
