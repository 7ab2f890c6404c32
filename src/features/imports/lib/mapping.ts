import { dateOrders, importMappingSchema, type ImportMapping, type SuggestedMapping } from '@shared/schemas/imports.schema';

export type Choice = { mode: 'column' | 'fixed'; column: string; fixed: string };

/** The mapping as the form holds it: every field a string (empty = not used). */
export interface MappingDraft {
  unitCode: string;
  sampledMode: 'single' | 'split';
  sampledAt: string;
  dateColumn: string;
  timeColumn: string;
  dateOrder: (typeof dateOrders)[number];
  timeZone: string;
  analyte: Choice;
  method: Choice;
  basis: Choice;
  value: string;
  handheldPh: string;
  temperatureColumn: string;
  temperatureUnit: 'c' | 'f';
  handheldSalinityPpt: string;
  note: string;
}

type ColumnOr = { column: string } | { fixed: string } | null;
const choice = (c: ColumnOr): Choice =>
  c && 'column' in c
    ? { mode: 'column', column: c.column, fixed: '' }
    : c && 'fixed' in c
      ? { mode: 'fixed', column: '', fixed: c.fixed }
      : { mode: 'column', column: '', fixed: '' };

export function draftFrom(s: SuggestedMapping): MappingDraft {
  const split = s.sampledAt && 'dateColumn' in s.sampledAt ? s.sampledAt : null;
  return {
    unitCode: s.unitCode ?? '',
    sampledMode: split ? 'split' : 'single',
    sampledAt: s.sampledAt && 'column' in s.sampledAt ? s.sampledAt.column : '',
    dateColumn: split?.dateColumn ?? '',
    timeColumn: split?.timeColumn ?? '',
    dateOrder: s.dateOrder,
    timeZone: s.timeZone,
    analyte: choice(s.analyte),
    method: choice(s.method),
    basis: choice(s.basis),
    value: s.value ?? '',
    handheldPh: s.handheldPh ?? '',
    temperatureColumn: s.handheldTemperature?.column ?? '',
    temperatureUnit: s.handheldTemperature?.unit ?? 'c',
    handheldSalinityPpt: s.handheldSalinityPpt ?? '',
    note: s.note ?? '',
  };
}

const side = (c: Choice) => (c.mode === 'fixed' ? (c.fixed ? { fixed: c.fixed } : undefined) : c.column ? { column: c.column } : undefined);

/** The draft as the API's mapping; unused optional columns are left out. */
export function mappingBody(d: MappingDraft): Record<string, unknown> {
  return {
    unitCode: d.unitCode || undefined,
    sampledAt:
      d.sampledMode === 'split'
        ? d.dateColumn && d.timeColumn
          ? { dateColumn: d.dateColumn, timeColumn: d.timeColumn }
          : undefined
        : d.sampledAt
          ? { column: d.sampledAt }
          : undefined,
    dateOrder: d.dateOrder,
    timeZone: d.timeZone.trim() || undefined,
    analyte: side(d.analyte),
    method: side(d.method),
    basis: side(d.basis),
    value: d.value || undefined,
    handheldPh: d.handheldPh || null,
    handheldTemperature: d.temperatureColumn ? { column: d.temperatureColumn, unit: d.temperatureUnit } : null,
    handheldSalinityPpt: d.handheldSalinityPpt || null,
    note: d.note || null,
  };
}

export type MappingCheck = { ok: true; mapping: ImportMapping } | { ok: false; missing: string[] };

/** Checked with the shared schema; the fields it refuses are named by their top-level key. */
export function checkMapping(d: MappingDraft): MappingCheck {
  const parsed = importMappingSchema.safeParse(mappingBody(d));
  if (parsed.success) return { ok: true, mapping: parsed.data };
  return { ok: false, missing: [...new Set(parsed.error.issues.map((i) => String(i.path[0] ?? 'mapping')))] };
}

/** Which mapping field each file column feeds (for the preview's header tags). */
export function usesOf(d: MappingDraft): Map<string, string[]> {
  const out = new Map<string, string[]>();
  const add = (column: string, field: string) => {
    if (!column) return;
    out.set(column, [...(out.get(column) ?? []), field]);
  };
  add(d.unitCode, 'unitCode');
  if (d.sampledMode === 'split') {
    add(d.dateColumn, 'date');
    add(d.timeColumn, 'time');
  } else add(d.sampledAt, 'sampledAt');
  for (const k of ['analyte', 'method', 'basis'] as const) if (d[k].mode === 'column') add(d[k].column, k);
  add(d.value, 'value');
  add(d.handheldPh, 'handheldPh');
  add(d.temperatureColumn, 'handheldTemperature');
  add(d.handheldSalinityPpt, 'handheldSalinityPpt');
  add(d.note, 'note');
  return out;
}
