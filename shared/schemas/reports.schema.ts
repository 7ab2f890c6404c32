import { z } from 'zod';
import { alertKindSchema, alertLevelSchema } from './alerts.schema';

// The morning report: one per farm and farm-local day, built at the farm's morningReportLocalTime
// from the night before (dusk → dawn), stored once and e-mailed to the managers. docs/alerts.md.

const isoTime = z.iso.datetime({ offset: true });
const day = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'a day as YYYY-MM-DD');

export const morningReportQuerySchema = z.object({ day: day.optional() }).strict();
export const morningReportListQuerySchema = z.object({ limit: z.coerce.number().int().min(1).max(90).default(14) }).strict();

const personSchema = z.object({ id: z.uuid(), name: z.string() });

export const morningReportUnitSchema = z.object({
  unitId: z.uuid(),
  code: z.string(),
  name: z.string(),
  kind: z.enum(['pond', 'raceway', 'tank']),
  /** Lowest DO of the night from the unit's probes (good readings) and night-round DO tests; null when none. */
  lowestDo: z
    .object({
      doMgL: z.number(),
      at: isoTime,
      /** Farm-local HH:MM. */
      localTime: z.string(),
      source: z.enum(['probe', 'spot_test']),
    })
    .nullable(),
  /** Hours the unit's aerator reported running during the night; null when the unit reports no aerator. */
  aeratorHours: z.number().nullable(),
});

export const morningReportAlarmSchema = z.object({
  alertId: z.uuid(),
  kind: alertKindSchema,
  level: alertLevelSchema,
  state: z.enum(['open', 'acknowledged', 'resolved']),
  unitId: z.uuid().nullable(),
  unitCode: z.string().nullable(),
  title: z.string(),
  openedAt: isoTime,
  openedLocalTime: z.string(),
  acknowledgedBy: personSchema.nullable(),
  acknowledgedAt: isoTime.nullable(),
  resolvedAt: isoTime.nullable(),
});

export const morningReportContentSchema = z.object({
  timeZone: z.string(),
  /** The night covered: the previous day's dusk to this day's dawn (farm settings). */
  night: z.object({ from: isoTime, to: isoTime, duskLocalTime: z.string(), dawnLocalTime: z.string() }),
  units: z.array(morningReportUnitSchema),
  /** Units whose aerator ran overnight, with hours. */
  aerators: z.array(z.object({ unitId: z.uuid(), code: z.string(), hours: z.number() })),
  /** Alarms opened since the previous dusk, and who acknowledged them. */
  alarms: z.array(morningReportAlarmSchema),
  missedChecks: z.object({
    /** Routine ammonia tests past due at report time. */
    testsOverdue: z.array(z.object({ unitId: z.uuid(), code: z.string(), alertId: z.uuid(), dueDay: z.string().nullable(), lastTestAt: isoTime.nullable() })),
    /** Probes silent at report time or during the night. */
    silentProbes: z.array(z.object({ probeId: z.uuid(), label: z.string(), unitCode: z.string().nullable(), alertId: z.uuid(), since: isoTime, resolvedAt: isoTime.nullable() })),
  }),
  caution: z.string(),
});
export type MorningReportContent = z.infer<typeof morningReportContentSchema>;

export const morningReportSchema = z.object({
  /** Null for a preview of a day not stored (yet). */
  id: z.uuid().nullable(),
  farmId: z.uuid(),
  day,
  /** false: built on request and not stored (the scheduled report for the day does not exist yet). */
  stored: z.boolean(),
  createdAt: isoTime,
  /** Managers the stored report was e-mailed to. */
  mailedTo: z.array(z.string()),
  content: morningReportContentSchema,
});
export type MorningReportDto = z.infer<typeof morningReportSchema>;

export const morningReportListResponseSchema = z.object({
  reports: z.array(z.object({ id: z.uuid(), day, createdAt: isoTime, alarms: z.number().int(), mailedTo: z.array(z.string()) })),
});
