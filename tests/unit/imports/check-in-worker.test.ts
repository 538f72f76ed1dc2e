import { afterAll, describe, expect, it } from 'vitest';
import { packRows, unpackRows, validateRows, type ImportRow } from '../../../api/features/imports/row-checks';
import { IMPORT_LIMITS, IN_THREAD_MAX_BYTES, readUpload, readsInWorker } from '../../../api/features/imports/parse';
import { checkInPool, closeReadPool } from '../../../api/features/imports/parse-pool';
import type { UploadedFile } from '../../../api/features/imports/parse';
import { importMappingSchema } from '../../../api/features/campaigns/schemas';

afterAll(() => closeReadPool());

const mapping = importMappingSchema.parse({
  columns: { sampleId: 0, replicateLabel: 1, temperature: 2, value: 3, uncertainty: 4, conversionPercent: 5, reactionTime: 6, notes: 7 },
  temperatureUnit: 'C',
  measure: 'dr',
});

/** An invented dr screen: some rows without uncertainty, conversion, time or notes, some reported as bounds. */
function screen(rows: number): Buffer {
  const lines = ['sample,replicate,T (°C),dr,sd,conversion (%),time (h),notes'];
  for (let i = 0; i < rows; i++) {
    const value = i % 11 === 0 ? `≥ ${20 + (i % 7)}:1` : `${(5 + (i % 40) / 4).toFixed(2)}:1`;
    lines.push(
      [
        i % 13 === 0 ? '' : `IV-${i}`,
        i % 5 === 0 ? '' : String.fromCharCode(97 + (i % 3)),
        -70 + (i % 90),
        value,
        i % 3 === 0 ? '' : '0.2',
        i % 4 === 0 ? '' : String(80 + (i % 20)),
        i % 6 === 0 ? '' : String(1 + (i % 12)),
        i % 17 === 0 ? '"quenched, then ""warm"""' : '',
      ].join(','),
    );
  }
  return Buffer.from(lines.join('\n') + '\n');
}

/** The worker's check of `file`, its batches of rows collected and packed again as one. */
async function checkThere(file: UploadedFile) {
  const rows: ImportRow[] = [];
  const { format, result } = await checkInPool(file, { mapping }, IMPORT_LIMITS, async (batch) => void rows.push(...batch));
  return { format, result: { ...result, packed: packRows(rows) } };
}

describe('row checks in the reading worker', () => {
  it('when checked rows are packed for the trip between threads and unpacked, then every field comes back the same, nulls included', async () => {
    const rows = validateRows(await readUpload({ name: 's.csv', buffer: screen(400) }), mapping).rows;
    expect(rows.some((r) => r.isLowerBound)).toBe(true);
    expect(rows.some((r) => r.uncertainty === null && r.sampleId === null && r.notes === null)).toBe(true);
    expect(rows.some((r) => r.valueB !== null)).toBe(true);
    expect(unpackRows(packRows(rows))).toEqual(rows);
    expect(unpackRows(packRows([]))).toEqual([] as ImportRow[]);
  });

  it('when a large file is checked in the worker, then its rows, issues and counts equal the check in this thread', async () => {
    const file = { name: 'large.csv', buffer: screen(10_000) };
    expect(file.buffer.length).toBeGreaterThan(IN_THREAD_MAX_BYTES);
    expect(readsInWorker(file)).toBe(true);
    const here = validateRows(await readUpload(file), mapping);
    const there = await checkThere(file);
    expect(there.format).toBe('csv');
    const { packed, ...counts } = there.result;
    expect(unpackRows(packed)).toEqual(here.rows);
    expect(counts).toEqual({ issues: here.issues, errorCount: here.errorCount, warningCount: here.warningCount, rowCount: here.rowCount });
    expect(here.rows).toHaveLength(10_000);
  });

  it('when the worker finds a problem in a row, then it comes back as the same issue and no rows are lost from the counts', async () => {
    const text = screen(10_000)
      .toString()
      .replace(/\n(IV-8,[^,]*,)[^,]*,/, '\n$1warm,');
    const file = { name: 'bad.csv', buffer: Buffer.from(text) };
    const here = validateRows(await readUpload(file), mapping);
    const there = await checkThere(file);
    expect(here.errorCount).toBeGreaterThan(0);
    expect(there.result.errorCount).toBe(here.errorCount);
    expect(there.result.issues).toEqual(here.issues);
  });
});
