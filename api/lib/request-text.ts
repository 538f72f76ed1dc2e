import type { IncomingMessage } from 'node:http';
import type { RequestHandler } from 'express';
import { BadRequestError, type FieldError } from './errors';

const NUL = '\u0000';
const MAX_LISTED = 20;

/** Paths of every string in `value` that holds a NUL character (PostgreSQL text cannot store one). */
function nulPaths(value: unknown, path: string[], found: string[], depth = 0): void {
  if (found.length >= MAX_LISTED || depth > 64) return;
  if (typeof value === 'string') {
    if (value.includes(NUL)) found.push(path.join('.') || '(body)');
  } else if (Array.isArray(value)) {
    value.forEach((v, i) => nulPaths(v, [...path, String(i)], found, depth + 1));
  } else if (value !== null && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      if (k.includes(NUL)) found.push([...path, k.replaceAll(NUL, '\\0')].join('.'));
      nulPaths(v, [...path, k], found, depth + 1);
    }
  }
}

/** Whether any string (or key) in `value` holds a NUL: a walk that allocates nothing, for the common case of none. */
function hasNul(value: unknown, depth = 0): boolean {
  if (typeof value === 'string') return value.includes(NUL);
  if (value === null || typeof value !== 'object' || depth > 64) return false;
  if (Array.isArray(value)) {
    for (const v of value) if (hasNul(v, depth + 1)) return true;
    return false;
  }
  for (const k in value) {
    if (k.includes(NUL) || hasNul((value as Record<string, unknown>)[k], depth + 1)) return true;
  }
  return false;
}

/** JSON text can carry U+0000 only as this escape: a raw control character is not valid JSON. */
const NUL_ESCAPE = Buffer.from('\\u0000');
/** Set on a request whose UTF-8 JSON text holds no NUL escape, so its parsed body needs no walk. */
const JSON_TEXT_FREE_OF_NUL = Symbol('JSON text free of NUL');
type Marked = { [JSON_TEXT_FREE_OF_NUL]?: true };

/**
 * The JSON body parser's `verify` hook: one byte search of the raw text (memchr speed) instead of a
 * walk over every parsed string. Only a find means a walk (a text like `\\u0000`, an escaped
 * backslash, is found and then cleared by the walk); other encodings are always walked.
 */
export function markJsonTextFreeOfNul(req: IncomingMessage, _res: unknown, raw: Buffer, encoding: string): void {
  if (encoding === 'utf-8' && !raw.includes(NUL_ESCAPE)) (req as IncomingMessage & Marked)[JSON_TEXT_FREE_OF_NUL] = true;
}

export const NUL_MESSAGE = 'contains a NUL character (U+0000), which cannot be stored; remove it';

/**
 * Text every API route shares: no string anywhere in the body or the query may hold a NUL character, and a
 * query parameter given without a value (`?at=`) is refused rather than read as 0. Each problem names its field.
 */
export const checkRequestText: RequestHandler = (req, _res, next) => {
  const errors: FieldError[] = [];
  const bodyPaths: string[] = [];
  // Paths are worked out only when there is something to name.
  if ((req as Marked)[JSON_TEXT_FREE_OF_NUL] !== true && hasNul(req.body)) nulPaths(req.body, [], bodyPaths);
  errors.push(...bodyPaths.map((path) => ({ path, message: NUL_MESSAGE })));
  for (const [name, value] of Object.entries(req.query)) {
    const queryPaths: string[] = [];
    nulPaths(value, [name], queryPaths);
    errors.push(...queryPaths.map((path) => ({ path, message: NUL_MESSAGE })));
    if (value === '' || (Array.isArray(value) && value.includes(''))) {
      errors.push({ path: name, message: `${name} is empty; leave the parameter out or give it a value` });
    }
  }
  if (errors.length === 0) return next();
  next(
    new BadRequestError(
      `${errors.length === 1 ? 'A field has' : `${errors.length} fields have`} text the API does not accept: ${errors[0]!.path}: ${errors[0]!.message}.`,
      errors,
    ),
  );
};
