import { z } from 'zod';

type JsonSchema = {
  $ref?: string;
  type?: string | string[];
  const?: unknown;
  anyOf?: JsonSchema[];
  oneOf?: JsonSchema[];
  properties?: Record<string, JsonSchema>;
  additionalProperties?: boolean | JsonSchema;
  items?: JsonSchema | JsonSchema[];
  definitions?: Record<string, JsonSchema>;
};

const compiled = new WeakMap<z.ZodType, JsonSchema>();

/**
 * The first field of `value` that `schema` does not declare (as a JSON pointer), or null. The
 * OpenAPI document is generated from the response schemas, so a field a route sends but its schema
 * leaves out is a field the API's users are never told about; JSON.stringify would send it without
 * a word. Only keys are checked, not types (the TypeScript types of the computations cover those).
 */
export function undeclaredField(schema: z.ZodType, value: unknown): string | null {
  let json = compiled.get(schema);
  if (!json) {
    json = z.toJSONSchema(schema, { io: 'output', target: 'draft-7', unrepresentable: 'any' }) as JsonSchema;
    compiled.set(schema, json);
  }
  const found = walk(json, value, '', json.definitions ?? {});
  return found === OTHER_TYPE ? null : found;
}

/** The value is not of the schema's type or tag: a union's branch that does not apply (types are not checked otherwise). */
const OTHER_TYPE = Symbol('other type');

const jsonType = (value: unknown) =>
  value === null ? 'null' : Array.isArray(value) ? 'array' : typeof value === 'number' ? 'number' : typeof value;

function walk(schema: JsonSchema, value: unknown, at: string, definitions: Record<string, JsonSchema>): string | null | typeof OTHER_TYPE {
  if (schema.$ref) return walk(definitions[schema.$ref.replace('#/definitions/', '')] ?? {}, value, at, definitions);
  const branches = schema.anyOf ?? schema.oneOf;
  if (branches) {
    const found = branches.map((b) => walk(b, value, at, definitions)).filter((f) => f !== OTHER_TYPE);
    return found.length === 0 ? OTHER_TYPE : found.includes(null) ? null : found[0]!;
  }
  if (schema.type !== undefined) {
    const types = Array.isArray(schema.type) ? schema.type : [schema.type];
    const kind = jsonType(value);
    if (!types.includes(kind) && !(kind === 'number' && types.includes('integer'))) return OTHER_TYPE;
  }
  // A discriminated union's tag: the branch whose tag the value carries is the one that applies.
  if ('const' in schema && schema.const !== value) return OTHER_TYPE;
  if (value !== null && typeof value === 'object' && !Array.isArray(value) && schema.properties) {
    for (const [key, sub] of Object.entries(schema.properties)) {
      if ('const' in sub && key in value && (value as Record<string, unknown>)[key] !== sub.const) return OTHER_TYPE;
    }
  }
  if (Array.isArray(value)) {
    const { items } = schema;
    if (!items) return null;
    for (let i = 0; i < value.length; i++) {
      const item = Array.isArray(items) ? items[i] : items;
      const found = item ? walk(item, value[i], `${at}/${i}`, definitions) : null;
      if (typeof found === 'string') return found;
    }
    return null;
  }
  if (value === null || typeof value !== 'object') return null;
  for (const [key, member] of Object.entries(value)) {
    if (member === undefined) continue;
    const declared = schema.properties?.[key];
    const extra = schema.additionalProperties;
    const sub = declared ?? (typeof extra === 'object' ? extra : extra === false ? null : {});
    if (sub === null) return `${at}/${key}`;
    const found = walk(sub, member, `${at}/${key}`, definitions);
    if (typeof found === 'string') return found;
  }
  return null;
}

const checking = process.env.NODE_ENV === 'test';

/**
 * Under NODE_ENV=test, throw when an answer carries a field its response schema does not declare:
 * every API test of a computed route then checks the route's documented shape.
 */
export function checkDeclaredInTests(schema: z.ZodType, value: unknown): void {
  if (!checking) return;
  const field = undeclaredField(schema, value);
  if (field !== null) throw new Error(`the answer has a field its response schema does not declare: ${field}`);
}
