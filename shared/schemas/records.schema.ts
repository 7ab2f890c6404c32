import { z } from 'zod';

// Inspection-ready records of one farm for a period: the water-quality log per unit (each test with its
// computed free ammonia and where the pH, temperature and salinity came from), treatments with their
// withdrawal ends, mortalities, and the feed given or withheld with the reason.

const day = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'a day as YYYY-MM-DD');
const isoTime = z.iso.datetime({ offset: true });
/** A farm-local day (YYYY-MM-DD; `to` includes the whole day) or an exact instant. */
const periodBound = z.union([day, isoTime]);

export const RECORDS_MAX_RANGE_DAYS = 366;
export const RECORDS_DEFAULT_RANGE_DAYS = 30;

export const recordsQuerySchema = z.object({
  /** First day (or instant) of the period; default 30 days before `to`. */
  from: periodBound.optional(),
  /** Last day (inclusive) or end instant (exclusive); default today. */
  to: periodBound.optional(),
  unitId: z.uuid().optional(),
});
export type RecordsQuery = z.infer<typeof recordsQuerySchema>;

export const recordSections = ['water_quality', 'treatments', 'mortalities', 'feeding'] as const;
export type RecordSection = (typeof recordSections)[number];

export const recordsCsvQuerySchema = recordsQuerySchema.extend({ section: z.enum(recordSections) });
export type RecordsCsvQuery = z.infer<typeof recordsCsvQuerySchema>;

export const valueSources = ['probe', 'probe_interpolated', 'handheld', 'unit_default'] as const;

const usedValueSchema = z.object({
  value: z.number(),
  source: z.enum(valueSources),
  /** The probe's label when the value came from a probe. */
  probeLabel: z.string().nullable(),
});

export const recordTestSchema = z.object({
  testId: z.uuid(),
  sampledAt: z.string(),
  sampledAtLocal: z.string(),
  analyte: z.string(),
  method: z.string(),
  basis: z.string(),
  value: z.number(),
  unit: z.string(),
  handheldPh: z.number().nullable(),
  handheldTemperatureC: z.number().nullable(),
  handheldSalinityPpt: z.number().nullable(),
  note: z.string().nullable(),
  source: z.string(),
  enteredBy: z.string().nullable(),
  /** Edited results have version > 1; the edits are in the audit log. */
  version: z.number().int(),
  freeAmmonia: z
    .object({
      status: z.string(),
      tanMgL: z.number().nullable(),
      nh3NMgL: z.number().nullable(),
      nh3MgL: z.number().nullable(),
      method: z.string().nullable(),
      ph: usedValueSchema.nullable(),
      temperatureC: usedValueSchema.nullable(),
      salinityPpt: usedValueSchema.nullable(),
      flags: z.array(z.object({ code: z.string(), message: z.string() })),
      computedAt: z.string(),
    })
    .nullable(),
});
export type RecordTest = z.infer<typeof recordTestSchema>;

export const provenanceSummarySchema = z.object({
  /** Total-ammonia tests in the period with a computed result. */
  computed: z.number().int(),
  /** Tests still waiting for pH or temperature, or with values out of range. */
  notComputed: z.number().int(),
  /** How many results used each source, per value. */
  ph: z.record(z.enum(valueSources), z.number().int()),
  temperature: z.record(z.enum(valueSources), z.number().int()),
  salinity: z.record(z.enum(valueSources), z.number().int()),
});

const unitRefSchema = z.object({ id: z.uuid(), code: z.string(), name: z.string(), kind: z.string() });

export const recordsResponseSchema = z.object({
  farm: z.object({ id: z.uuid(), name: z.string(), timeZone: z.string() }),
  period: z.object({ from: z.string(), to: z.string(), fromLocal: z.string(), toLocal: z.string() }),
  generatedAt: z.string(),
  waterQuality: z.array(
    z.object({
      unit: unitRefSchema,
      tests: z.array(recordTestSchema),
      maxNh3MgL: z.number().nullable(),
      provenance: provenanceSummarySchema,
    }),
  ),
  treatments: z.array(
    z.object({
      id: z.uuid(),
      unit: unitRefSchema,
      product: z.string(),
      productName: z.string().nullable(),
      dose: z.number().nullable(),
      doseUnit: z.string().nullable(),
      startsAt: z.string(),
      startsAtLocal: z.string(),
      endsAt: z.string().nullable(),
      withdrawalDays: z.number().nullable(),
      withdrawalDegreeDays: z.number().nullable(),
      withdrawalEndsAt: z.string().nullable(),
      withdrawalEndsAtLocal: z.string().nullable(),
      note: z.string().nullable(),
      recordedBy: z.string().nullable(),
    }),
  ),
  mortalities: z.array(
    z.object({
      id: z.uuid(),
      unit: unitRefSchema,
      at: z.string(),
      atLocal: z.string(),
      count: z.number().int().nullable(),
      totalWeightKg: z.number().nullable(),
      note: z.string().nullable(),
      recordedBy: z.string().nullable(),
    }),
  ),
  feeding: z.array(
    z.object({
      id: z.uuid(),
      unit: unitRefSchema,
      day: z.string(),
      fedKg: z.number(),
      withheld: z.boolean(),
      reason: z.string().nullable(),
      response: z.string().nullable(),
      fedAt: z.string(),
      fedAtLocal: z.string(),
      recordedBy: z.string().nullable(),
    }),
  ),
  totals: z.object({
    tests: z.number().int(),
    treatments: z.number().int(),
    mortalityCount: z.number().int(),
    fedKg: z.number(),
    withheldRecords: z.number().int(),
  }),
});
export type RecordsResponse = z.infer<typeof recordsResponseSchema>;

/** Columns of GET …/records.csv?section=, per section (numbers carry their unit in the name). */
export const recordsCsvColumns = {
  water_quality: [
    'unit_code', 'unit_name', 'time_utc', 'time_local', 'analyte', 'method', 'basis', 'value', 'value_unit',
    'handheld_ph', 'handheld_temperature_c', 'handheld_salinity_ppt', 'nh3_status', 'tan_mg_l', 'nh3_n_mg_l', 'nh3_mg_l',
    'ph_used', 'ph_source', 'temperature_c_used', 'temperature_source', 'salinity_ppt_used', 'salinity_source',
    'flags', 'note', 'source', 'entered_by', 'version', 'test_id',
  ],
  treatments: [
    'unit_code', 'product', 'product_name', 'dose', 'dose_unit', 'starts_utc', 'starts_local', 'ends_utc',
    'withdrawal_days', 'withdrawal_degree_days', 'withdrawal_ends_utc', 'withdrawal_ends_local', 'note', 'recorded_by', 'treatment_id',
  ],
  mortalities: ['unit_code', 'time_utc', 'time_local', 'count', 'total_weight_kg', 'note', 'recorded_by', 'event_id'],
  feeding: ['unit_code', 'day', 'fed_kg', 'withheld', 'reason', 'response', 'fed_at_utc', 'fed_at_local', 'recorded_by', 'record_id'],
} as const satisfies Record<RecordSection, readonly string[]>;
