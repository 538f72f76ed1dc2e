/**
 * What one worker thread of the reading pool does with one upload: read it with `readUpload`
 * and answer with the table or the typed error as plain data (class instances do not cross
 * threads), plus the most memory the worker's heap held meanwhile, so tests and logs can see
 * what a hostile file cost.
 */
import { getHeapStatistics } from 'node:v8';
import type { ImportParseOptions } from '../campaigns/schemas';
import { AppError } from '../../lib/errors';
import { readUpload, type ImportLimits, type ParsedTable } from './parse';

export interface ReadTask {
  name: string;
  buffer: Uint8Array;
  options: ImportParseOptions;
  limits: ImportLimits;
}

export interface SerialisedError {
  status: number;
  title: string;
  detail: string;
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
      return { ok: false, error: { status: err.status, title: err.title, detail: err.message }, peakMemoryBytes: Math.max(peak, heapNow()) };
    }
    throw err;
  } finally {
    clearInterval(sampler);
  }
}
