import type { Response } from 'express';

/**
 * JSON for large computed answers, as bytes.
 *
 * One `JSON.stringify` of a whole answer yields a two-byte string as soon as any text in it is
 * outside Latin-1 (ΔΔG‡, −, ≥ in notes and captions): the number-heavy members (predictions,
 * residuals, curves) then take twice the memory and the slow path of UTF-8 encoding, and a 70 kB
 * answer becomes a 140 kB string that V8 puts in large-object space. Serialising each top-level
 * member on its own keeps those members one-byte strings; the bytes are identical to
 * `Buffer.from(JSON.stringify(body))`.
 */
export function jsonBytes(body: unknown): Buffer {
  if (body === null || typeof body !== 'object' || Array.isArray(body) || typeof (body as { toJSON?: unknown }).toJSON === 'function') {
    return Buffer.from(JSON.stringify(body) ?? 'null', 'utf8');
  }
  const record = body as Record<string, unknown>;
  const chunks: Buffer[] = [];
  let open = '{';
  for (const key of Object.keys(record)) {
    const text = JSON.stringify(record[key]);
    // Members JSON leaves out (undefined, functions, symbols) are left out here too.
    if (text === undefined) continue;
    chunks.push(Buffer.from(`${open}${JSON.stringify(key)}:${text}`, 'utf8'));
    open = ',';
  }
  chunks.push(Buffer.from(open === '{' ? '{}' : '}', 'utf8'));
  return Buffer.concat(chunks);
}

/**
 * A computed answer (POST /fit, /forecast, /plan, …) as JSON. No ETag: a POST answer is never
 * revalidated, and hashing 40–70 kB per call was a measurable share of a calculation's time
 * (res.json hashes every body).
 */
export function sendComputed(res: Response, body: unknown): void {
  const bytes = jsonBytes(body);
  res.setHeader('content-type', 'application/json; charset=utf-8');
  res.setHeader('content-length', bytes.length);
  res.end(bytes);
}
