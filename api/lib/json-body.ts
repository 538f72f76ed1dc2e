import type { Response } from 'express';
import fastJson from 'fast-json-stringify';
import { z } from 'zod';

/**
 * JSON for large computed answers, as bytes.
 *
 * One `JSON.stringify` of a whole answer yields a two-byte string as soon as any text in it is
 * outside Latin-1 (ΔΔG‡, −, ≥ in notes and captions): the number-heavy members (predictions,
 * residuals, curves) then take twice the memory and the slow path of UTF-8 encoding, and a 70 kB
 * answer becomes a 140 kB string that V8 puts in large-object space. Serialising each top-level
 * member on its own keeps those members one-byte strings; without `writers` the bytes are identical
 * to `Buffer.from(JSON.stringify(body))`. `writers`, when given, serialise the members they name
 * (the same JSON, keys in the schema's order).
 */
export function jsonBytes(body: unknown, writers?: ReadonlyMap<string, (value: unknown) => string>): Buffer {
  if (body === null || typeof body !== 'object' || Array.isArray(body) || typeof (body as { toJSON?: unknown }).toJSON === 'function') {
    return Buffer.from(JSON.stringify(body) ?? 'null', 'utf8');
  }
  const record = body as Record<string, unknown>;
  const chunks: Buffer[] = [];
  let open = '{';
  for (const key of Object.keys(record)) {
    const value = record[key];
    const write = value === undefined ? undefined : writers?.get(key);
    const text = write ? write(value) : JSON.stringify(value);
    // Members JSON leaves out (undefined, functions, symbols) are left out here too.
    if (text === undefined) continue;
    chunks.push(Buffer.from(`${open}${JSON.stringify(key)}:${text}`, 'utf8'));
    open = ',';
  }
  chunks.push(Buffer.from(open === '{' ? '{}' : '}', 'utf8'));
  return Buffer.concat(chunks);
}

type Writer = (value: unknown) => string;
type JsonSchemaNode = { $ref?: string; properties?: Record<string, unknown>; definitions?: Record<string, unknown> };

/**
 * Serialisers for the members of a response, compiled once (on first use) from its zod schema
 * with fast-json-stringify: code generated for the known shape of predictions and residuals writes
 * them in about half the time `JSON.stringify` takes. The JSON Schema is draft-07, the dialect of the
 * Ajv that fast-json-stringify runs to pick a union's branch (tuples as `items: [...]`).
 *
 * A compiled serialiser writes only the properties the schema declares and writes 0 for a null
 * in a field declared a number. `sendComputed` therefore compares each answer with `JSON.stringify`
 * under NODE_ENV=test (every API test of a calculator runs through it), and in production falls
 * back to `JSON.stringify` when a serialiser throws (a NaN where a number is declared). Members
 * with no compiled serialiser (unions, see below) are written by `JSON.stringify`.
 */
export function memberWriters(schema: z.ZodType): () => ReadonlyMap<string, Writer> {
  const known = compiledFor.get(schema);
  if (known) return known;
  let writers: Map<string, Writer> | null = null;
  const get = () => {
    if (writers) return writers;
    const json = z.toJSONSchema(schema, { io: 'output', target: 'draft-7', unrepresentable: 'any' }) as JsonSchemaNode;
    const definitions = withoutNullUnions(json.definitions ?? {}) as Record<string, unknown>;
    const root = (json.$ref ? definitions[json.$ref.replace('#/definitions/', '')] : withoutNullUnions(json)) as JsonSchemaNode | undefined;
    if (!root?.properties) throw new Error('memberWriters: the response schema is not an object');
    const compiled = new Map<string, Writer>();
    for (const [key, member] of Object.entries(root.properties)) {
      // A union left after that (a discriminated union) would run Ajv per answer: JSON.stringify is quicker.
      if (hasUnion(member, definitions, new Set())) continue;
      compiled.set(key, fastJson({ ...(member as object), definitions } as Parameters<typeof fastJson>[0]) as Writer);
    }
    writers = compiled;
    return writers;
  };
  compiledFor.set(schema, get);
  return get;
}

/** One compilation per response schema, however many routers serve it. */
const compiledFor = new WeakMap<z.ZodType, () => ReadonlyMap<string, Writer>>();

/**
 * zod's nullable (`anyOf: [S, {type: 'null'}]`) as S with OpenAPI's `nullable: true` (null added to
 * an enum): fast-json-stringify would otherwise run Ajv on every nullable field to pick a branch.
 */
function withoutNullUnions(node: unknown): unknown {
  if (Array.isArray(node)) return node.map(withoutNullUnions);
  if (node === null || typeof node !== 'object') return node;
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(node)) out[key] = withoutNullUnions(value);
  const anyOf = out.anyOf as Record<string, unknown>[] | undefined;
  if (!Array.isArray(anyOf) || anyOf.length !== 2) return out;
  const isNull = (x: Record<string, unknown>) => x.type === 'null' && Object.keys(x).length === 1;
  const other = anyOf.find((x) => !isNull(x));
  if (!other || !anyOf.some(isNull) || typeof other.type !== 'string') return out;
  const { anyOf: _union, ...rest } = out;
  return { ...rest, ...other, ...(Array.isArray(other.enum) ? { enum: [...(other.enum as unknown[]), null] } : {}), nullable: true };
}

function hasUnion(node: unknown, definitions: Record<string, unknown>, seen: Set<string>): boolean {
  if (Array.isArray(node)) return node.some((x) => hasUnion(x, definitions, seen));
  if (node === null || typeof node !== 'object') return false;
  const record = node as Record<string, unknown>;
  if ('anyOf' in record || 'oneOf' in record) return true;
  if (typeof record.$ref === 'string') {
    const name = record.$ref.replace('#/definitions/', '');
    if (seen.has(name)) return false;
    seen.add(name);
    if (hasUnion(definitions[name], definitions, seen)) return true;
  }
  return Object.values(record).some((x) => hasUnion(x, definitions, seen));
}

const checkAgainstJson = process.env.NODE_ENV === 'test';

/**
 * A computed answer (POST /fit, /forecast, /plan, …) as JSON, its members written by the
 * serialisers compiled from the route's response schema. No ETag: a POST answer is never
 * revalidated, and hashing 40–70 kB per call was a measurable share of a calculation's time
 * (res.json hashes every body).
 */
export function sendComputed(res: Response, body: unknown, writers?: () => ReadonlyMap<string, Writer>): void {
  let bytes: Buffer;
  try {
    bytes = jsonBytes(body, writers?.());
  } catch (err) {
    if (checkAgainstJson) throw err;
    bytes = jsonBytes(body);
  }
  if (checkAgainstJson && writers) assertSameJson(bytes, body);
  res.setHeader('content-type', 'application/json; charset=utf-8');
  res.setHeader('content-length', bytes.length);
  res.end(bytes);
}

/** Tests only: the compiled serialisers must say what JSON.stringify says (key order aside). */
function assertSameJson(bytes: Buffer, body: unknown): void {
  const difference = firstDifference(JSON.parse(bytes.toString('utf8')), JSON.parse(JSON.stringify(body)), '');
  if (difference !== null) throw new Error(`compiled JSON serialiser differs from JSON.stringify at ${difference || '(root)'}`);
}

function firstDifference(a: unknown, b: unknown, path: string): string | null {
  if (a === b) return null;
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null || Array.isArray(a) !== Array.isArray(b)) return path;
  for (const key of new Set([...Object.keys(a), ...Object.keys(b)])) {
    const found = firstDifference((a as Record<string, unknown>)[key], (b as Record<string, unknown>)[key], `${path}/${key}`);
    if (found !== null) return found;
  }
  return null;
}
