import type { Response } from 'express';

/**
 * A computed answer (POST /fit, /forecast, /plan, …) sent as JSON, member by member.
 *
 * One `JSON.stringify` of a whole answer yields a two-byte string as soon as any text in it is
 * outside Latin-1 (ΔΔG‡, −, ≥ in notes and captions): the number-heavy members (predictions,
 * residuals, curves) would then take twice the memory and the slow path of UTF-8 encoding, and a
 * 70 kB answer would become a 140 kB string in V8's large-object space. Each top-level member is
 * therefore serialised on its own and stays a one-byte string where it can (see jsonPieces); the pieces are written
 * to the socket in one corked write, encoded straight into it (no Buffer per piece, no copy into
 * one), and the bytes are exactly those of `JSON.stringify(body)`.
 *
 * No ETag: a POST answer is never revalidated, and hashing 40–70 kB per call was a measurable
 * share of a calculation's time (res.json hashes every body).
 *
 * Plain `JSON.stringify`. Serialisers compiled from the response schemas (fast-json-stringify)
 * were tried and removed: they build each number's text as a heap string through V8's
 * number-to-string cache, so they looked twice as fast as JSON.stringify when a benchmark sent one
 * body over and over (the cache answered), and were twice as slow on the new numbers of every real
 * screen (700 against 370 µs for a fit of 50 runs with 60 predictions).
 */
export function sendComputed(res: Response, body: unknown): void {
  const pieces = jsonPieces(body);
  let length = 0;
  for (const piece of pieces) length += Buffer.byteLength(piece, 'utf8');
  res.setHeader('content-type', 'application/json; charset=utf-8');
  res.setHeader('content-length', length);
  res.cork();
  for (const piece of pieces) res.write(piece, 'utf8');
  res.end();
  res.uncork();
}

/** Member texts at least this long go out as pieces of their own; shorter ones join the text around them. */
const OWN_PIECE_FROM = 512;

/**
 * `JSON.stringify(body)` as consecutive pieces: each long member's text on its own, exactly as
 * JSON.stringify returned it, and the keys, punctuation and short members between them joined.
 * A long text is never concatenated: `"key":` + 40 kB is a rope that writing it flattens into a
 * second 40 kB copy.
 */
export function jsonPieces(body: unknown): string[] {
  if (body === null || typeof body !== 'object' || Array.isArray(body) || typeof (body as { toJSON?: unknown }).toJSON === 'function') {
    return [JSON.stringify(body) ?? 'null'];
  }
  const record = body as Record<string, unknown>;
  const pieces: string[] = [];
  let frame = '{';
  let first = true;
  for (const key of Object.keys(record)) {
    const text = JSON.stringify(record[key]);
    // Members JSON leaves out (undefined, functions, symbols) are left out here too.
    if (text === undefined) continue;
    frame += `${first ? '' : ','}${JSON.stringify(key)}:`;
    first = false;
    if (text.length < OWN_PIECE_FROM) {
      frame += text;
    } else {
      pieces.push(frame, text);
      frame = '';
    }
  }
  pieces.push(`${frame}}`);
  return pieces;
}
