import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { expect } from 'vitest';
import { AppError } from '../../../api/lib/errors';
import { parseUpload, type ImportLimits, IMPORT_LIMITS } from '../../../api/features/imports/parse';
import type { ImportParseOptions } from '../../../api/features/campaigns/schemas';

const samplesDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../../samples');

export function sample(name: string): { name: string; buffer: Buffer } {
  return { name, buffer: readFileSync(path.join(samplesDir, name)) };
}

export function textFile(name: string, text: string): { name: string; buffer: Buffer } {
  return { name, buffer: Buffer.from(text, 'utf8') };
}

export function parseText(text: string, options: ImportParseOptions = {}, limits: ImportLimits = IMPORT_LIMITS) {
  return parseUpload(textFile('screen.csv', text), options, limits);
}

/** Await `promise`, expect it to reject with an AppError of `status`, and return that error. */
export async function rejection(promise: Promise<unknown>, status: number): Promise<AppError> {
  try {
    await promise;
  } catch (err) {
    expect(err).toBeInstanceOf(AppError);
    expect((err as AppError).status).toBe(status);
    return err as AppError;
  }
  throw new Error('expected the promise to reject');
}
