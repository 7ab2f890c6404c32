import { z } from 'zod';

// A kit or meter result entered at the pondside, by API or by CSV import. The same schema drives the
// pondside form, the API and the importer, so a value refused in one is refused in all.

export const analytes = [
  'total_ammonia',
  'nitrite',
  'nitrate',
  'alkalinity',
  'chloride',
  'hardness',
  'ph',
  'temperature',
  'dissolved_oxygen',
  'salinity',
] as const;
export type Analyte = (typeof analytes)[number];

export const testMethods = ['salicylate', 'nessler', 'colorimetric', 'titration', 'strip', 'meter', 'lab', 'other'] as const;
export type TestMethod = (typeof testMethods)[number];

/** What each analyte may be reported as, the unit its value is in, and the range a real sample can have. */
export const analyteRules = {
  total_ammonia: { bases: ['tan-n', 'total-nh3', 'total-nh4'], unit: 'mg/L', min: 0, max: 100, methods: ['salicylate', 'nessler', 'strip', 'meter', 'lab', 'other'] },
  nitrite: { bases: ['no2-n', 'no2'], unit: 'mg/L', min: 0, max: 100, methods: ['colorimetric', 'strip', 'meter', 'lab', 'other'] },
  nitrate: { bases: ['no3-n', 'no3'], unit: 'mg/L', min: 0, max: 1000, methods: ['colorimetric', 'strip', 'meter', 'lab', 'other'] },
  alkalinity: { bases: ['caco3'], unit: 'mg/L', min: 0, max: 1000, methods: ['titration', 'strip', 'lab', 'other'] },
  chloride: { bases: ['cl'], unit: 'mg/L', min: 0, max: 40000, methods: ['titration', 'strip', 'meter', 'lab', 'other'] },
  hardness: { bases: ['caco3'], unit: 'mg/L', min: 0, max: 5000, methods: ['titration', 'strip', 'lab', 'other'] },
  ph: { bases: ['ph'], unit: 'pH', min: 0, max: 14, methods: ['meter', 'colorimetric', 'strip', 'lab', 'other'] },
  temperature: { bases: ['c'], unit: '°C', min: -5, max: 50, methods: ['meter', 'other'] },
  dissolved_oxygen: { bases: ['mg-l'], unit: 'mg/L', min: 0, max: 40, methods: ['meter', 'titration', 'other'] },
  salinity: { bases: ['ppt'], unit: 'ppt', min: 0, max: 70, methods: ['meter', 'other'] },
} as const satisfies Record<Analyte, { bases: readonly string[]; unit: string; min: number; max: number; methods: readonly TestMethod[] }>;

export const testBases = ['tan-n', 'total-nh3', 'total-nh4', 'no2-n', 'no2', 'no3-n', 'no3', 'caco3', 'cl', 'ph', 'c', 'mg-l', 'ppt'] as const;

const isoTime = z.iso.datetime({ offset: true });

const handheld = {
  handheldPh: z.number().min(0).max(14).nullish(),
  handheldTemperatureC: z.number().min(-5).max(50).nullish(),
  handheldSalinityPpt: z.number().min(0).max(45).nullish(),
};

const base = z.object({
  clientId: z.uuid({ message: 'clientId must be a UUID generated on the device' }),
  analyte: z.enum(analytes),
  method: z.enum(testMethods),
  basis: z.enum(testBases),
  value: z.number({ message: 'Enter the reading as a number' }).finite(),
  sampledAt: isoTime.optional(),
  ...handheld,
  aeratorOn: z.boolean().nullish(),
  note: z.string().max(2000).nullish(),
  source: z.enum(['pondside', 'api', 'import', 'night_round']).optional(),
});

/** Cross-field rules: the basis and method fit the analyte, the value is possible, the time is not in the future. */
function checkTest(t: { analyte: Analyte; method: TestMethod; basis: string; value: number; sampledAt?: string | undefined }, ctx: z.RefinementCtx) {
  const rule = analyteRules[t.analyte];
  if (!(rule.bases as readonly string[]).includes(t.basis)) {
    ctx.addIssue({ code: 'custom', path: ['basis'], message: `For ${t.analyte} the basis must be one of: ${rule.bases.join(', ')}` });
  }
  if (!(rule.methods as readonly string[]).includes(t.method)) {
    ctx.addIssue({ code: 'custom', path: ['method'], message: `${t.method} is not a method for ${t.analyte}` });
  }
  if (t.value < rule.min || t.value > rule.max) {
    ctx.addIssue({ code: 'custom', path: ['value'], message: `A ${t.analyte} reading must be between ${rule.min} and ${rule.max} ${rule.unit}` });
  }
  if (t.sampledAt && Date.parse(t.sampledAt) > Date.now() + 5 * 60_000) {
    ctx.addIssue({ code: 'custom', path: ['sampledAt'], message: 'The sample time is in the future' });
  }
}

export const createWaterTestSchema = base.superRefine(checkTest);
export type CreateWaterTest = z.infer<typeof createWaterTestSchema>;

export const updateWaterTestSchema = base
  .omit({ clientId: true, analyte: true, source: true })
  .partial()
  .extend({ reason: z.string().min(3, 'Say why the result is edited').max(500) });
export type UpdateWaterTest = z.infer<typeof updateWaterTestSchema>;

export const waterTestQuerySchema = z.object({
  analyte: z.enum(analytes).optional(),
  from: isoTime.optional(),
  to: isoTime.optional(),
  limit: z.coerce.number().int().min(1).max(1000).default(200),
});

export const resultStatuses = ['ok', 'needs_ph', 'needs_temperature', 'invalid_input'] as const;

export const provenanceValueSchema = z.object({
  quantity: z.string(),
  value: z.number(),
  source: z.enum(['probe', 'probe_interpolated', 'handheld', 'unit_default']),
  probeId: z.string().nullable(),
  probeLabel: z.string().nullable(),
  readings: z.array(z.object({ at: z.string(), value: z.number() })),
});

export const freeAmmoniaResultSchema = z.object({
  id: z.uuid(),
  waterTestId: z.uuid(),
  unitId: z.uuid(),
  sampledAt: z.string(),
  status: z.enum(resultStatuses),
  tanMgL: z.number().nullable(),
  nh3NMgL: z.number().nullable(),
  nh3MgL: z.number().nullable(),
  fraction: z.number().nullable(),
  pKa: z.number().nullable(),
  method: z.string().nullable(),
  pHScale: z.string().nullable(),
  pH: z.number().nullable(),
  temperatureC: z.number().nullable(),
  salinityPpt: z.number().nullable(),
  provenance: z.object({ values: z.array(provenanceValueSchema), windowMinutes: z.number(), missing: z.array(z.string()) }).passthrough(),
  flags: z.array(z.object({ code: z.string(), message: z.string() })),
  forecastPeak: z
    .object({ nh3NMgL: z.number(), nh3MgL: z.number(), at: z.string(), localTime: z.string(), basedOnHours: z.number(), morningTestNote: z.string().nullable() })
    .nullable(),
  computedAt: z.string(),
  testVersion: z.number(),
});
export type FreeAmmoniaResultDto = z.infer<typeof freeAmmoniaResultSchema>;

export const waterTestSchema = z.object({
  id: z.uuid(),
  farmId: z.uuid(),
  unitId: z.uuid(),
  clientId: z.uuid(),
  analyte: z.enum(analytes),
  method: z.enum(testMethods),
  basis: z.string(),
  value: z.number(),
  unit: z.string(),
  sampledAt: z.string(),
  handheldPh: z.number().nullable(),
  handheldTemperatureC: z.number().nullable(),
  handheldSalinityPpt: z.number().nullable(),
  aeratorOn: z.boolean().nullable(),
  note: z.string().nullable(),
  photoUrl: z.string().nullable(),
  source: z.string(),
  enteredById: z.string().nullable(),
  version: z.number(),
  createdAt: z.string(),
  updatedAt: z.string(),
  result: freeAmmoniaResultSchema.nullable(),
});
export type WaterTestDto = z.infer<typeof waterTestSchema>;
