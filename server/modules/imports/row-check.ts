import { createHash } from 'node:crypto';
import type { ImportMapping } from '../../../shared/schemas/imports.schema';
import { analyteRules, createWaterTestSchema, type Analyte, type CreateWaterTest } from '../../../shared/schemas/water-tests.schema';
import { fahrenheitToCelsius, readAnalyte, readBasis, readMethod, readNumber, readSampledAt } from './column-mapping';
import type { ImportUnit } from './imports.repository';

// One CSV row → one water test, checked by createWaterTestSchema (the pondside form's schema) after the
// cells are read; every problem of the row is reported, named by the file's column.

const MAX_REASONS = 10;

/** RFC 4122 version-5 (SHA-1, name-based) UUID. */
let lastNamespace: { text: string; bytes: Buffer } | null = null;
export function uuidV5(name: string, namespace: string): string {
  if (lastNamespace?.text !== namespace) lastNamespace = { text: namespace, bytes: Buffer.from(namespace.replace(/-/g, ''), 'hex') };
  const ns = lastNamespace.bytes;
  const hash = createHash('sha1').update(ns).update(name, 'utf8').digest();
  hash[6] = (hash[6]! & 0x0f) | 0x50;
  hash[8] = (hash[8]! & 0x3f) | 0x80;
  const h = hash.subarray(0, 16).toString('hex');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

/** Namespace of import ids (a fixed random UUID of ours). */
const IMPORT_NAMESPACE = '3f0c7e52-6a1b-4d8e-9c47-b2e5d1a8f09c';

/** The same file uploaded to the same farm is the same import. */
export const importIdFor = (farmId: string, sha256: string) => uuidV5(`${farmId}:${sha256}`, IMPORT_NAMESPACE);

/**
 * Client id of the test one line of an import gives for one analyte: re-running the commit stores each
 * line once, and the same meter log committed again for another analyte column adds that analyte.
 */
export const clientIdFor = (importId: string, line: number, analyte: string) => uuidV5(`line:${line}:${analyte}`, importId);

/** A stable key of a mapping (object key order does not matter). */
export function mappingKey(mapping: ImportMapping): string {
  const sorted = (v: unknown): unknown =>
    v && typeof v === 'object' && !Array.isArray(v)
      ? Object.fromEntries(Object.entries(v as Record<string, unknown>).filter(([, x]) => x !== undefined && x !== null).sort(([a], [b]) => a.localeCompare(b)).map(([k, x]) => [k, sorted(x)]))
      : v;
  return createHash('sha256').update(JSON.stringify(sorted(mapping))).digest('hex').slice(0, 32);
}

export type RowContext = {
  mapping: ImportMapping;
  headers: string[];
  timeZone: string;
  decimalComma: boolean;
  units: ImportUnit[];
};

/**
 * A good row. `input.clientId` is a placeholder: the stored client id (clientIdFor) is computed only
 * for rows that are written, which keeps a validation pass over 200 000 rows cheap.
 */
export type CheckedRow = { ok: true; unitId: string; input: CreateWaterTest } | { ok: false; reasons: string[] };

const PLACEHOLDER_CLIENT_ID = '00000000-0000-5000-8000-000000000000';

export type RowChecker = (cells: string[]) => CheckedRow;

/** Builds the checker for one pass over a file (column positions and the unit lookup are resolved once). */
export function rowChecker(ctx: RowContext): RowChecker {
  const { mapping, headers } = ctx;
  const index = new Map(headers.map((h, i) => [h, i]));
  const pos = (column: string) => index.get(column) ?? -1;
  const byCode = new Map(ctx.units.map((u) => [u.code.trim().toLowerCase(), u.id]));
  const byName = new Map<string, string | null>();
  for (const u of ctx.units) {
    const k = u.name.trim().toLowerCase();
    byName.set(k, byName.has(k) ? null : u.id); // a name two units share identifies neither
  }
  const timeZone = mapping.timeZone ?? ctx.timeZone;
  const sourceLabel = (field: keyof ImportMapping, fallback: string): string => {
    const m = mapping[field];
    if (typeof m === 'string') return `"${m}"`;
    if (m && typeof m === 'object' && 'column' in m) return `"${m.column}"`;
    return fallback;
  };
  const labels: Record<string, string> = {
    unitCode: sourceLabel('unitCode', 'unit'),
    sampledAt: 'column' in mapping.sampledAt ? `"${mapping.sampledAt.column}"` : `"${mapping.sampledAt.dateColumn}" + "${mapping.sampledAt.timeColumn}"`,
    analyte: sourceLabel('analyte', 'analyte (fixed)'),
    method: sourceLabel('method', 'method (fixed)'),
    basis: sourceLabel('basis', 'basis (fixed)'),
    value: `"${mapping.value}"`,
    handheldPh: sourceLabel('handheldPh', 'pH'),
    handheldTemperatureC: mapping.handheldTemperature ? `"${mapping.handheldTemperature.column}"` : 'temperature',
    handheldSalinityPpt: sourceLabel('handheldSalinityPpt', 'salinity'),
    note: sourceLabel('note', 'note'),
  };

  return (cells) => {
    const cell = (column: string) => (cells[pos(column)] ?? '').trim();
    const reasons: string[] = [];
    const failed = new Set<string>();
    const fail = (field: string, message: string) => {
      failed.add(field);
      reasons.push(`${labels[field] ?? field}: ${message}`);
    };
    const extra = cells.slice(headers.length).filter((c) => c.trim() !== '');
    if (extra.length) reasons.push(`the row has ${headers.length + extra.length} cells but the header has ${headers.length} — is there an unquoted delimiter inside a cell?`);

    // unit
    const code = cell(mapping.unitCode);
    let unitId: string | null = null;
    if (!code) fail('unitCode', 'is empty');
    else {
      unitId = byCode.get(code.toLowerCase()) ?? byName.get(code.toLowerCase()) ?? null;
      if (!unitId) fail('unitCode', `"${code}" is not a unit of this farm`);
    }
    // analyte, method, basis: a column or a fixed value
    let analyte: Analyte | null = null;
    if ('fixed' in mapping.analyte) analyte = mapping.analyte.fixed;
    else {
      const raw = cell(mapping.analyte.column);
      analyte = readAnalyte(raw);
      if (!raw) fail('analyte', 'is empty');
      else if (!analyte) fail('analyte', `"${raw}" is not an analyte Gillwise records`);
    }
    let method: string | null = null;
    if ('fixed' in mapping.method) method = mapping.method.fixed;
    else {
      const raw = cell(mapping.method.column);
      method = readMethod(raw);
      if (!raw) fail('method', 'is empty');
      else if (!method) fail('method', `"${raw}" is not a test method Gillwise knows (salicylate, nessler, colorimetric, titration, strip, meter, lab, other)`);
    }
    let basis: string | null = null;
    if ('fixed' in mapping.basis) basis = mapping.basis.fixed;
    else {
      const raw = cell(mapping.basis.column);
      basis = readBasis(raw, analyte);
      if (!raw) fail('basis', 'is empty');
      else if (!basis) fail('basis', `"${raw}" is not a basis Gillwise understands${analyte ? ` for ${analyte} (${analyteRules[analyte].bases.join(', ')})` : ''}`);
    }
    // value and handheld numbers
    const number = (field: string, raw: string, required: boolean): number | null => {
      if (!raw) {
        if (required) fail(field, 'is empty');
        return null;
      }
      if (/^[<>]/.test(raw)) {
        fail(field, `"${raw}" is a below- or above-range result; enter a number`);
        return null;
      }
      const n = readNumber(raw, ctx.decimalComma);
      if (n === null) fail(field, `"${raw}" is not a number`);
      return n;
    };
    const value = number('value', cell(mapping.value), true);
    const handheldPh = mapping.handheldPh ? number('handheldPh', cell(mapping.handheldPh), false) : null;
    let handheldTemperatureC = mapping.handheldTemperature ? number('handheldTemperatureC', cell(mapping.handheldTemperature.column), false) : null;
    if (handheldTemperatureC !== null && mapping.handheldTemperature?.unit === 'f') handheldTemperatureC = fahrenheitToCelsius(handheldTemperatureC);
    const handheldSalinityPpt = mapping.handheldSalinityPpt ? number('handheldSalinityPpt', cell(mapping.handheldSalinityPpt), false) : null;
    // sample time
    const at =
      'column' in mapping.sampledAt
        ? readSampledAt({ at: cell(mapping.sampledAt.column) }, mapping.dateOrder, timeZone)
        : readSampledAt({ date: cell(mapping.sampledAt.dateColumn), time: cell(mapping.sampledAt.timeColumn) }, mapping.dateOrder, timeZone);
    if ('problem' in at) fail('sampledAt', at.problem);
    const note = mapping.note ? cell(mapping.note) || null : null;

    // The one schema: the same checks as the pondside form and the API, on what could be read.
    const candidate = {
      clientId: PLACEHOLDER_CLIENT_ID,
      analyte: analyte ?? undefined,
      method: method ?? undefined,
      basis: basis ?? undefined,
      value: value ?? undefined,
      sampledAt: 'iso' in at ? at.iso : undefined,
      handheldPh,
      handheldTemperatureC,
      handheldSalinityPpt,
      note,
      source: 'import' as const,
    };
    const parsed = createWaterTestSchema.safeParse(candidate);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const field = String(issue.path[0] ?? '');
        if (failed.has(field)) continue;
        if (candidate[field as keyof typeof candidate] === undefined && reasons.length) continue; // already explained
        fail(field, issue.message);
      }
    }
    if (reasons.length || !parsed.success || !unitId) return { ok: false, reasons: reasons.length ? reasons.slice(0, MAX_REASONS) : ['the row could not be read'] };
    return { ok: true, unitId, input: parsed.data };
  };
}
