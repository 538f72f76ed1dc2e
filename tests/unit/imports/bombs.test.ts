import { afterAll, describe, expect, it } from 'vitest';
import { IMPORT_LIMITS, parseUpload } from '../../../api/features/imports/parse';
import { closeReadPool, runInPool } from '../../../api/features/imports/parse-pool';
import { checkZipDirectory, inspectZip, ZIP_LIMITS } from '../../../api/features/imports/zip-guard';
import { lyingBombWorkbook, manyRowsWorkbook, nulWorkbook, ratioBombWorkbook } from '../../support/xlsx-bombs';
import { rejection, textFile } from './helpers';

const MB = 1024 * 1024;

afterAll(() => closeReadPool());

describe('workbook archives that expand beyond the limits', () => {
  it('when a sheet declares 100 MB packed into under 1 MB, then the central directory alone refuses it', async () => {
    const bomb = ratioBombWorkbook(100);
    expect(bomb.length).toBeLessThan(MB);
    const err = await rejection(checkZipDirectory('bomb.xlsx', bomb), 413);
    expect(err.message).toMatch(/^bomb\.xlsx would expand to \d+ times its packed size in xl\/worksheets\/sheet1\.xml/);
  });

  it('when a sheet declares more than the per-part limit, then it is refused before inflating', async () => {
    const err = await rejection(checkZipDirectory('big.xlsx', ratioBombWorkbook(1), { ...ZIP_LIMITS, maxEntryBytes: 512 * 1024 }), 413);
    expect(err.message).toContain('in one part (xl/worksheets/sheet1.xml)');
  });

  it('when the directory understates a sheet that inflates to 300 MB, then counting stops it at the declared size', async () => {
    const liar = lyingBombWorkbook(300);
    await checkZipDirectory('liar.xlsx', liar).then(({ zip }) => zip.close()); // passes the declared-size checks
    const err = await rejection(inspectZip('liar.xlsx', liar), 413);
    expect(err.message).toContain('would expand to more than it declares');
  });

  it('when an honest archive is inspected, then the inflated bytes equal the declared ones', async () => {
    const summary = await inspectZip('fine.xlsx', manyRowsWorkbook(200));
    expect(summary.entries).toBe(6);
    expect(summary.inflatedBytes).toBe(summary.declaredBytes);
  });

  it('when the bomb reaches the reading worker, then it answers 413 and the worker heap stays small', async () => {
    const answer = await runInPool({ name: 'bomb.xlsx', buffer: ratioBombWorkbook(100) }, {}, IMPORT_LIMITS);
    expect(answer.ok).toBe(false);
    if (answer.ok) return;
    expect(answer.error.type).toBe('payload-too-large');
    // Measured inside the worker: its heap plus external memory, never near the 100 MB the sheet would inflate to
    // (the worker's baseline with the reader loaded is about 70 MB).
    expect(answer.peakMemoryBytes).toBeLessThan(160 * MB);
  });
});

describe('workbooks with more rows than the limit', () => {
  it('when a sheet has 400 000 rows and the limit is 20 000, then reading stops at the limit with 413 and bounded memory', async () => {
    const limits = { ...IMPORT_LIMITS, maxRows: 20_000 };
    const answer = await runInPool({ name: 'plant-log.xlsx', buffer: manyRowsWorkbook(400_000) }, {}, limits);
    expect(answer.ok).toBe(false);
    if (answer.ok) return;
    expect(answer.error).toMatchObject({
      type: 'payload-too-large',
      // "more than", not a count: the reader never saw the end of the sheet.
      detail:
        'plant-log.xlsx (worksheet "Screen") has more than 20000 rows; at most 20000 data rows can be imported at once. Split the file.',
    });
    expect(answer.peakMemoryBytes).toBeLessThan(200 * MB);
  });

  it('when a sheet is just within the limit, then every row is read with its spreadsheet row number', async () => {
    const table = await parseUpload({ name: 'screen.xlsx', buffer: manyRowsWorkbook(300) }, {}, { ...IMPORT_LIMITS, maxRows: 300 });
    expect(table.rows).toHaveLength(300);
    expect(table.headers).toEqual(['T (°C)', 'ee (%)']);
    expect(table.rows[299]).toEqual({ rowNumber: 301, cells: [(301 % 80) - 40, 91.5] });
  });
});

describe('files with NUL characters', () => {
  it('when a CSV has a NUL byte after its first 4 KB, then it is refused with 400 naming the line', async () => {
    const rows = Array.from({ length: 400 }, (_, i) => `${i % 50},9${i % 10}.5,run ${i}`);
    rows[300] = '12,93.5,bad\u0000note';
    const err = await rejection(parseUpload(textFile('screen.csv', `T (°C),ee (%),notes\n${rows.join('\n')}\n`)), 400);
    expect(err.message).toBe(
      'screen.csv contains a NUL character (a zero byte) at line 302; a text table cannot hold one. Remove it, or export the table again.',
    );
  });

  it('when a workbook cell holds a NUL character, then it is refused with 400', async () => {
    const err = await rejection(parseUpload({ name: 'screen.xlsx', buffer: nulWorkbook() }), 400);
    expect(err.message).toMatch(/^screen\.xlsx/);
  });
});
