import {
  analyteRules,
  analytes,
  createWaterTestSchema,
  testMethods,
  type Analyte,
  type CreateWaterTest,
  type TestMethod,
} from '@shared/schemas/water-tests.schema';
import { parseDecimal } from '@/components/ui/field';
import { defaultMethod } from './kit-cards';
import { fromDisplayTemperature, type TemperatureUnit } from './format';

/** What the pondside form holds: text as typed (decimal comma allowed), temperatures in the user's unit. */
export interface TestFormValues {
  unitId: string;
  analyte: Analyte;
  method: TestMethod;
  basis: string;
  reading: string;
  ph: string;
  temperature: string;
  salinity: string;
  /** "" = now; else HH:MM on today's date (device clock). */
  sampledTime: string;
  note: string;
}

export type TestFormField = keyof TestFormValues;

export function emptyTestForm(overrides: Partial<TestFormValues> = {}): TestFormValues {
  const analyte = overrides.analyte ?? 'total_ammonia';
  const method = overrides.method ?? defaultMethod[analyte];
  return {
    unitId: '',
    analyte,
    method,
    basis: analyteRules[analyte].bases[0],
    reading: '',
    ph: '',
    temperature: '',
    salinity: '',
    sampledTime: '',
    note: '',
    ...overrides,
  };
}

/** The fields of the API body and the form field that shows their errors. */
const fieldOfBodyPath: Record<string, TestFormField> = {
  value: 'reading',
  handheldPh: 'ph',
  handheldTemperatureC: 'temperature',
  handheldSalinityPpt: 'salinity',
  sampledAt: 'sampledTime',
  method: 'method',
  basis: 'basis',
  analyte: 'analyte',
  note: 'note',
};
export const formFieldFor = (bodyField: string): TestFormField | undefined => fieldOfBodyPath[bodyField];

/** The reading's value as stored: temperatures in °C. Blank → undefined; not a number → NaN (the schema refuses both). */
function number(text: string): number | undefined {
  if (!text.trim()) return undefined;
  return parseDecimal(text) ?? Number.NaN;
}

function sampledAtFrom(time: string, now: Date): string | undefined {
  const m = /^(\d{1,2}):(\d{2})$/.exec(time.trim());
  if (!m) return undefined;
  const at = new Date(now);
  at.setHours(Number(m[1]), Number(m[2]), 0, 0);
  return at.toISOString();
}

export interface BodyOptions {
  clientId: string;
  temperatureUnit: TemperatureUnit;
  now: Date;
  source?: CreateWaterTest['source'];
  aeratorOn?: boolean | null;
}

/** The form → the API body (createWaterTestSchema), without validating. The sample time is fixed here, at entry. */
export function toWaterTestBody(v: TestFormValues, o: BodyOptions): Record<string, unknown> {
  const reading = number(v.reading);
  const temperature = number(v.temperature);
  const toC = (value: number | undefined) =>
    value === undefined || Number.isNaN(value) ? value : fromDisplayTemperature(value, o.temperatureUnit);
  const handheld = v.analyte === 'total_ammonia';
  return {
    clientId: o.clientId,
    analyte: v.analyte,
    method: v.method,
    basis: v.basis,
    value: v.analyte === 'temperature' ? toC(reading) : reading,
    sampledAt: sampledAtFrom(v.sampledTime, o.now) ?? o.now.toISOString(),
    handheldPh: handheld ? (number(v.ph) ?? null) : null,
    handheldTemperatureC: handheld ? (toC(temperature) ?? null) : null,
    handheldSalinityPpt: handheld ? (number(v.salinity) ?? null) : null,
    aeratorOn: o.aeratorOn ?? null,
    note: v.note.trim() || null,
    source: o.source ?? 'pondside',
  };
}

export interface TestIssue {
  field: TestFormField | 'form';
  code: string;
  message: string;
}

/** Validate with the shared schema (the API runs the same one) and say which form field each problem belongs to. */
export function validateWaterTest(
  v: TestFormValues,
  o: BodyOptions,
): { body: CreateWaterTest; issues: [] } | { body: null; issues: TestIssue[] } {
  const issues: TestIssue[] = [];
  if (!v.unitId) issues.push({ field: 'unitId', code: 'required', message: 'unit' });
  const parsed = createWaterTestSchema.safeParse(toWaterTestBody(v, o));
  if (parsed.success && !issues.length) return { body: parsed.data, issues: [] };
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const key = String(issue.path[0] ?? '');
      const field = formFieldFor(key) ?? 'form';
      if (!issues.some((i) => i.field === field)) issues.push({ field, code: issue.code, message: issue.message });
    }
  }
  return { body: null, issues };
}

const analyteSet: readonly string[] = analytes;
const methodSet: readonly string[] = testMethods;

/** A stored draft back into form values, dropping anything that no longer fits the schema's lists. */
export function sanitizeDraft(raw: unknown): Partial<TestFormValues> {
  if (!raw || typeof raw !== 'object') return {};
  const r = raw as Record<string, unknown>;
  const out: Partial<TestFormValues> = {};
  const text = (k: TestFormField) => (typeof r[k] === 'string' ? (r[k] as string) : undefined);
  const analyte = text('analyte');
  if (analyte && analyteSet.includes(analyte)) out.analyte = analyte as Analyte;
  const rules = analyteRules[out.analyte ?? 'total_ammonia'];
  const method = text('method');
  if (method && methodSet.includes(method) && (rules.methods as readonly string[]).includes(method)) out.method = method as TestMethod;
  const basis = text('basis');
  if (basis && (rules.bases as readonly string[]).includes(basis)) out.basis = basis;
  for (const k of ['unitId', 'reading', 'ph', 'temperature', 'salinity', 'sampledTime', 'note'] as const) {
    const value = text(k);
    if (value !== undefined) out[k] = value;
  }
  return out;
}
