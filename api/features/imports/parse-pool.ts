/**
 * Uploaded spreadsheets are read in worker threads (a piscina pool) with V8 memory caps, so a
 * hostile file can at worst kill a worker, and a large one never holds the event loop that
 * answers everyone else. Small text files are read in the calling thread: a worker round trip
 * would cost more than they do.
 */
import path from 'node:path';
import { MessageChannel } from 'node:worker_threads';
import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';
import { AppError, PayloadTooLargeError } from '../../lib/errors';
import type { ImportMapping, ImportParseOptions } from '../campaigns/schemas';
import { UnreadableFileError } from './errors';
import { IMPORT_LIMITS, IN_THREAD_MAX_BYTES, type ImportLimits, type ParsedTable, type UploadedFile } from './parse';
import type { CheckAnswer, CheckMessage, CheckTask, PreviewAnswer, ReadAnswer, ReadTask, SerialisedError } from './parse-task';
import { unpackRows, type ImportRow, type IssueCounts, type ValidationResult } from './row-checks';
import type { ImportPreview, StoredRowKeys } from './service';

export interface ReadPoolOptions {
  /** Most worker threads (default 2: the machines this runs on have few cores). */
  maxThreads: number;
  /** V8 old-generation cap of each worker, in MB. */
  maxOldGenerationSizeMb: number;
  /** A read that takes longer is abandoned (its worker is ended) and answered 413. */
  timeoutMs: number;
}

export const READ_POOL_DEFAULTS: ReadPoolOptions = { maxThreads: 2, maxOldGenerationSizeMb: 384, timeoutMs: 30_000 };

const workerFile = path.join(path.dirname(fileURLToPath(import.meta.url)), 'parse-worker.mjs');

let pool: Piscina | null = null;
const poolOptions: ReadPoolOptions = READ_POOL_DEFAULTS;

function getPool(): Piscina {
  if (!pool) {
    pool = new Piscina({
      filename: workerFile,
      minThreads: 0,
      maxThreads: poolOptions.maxThreads,
      idleTimeout: 60_000,
      // The worker loads tsx itself; the parent's flags (vitest's, tsx's) are not passed on.
      execArgv: [],
      resourceLimits: { maxOldGenerationSizeMb: poolOptions.maxOldGenerationSizeMb, maxYoungGenerationSizeMb: 32, stackSizeMb: 4 },
    });
  }
  return pool;
}

/** Stop the workers (graceful shutdown, end of tests). */
export async function closeReadPool(): Promise<void> {
  const p = pool;
  pool = null;
  await p?.close({ force: true });
}

export interface WorkerRead {
  table: ParsedTable;
  peakMemoryBytes: number;
}

/**
 * Read `file` in a worker. Resolves with the table and the worker's peak memory; rejects with the
 * reader's own typed error (400/413), or with a 413 when the worker ran out of memory or time.
 */
export async function readInPool(
  file: UploadedFile,
  options: ImportParseOptions,
  limits: ImportLimits,
): Promise<WorkerRead & { error?: never }> {
  const answer = await runInPool(file, options, limits);
  if (!answer.ok) throw rebuildError(answer.error);
  return { table: answer.table, peakMemoryBytes: answer.peakMemoryBytes };
}

/** The worker's raw answer (tests read `peakMemoryBytes` of refused files from it). */
export async function runInPool(file: UploadedFile, options: ImportParseOptions, limits: ImportLimits): Promise<ReadAnswer> {
  const task: ReadTask = { name: file.name, buffer: file.buffer, options, limits };
  return (await runTask(file, task, 'default')) as ReadAnswer;
}

/**
 * The import preview of `file`, computed in a worker (small text files here). Errors as the
 * preview's own: 400/413 for the file, 413 when the worker ran out of memory or time.
 */
export async function previewInPool(
  file: UploadedFile,
  request: { mapping?: ImportMapping; parse?: ImportParseOptions },
  limits: ImportLimits = IMPORT_LIMITS,
  stored?: StoredRowKeys,
): Promise<ImportPreview> {
  if (file.buffer.length > limits.maxBytes || (!/\.xlsx$/i.test(file.name.trim()) && file.buffer.length <= IN_THREAD_MAX_BYTES)) {
    const { previewImport } = await import('./service');
    return previewImport(file, request, limits, stored);
  }
  const answer = (await runTask(file, { name: file.name, buffer: file.buffer, request, limits, stored }, 'preview')) as PreviewAnswer;
  if (!answer.ok) throw rebuildError(answer.error);
  return answer.preview;
}

/** Rows per batch the worker's check sends back (the import writes each batch with one COPY). */
export const CHECK_BATCH_ROWS = 10_000;

/**
 * Read `file` and check every row against `mapping` in a worker (the import of a large file or any
 * workbook), the checked rows handed to `take` in batches while the worker reads on (the last
 * batch after the worker is done). Errors as for `readInPool`. `take` runs for one batch at a time, in file order;
 * batches stop at the first row error. If `take` fails, no further batch is handed over and its
 * error is thrown once the worker has finished.
 */
export async function checkInPool(
  file: UploadedFile,
  request: { mapping: ImportMapping; parse?: ImportParseOptions },
  limits: ImportLimits,
  take: (rows: ImportRow[], counts: IssueCounts) => Promise<void>,
): Promise<{ format: ParsedTable['format']; result: Omit<ValidationResult, 'rows'> }> {
  const { port1, port2 } = new MessageChannel();
  let chain = Promise.resolve();
  let failure: { error: unknown } | null = null;
  const hand = (rows: ImportRow[], counts: IssueCounts) => {
    chain = chain.then(async () => {
      if (failure) return;
      try {
        await take(rows, counts);
      } catch (error) {
        failure = { error };
      }
    });
  };
  const answered = new Promise<CheckAnswer>((resolve) => {
    port1.on('message', (message: CheckMessage) => {
      if (message.kind === 'rows') hand(unpackRows(message.packed), message);
      else resolve(message.answer);
    });
  });
  try {
    const task: CheckTask = { name: file.name, buffer: file.buffer, request, limits, port: port2, batchRows: CHECK_BATCH_ROWS };
    const run = runTask(file, task, 'check', [port2]);
    // The answer comes on the port; the task itself settles after it, or fails (memory, time) without one.
    let answer: CheckAnswer;
    try {
      answer = await Promise.race([answered, run.then(() => answered)]);
    } catch (err) {
      await chain;
      throw err;
    }
    if (!answer.ok) {
      await chain;
      throw rebuildError(answer.error);
    }
    const { packed, ...result } = answer.checked.result;
    if (result.errorCount === 0) hand(unpackRows(packed), result);
    await chain;
    if (failure) throw (failure as { error: unknown }).error;
    return { format: answer.checked.format, result };
  } finally {
    port1.close();
  }
}

async function runTask(file: UploadedFile, task: unknown, name: string, transferList?: Transferable[]): Promise<unknown> {
  const signal = AbortSignal.timeout(poolOptions.timeoutMs);
  try {
    return await getPool().run(task, { signal, name, ...(transferList ? { transferList: transferList as never } : {}) });
  } catch (err) {
    const code = (err as { code?: string }).code;
    if (code === 'ERR_WORKER_OUT_OF_MEMORY') {
      throw new PayloadTooLargeError(
        `${file.name} needs more memory to read than a table of measurements should; it was not imported. Save it again, or as CSV.`,
      );
    }
    if (signal.aborted) {
      throw new PayloadTooLargeError(
        `${file.name} took longer than ${Math.round(poolOptions.timeoutMs / 1000)} s to read; it was not imported. Split it, or save it as CSV.`,
      );
    }
    throw new UnreadableFileError(`${file.name} could not be read.`);
  }
}

function rebuildError(e: SerialisedError): AppError {
  if (e.type === 'payload-too-large') return new PayloadTooLargeError(e.detail);
  if (e.type === 'unreadable-file') return new UnreadableFileError(e.detail);
  return new AppError(e.type, e.detail, e.errors ?? [], e.extra ?? {});
}
