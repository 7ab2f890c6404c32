export interface DiffRow {
  key: string;
  before: unknown;
  after: unknown;
  changed: boolean;
}

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

/** The fields of an audit entry, changed ones first (in the order the server wrote them). */
export function diffRows(before: Record<string, unknown> | null, after: Record<string, unknown> | null): DiffRow[] {
  const keys = [...new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})])];
  const rows = keys.map((key) => {
    const b = before ? before[key] : undefined;
    const a = after ? after[key] : undefined;
    return { key, before: b, after: a, changed: before !== null && after !== null && !same(b, a) };
  });
  return [...rows.filter((r) => r.changed), ...rows.filter((r) => !r.changed)];
}

/** A value as short text: numbers and strings as they are, anything else as compact JSON. */
export function show(v: unknown, max = 240): string {
  if (v === undefined) return '';
  if (v === null) return '—';
  if (typeof v === 'string') return v.length > max ? `${v.slice(0, max)}…` : v;
  if (typeof v === 'number' || typeof v === 'boolean') return String(v);
  const s = JSON.stringify(v);
  return s.length > max ? `${s.slice(0, max)}…` : s;
}
