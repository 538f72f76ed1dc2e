/**
 * What one worker thread of the reading pool does with one upload: read it with `readUpload`
 * and answer with the table or the typed error as plain data (class instances do not cross
 * threads), plus the most memory the worker's heap held meanwhile, so tests and logs can see
 * what a hostile file cost.
 */
import type { MessagePort } from 'node:worker_threads';
import { getHeapStatistics } from 'node:v8';
import type { ImportMapping, ImportParseOptions } from '../campaigns/schemas';
import type { ImportPreview, StoredRowKeys } from './service';
import { AppError } from '../../lib/errors';
import type { ProblemTypeId } from '../../lib/problem-types';
import { readUpload, type ImportLimits, type ParsedTable } from './parse';
import { packRows, validateRowsInBatches, type IssueCounts, type PackedRows, type ValidationResult } from './row-checks';

export interface ReadTask {
  name: string;
  buffer: Uint8Array;
  options: ImportParseOptions;
  limits: ImportLimits;
}

export interface SerialisedError {
  type: ProblemTypeId;
  detail: string;
  errors?: { path: string; message: string }[];
  extra?: Record<string, unknown>;
}

export type ReadAnswer = ({ ok: true; table: ParsedTable } | { ok: false; error: SerialisedError }) & {
  /** Largest heap plus external memory of this worker seen while reading, in bytes. */
  peakMemoryBytes: number;
};

const heapNow = () => {
  const h = getHeapStatistics();
  return h.used_heap_size + h.external_memory;
};

export async function readInWorker(task: ReadTask): Promise<ReadAnswer> {
  let peak = heapNow();
  const sampler = setInterval(() => {
    peak = Math.max(peak, heapNow());
  }, 10);
  try {
    const buffer = Buffer.from(task.buffer.buffer, task.buffer.byteOffset, task.buffer.byteLength);
    const table = await readUpload({ name: task.name, buffer }, task.options, task.limits);
    return { ok: true, table, peakMemoryBytes: Math.max(peak, heapNow()) };
  } catch (err) {
    if (err instanceof AppError) {
      return { ok: false, error: serialise(err), peakMemoryBytes: Math.max(peak, heapNow()) };
    }
    throw err;
  } finally {
    clearInterval(sampler);
  }
}

function serialise(err: AppError): SerialisedError {
  return { type: err.type, detail: err.message, errors: err.errors, extra: err.extra };
}

export interface PreviewTask {
  name: string;
  buffer: Uint8Array;
  request: { mapping?: ImportMapping; parse?: ImportParseOptions };
  limits: ImportLimits;
  /** Keys of the campaign's stored runs, for the repeat warnings (plain data: the worker has no database). */
  stored?: StoredRowKeys;
}

export type PreviewAnswer = ({ ok: true; preview: ImportPreview } | { ok: false; error: SerialisedError }) & { peakMemoryBytes: number };

/**
 * A whole import preview (read, guess the mapping, check every row) in the worker: only the
 * small preview crosses back, so a 100 000-row file costs the event loop nothing.
 */
export async function previewInWorker(task: PreviewTask): Promise<PreviewAnswer> {
  const { previewImport } = await import('./service');
  try {
    const buffer = Buffer.from(task.buffer.buffer, task.buffer.byteOffset, task.buffer.byteLength);
    const preview = await previewImport({ name: task.name, buffer }, task.request, task.limits, task.stored);
    return { ok: true, preview, peakMemoryBytes: heapNow() };
  } catch (err) {
    if (err instanceof AppError) return { ok: false, error: serialise(err), peakMemoryBytes: heapNow() };
    throw err;
  }
}

export interface CheckTask {
  name: string;
  buffer: Uint8Array;
  request: { mapping: ImportMapping; parse?: ImportParseOptions };
  limits: ImportLimits;
  /** Where the checked rows go, a batch at a time, and finally the answer. */
  port: MessagePort;
  batchRows: number;
}

/** What `checkInWorker` found: the file's format, the issues and counts, and the rows after the last batch, packed by column. */
export interface CheckedFile {
  format: ParsedTable['format'];
  result: Omit<ValidationResult, 'rows'> & { packed: PackedRows };
}

export type CheckAnswer = ({ ok: true; checked: CheckedFile } | { ok: false; error: SerialisedError }) & { peakMemoryBytes: number };

/** Messages on a CheckTask's port: batches of checked rows, then the answer (its rows are the last batch). */
export type CheckMessage = ({ kind: 'rows'; packed: PackedRows } & IssueCounts) | { kind: 'done'; answer: CheckAnswer };

/**
 * The import's read and row checks in the worker. The checked rows go to the main thread packed by
 * column, in batches as they are checked (so the import writes them, in its transaction, while the
 * rest of the file is read), never the whole table of text cells.
 */
export async function checkInWorker(task: CheckTask): Promise<void> {
  const post = (message: CheckMessage, packed?: PackedRows) =>
    task.port.postMessage(message, packed ? [packed.numbers.buffer as ArrayBuffer] : []);
  try {
    const buffer = Buffer.from(task.buffer.buffer, task.buffer.byteOffset, task.buffer.byteLength);
    const table = await readUpload({ name: task.name, buffer }, task.request.parse ?? {}, task.limits);
    const { rows, ...rest } = validateRowsInBatches(table, task.request.mapping, task.batchRows, (batch, counts) => {
      const packed = packRows(batch);
      post({ kind: 'rows', packed, ...counts }, packed);
    });
    const packed = packRows(rows);
    post(
      { kind: 'done', answer: { ok: true, checked: { format: table.format, result: { ...rest, packed } }, peakMemoryBytes: heapNow() } },
      packed,
    );
  } catch (err) {
    if (!(err instanceof AppError)) throw err;
    post({ kind: 'done', answer: { ok: false, error: serialise(err), peakMemoryBytes: heapNow() } });
  } finally {
    task.port.close();
  }
}
