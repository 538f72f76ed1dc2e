import type { z } from 'zod';
import { ApiError, type FieldError } from './api-client';

/** "measurements[3].selectivity" and "measurements.3.selectivity" are the same path. */
export function normalisePath(path: string): string {
  return path.replace(/\[(\d+)\]/g, '.$1').replace(/^\./, '');
}

/** Zod issues as field errors with dotted paths, the same shape the API answers with. */
export function zodFieldErrors(error: z.ZodError): FieldError[] {
  return error.issues.map((issue) => ({ path: issue.path.map(String).join('.'), message: issue.message }));
}

/**
 * The API starts some messages with the field's path ("measurements.1.temperature.value must be…");
 * beside the field itself, the quantity's name reads better.
 */
export function tidyMessage(path: string, message: string): string {
  const p = normalisePath(path);
  if (!p || !message.startsWith(p)) return message;
  const name =
    p
      .split('.')
      .filter((s) => s !== 'value' && !/^\d+$/.test(s))
      .pop() ?? 'value';
  return name + message.slice(p.length);
}

/** Messages for one field: errors at exactly `path` or nested below it. */
export function messagesFor(errors: FieldError[], path: string): string[] {
  return errors
    .filter((e) => {
      const p = normalisePath(e.path);
      return p === path || p.startsWith(`${path}.`);
    })
    .map((e) => tidyMessage(e.path, e.message));
}

/** Errors that belong to none of the given field paths (shown in a general alert). */
export function unmatchedErrors(errors: FieldError[], fieldPaths: string[]): FieldError[] {
  return errors.filter((e) => {
    const p = normalisePath(e.path);
    return !fieldPaths.some((f) => p === f || p.startsWith(`${f}.`));
  });
}

/** Field errors carried by an API error (empty for anything else). */
export function apiFieldErrors(error: unknown): FieldError[] {
  return error instanceof ApiError ? error.fieldErrors : [];
}

/** Check a request built from form text with its API schema: the request, or the field errors. */
export function validateRequest<T>(schema: z.ZodType<T>, candidate: unknown): { request: T | null; errors: FieldError[] } {
  const parsed = schema.safeParse(candidate);
  return parsed.success ? { request: parsed.data, errors: [] } : { request: null, errors: zodFieldErrors(parsed.error) };
}
