// Mutations of a valid request, driven by the route's zod schemas turned into JSON Schema
// (z.toJSONSchema): wrong types, missing and extra fields, huge strings, negative and NaN-like
// numbers, invalid UUIDs and dates, prototype-pollution keys. Deterministic, so a failure names
// the exact request to replay.
import { z } from 'zod';

export type JsonSchema = {
  type?: string | string[];
  properties?: Record<string, JsonSchema>;
  required?: string[];
  items?: JsonSchema;
  enum?: unknown[];
  const?: unknown;
  format?: string;
  anyOf?: JsonSchema[];
  oneOf?: JsonSchema[];
  allOf?: JsonSchema[];
};

/** The input JSON Schema of a zod schema, or null when it has no JSON Schema form. */
export function jsonSchemaOf(schema: z.ZodType | undefined): JsonSchema | null {
  if (!schema) return null;
  try {
    return z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' }) as JsonSchema;
  } catch {
    return null;
  }
}

/** The first object schema inside unions and intersections (what a body or query mostly is). */
function objectSchema(s: JsonSchema | null): JsonSchema | null {
  if (!s) return null;
  if (s.properties) return s;
  for (const alt of [...(s.anyOf ?? []), ...(s.oneOf ?? []), ...(s.allOf ?? [])]) {
    const o = objectSchema(alt);
    if (o) return o;
  }
  return null;
}

function typesOf(s: JsonSchema | undefined): string[] {
  if (!s) return [];
  if (s.type) return Array.isArray(s.type) ? s.type : [s.type];
  if (s.enum) return ['enum'];
  const alts = [...(s.anyOf ?? []), ...(s.oneOf ?? [])];
  return [...new Set(alts.flatMap((a) => typesOf(a)))];
}

const HUGE = 'x'.repeat(100_000);
const deep = (depth: number): unknown => (depth === 0 ? 1 : { a: deep(depth - 1) });

/** Values that should not pass a field of schema `s` (some may, by chance: then 2xx is fine). */
export function wrongValues(s: JsonSchema | undefined): unknown[] {
  const types = typesOf(s);
  const out: unknown[] = [null, HUGE];
  if (types.includes('number') || types.includes('integer')) out.push('12', 'NaN', -1, -1e308, 1e308, 0.5);
  if (types.includes('string')) {
    out.push(123, '', '\u0000', '💧\u202E', "'; DROP TABLE farms;--", '<script>alert(1)</script>', {});
    if (s?.format === 'uuid') out.push('not-a-uuid', '00000000-0000-0000-0000-00000000000g', '00000000-0000-0000-0000-000000000000');
    if (s?.format === 'date-time' || s?.format === 'date') out.push('2026-02-30T00:00:00Z', '2026-02-30', 'yesterday', '+275760-09-13T00:00:00.000Z', '0000-00-00');
  }
  if (types.includes('boolean')) out.push('true', 1, 'yes');
  if (types.includes('array')) out.push({}, 'x', [null], Array.from({ length: 5000 }, () => 'x'));
  if (types.includes('object')) out.push('x', [], { __proto__: null, constructor: { prototype: { polluted: true } } });
  if (types.includes('enum')) out.push('not-a-choice', 0, String(s?.enum?.[0] ?? '').toUpperCase() + ' ');
  if (!types.length) out.push('x', -1, [], {});
  return out;
}

export type Mutation = { name: string; body?: unknown; rawBody?: string; contentType?: string; query?: Record<string, unknown>; params?: Record<string, string> };

const clone = <T>(v: T): T => (v === undefined ? v : (JSON.parse(JSON.stringify(v)) as T));

/** Body mutations of a valid example body, by field (two levels deep) and as a whole. */
export function bodyMutations(schema: z.ZodType | undefined, example: unknown): Mutation[] {
  const out: Mutation[] = [];
  const js = objectSchema(jsonSchemaOf(schema));
  const base = (example && typeof example === 'object' && !Array.isArray(example) ? example : {}) as Record<string, unknown>;
  const fields = Object.entries(js?.properties ?? {});
  for (const [key, s] of fields) {
    for (const [i, v] of wrongValues(s).entries()) out.push({ name: `body.${key} wrong #${i}`, body: { ...clone(base), [key]: v } });
    if (js?.required?.includes(key)) {
      const b = clone(base);
      delete b[key];
      out.push({ name: `body.${key} missing`, body: b });
    }
    // One level further down: fields of a nested object, and the first item of an array of objects.
    const nested = objectSchema(s) ?? objectSchema(s.items ?? null);
    if (nested) {
      for (const [sub, ss] of Object.entries(nested.properties ?? {}).slice(0, 6)) {
        for (const v of wrongValues(ss).slice(0, 4)) {
          const b = clone(base);
          const holder = Array.isArray(b[key]) ? [{ ...((b[key] as unknown[])[0] as object), [sub]: v }] : { ...((b[key] as object) ?? {}), [sub]: v };
          out.push({ name: `body.${key}.${sub} wrong`, body: { ...b, [key]: holder } });
        }
      }
    }
  }
  out.push(
    { name: 'body extra field', body: { ...clone(base), extraFieldNobodyDeclared: 1 } },
    { name: 'body __proto__ key', rawBody: JSON.stringify(base).replace(/^\{/, '{"__proto__":{"isAdmin":true,"role":"admin"},').replace(',}', '}') },
    { name: 'body constructor.prototype key', rawBody: JSON.stringify(base).replace(/^\{/, '{"constructor":{"prototype":{"isAdmin":true}},').replace(',}', '}') },
    { name: 'body empty object', body: {} },
    { name: 'body every field deeply nested', body: Object.fromEntries(fields.map(([k]) => [k, deep(40)])) },
    { name: 'body array', rawBody: '[]' },
    { name: 'body array of the example', rawBody: JSON.stringify([base]) },
    { name: 'body string', rawBody: '"x"' },
    { name: 'body number', rawBody: '123' },
    { name: 'body null', rawBody: 'null' },
    { name: 'body malformed JSON', rawBody: '{"a":' },
    { name: 'body deep nesting', rawBody: `${'{"a":'.repeat(3000)}1${'}'.repeat(3000)}` },
    { name: 'body over 1 MB', rawBody: JSON.stringify({ ...base, padding: 'x'.repeat(1_100_000) }) },
    { name: 'body as text/plain', rawBody: JSON.stringify(base), contentType: 'text/plain' },
    { name: 'body as form', rawBody: 'a=1&b=2', contentType: 'application/x-www-form-urlencoded' },
    { name: 'body declared utf-16', rawBody: JSON.stringify(base), contentType: 'application/json; charset=utf-16' },
  );
  return out;
}

/** Query mutations: every declared parameter with junk, repeated, and unknown parameters added. */
export function queryMutations(schema: z.ZodType | undefined, example: Record<string, unknown> | undefined): Mutation[] {
  const out: Mutation[] = [];
  const js = objectSchema(jsonSchemaOf(schema));
  const base = { ...(example ?? {}) };
  for (const [key, s] of Object.entries(js?.properties ?? {})) {
    const junk: unknown[] = ['NaN', '-1', '1e309', '-1e309', '0.5', '', 'x'.repeat(10_000), 'not-a-uuid', '2026-02-30T00:00:00Z', ['a', 'b'], 'true', '%00'];
    if (typesOf(s).includes('enum')) junk.push('NOT_A_CHOICE');
    for (const [i, v] of junk.entries()) out.push({ name: `query.${key} #${i}`, query: { ...base, [key]: v } });
    if (js?.required?.includes(key)) {
      const q = { ...base };
      delete q[key];
      out.push({ name: `query.${key} missing`, query: q });
    }
  }
  out.push({ name: 'query unknown parameters', query: { ...base, __proto__x: '1', constructor: 'x', limit: '-1', offset: 'NaN', from: 'yesterday' } });
  return out;
}

/** Path parameter mutations: malformed ids of every kind. */
export function paramMutations(params: Record<string, string> | undefined): Mutation[] {
  const out: Mutation[] = [];
  const junk = ['not-a-uuid', 'x'.repeat(3000), '00000000-0000-0000-0000-000000000000', '../../etc/passwd', '\u0000', "1' OR '1'='1", '💧', '-1', 'NaN', '__proto__'];
  for (const key of Object.keys(params ?? {})) {
    for (const [i, v] of junk.entries()) out.push({ name: `params.${key} #${i}`, params: { ...params, [key]: v } });
  }
  return out;
}
