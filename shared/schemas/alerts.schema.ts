import { z } from 'zod';
import { unitStatusLevelSchema } from './farms.schema';
import { thresholdMetrics } from './thresholds.schema';

// Alerts, the unit evaluation behind them, the farm's alert summary and the on-call list.
// Rules, defaults, hysteresis and escalation: docs/alerts.md.

const isoTime = z.iso.datetime({ offset: true });
const localTime = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'a local time as HH:MM (24 h)');

export const alertKinds = [
  'nh3_high',
  'tan_high',
  'nitrite_high',
  'ph_low',
  'ph_high',
  'temperature_low',
  'temperature_high',
  'salinity_high',
  'do_low',
  'do_projected_low',
  'flow_low',
  'flow_lost',
  'aerator_stopped',
  'pump_stopped',
  'probe_silent',
  'farm_silent',
  'flatline',
  'spike',
  'drift',
  'calibration_due',
  'kit_interference',
  'test_overdue',
] as const;
export type AlertKind = (typeof alertKinds)[number];
export const alertKindSchema = z.enum(alertKinds);

export const alertLevels = ['watch', 'act'] as const;
export type AlertLevel = (typeof alertLevels)[number];
export const alertLevelSchema = z.enum(alertLevels);

export const alertStates = ['open', 'acknowledged', 'resolved'] as const;
export type AlertStateName = (typeof alertStates)[number];

/** Kinds that remind of probe care and do not colour the unit on the map (they still list as alerts). */
export const statusNeutralKinds: readonly AlertKind[] = ['calibration_due'];

/** The rule behind an alert: which limit was crossed, the profile's numbers, and where they come from. */
export const alertRuleSchema = z.object({
  /** Threshold metric, or null for rules that are not profile limits (silence, overdue tests, equipment). */
  metric: z.enum(thresholdMetrics).nullable(),
  /** The limit the value crossed (act limit at act level, else watch). */
  threshold: z.number().nullable(),
  watch: z.number().nullable(),
  act: z.number().nullable(),
  /** Basis of the numbers, e.g. 'mg/L NH3', 'mg/L DO', 'minutes'. */
  basis: z.string().nullable(),
  /** Source label of the numbers (from the threshold profile, or the product rule). */
  source: z.string(),
  /** Where an open condition clears (hysteresis); null when it clears on a state change. */
  clearsAt: z.number().nullable(),
  /** The salinity at which salinity-dependent limits were interpolated. */
  salinityPpt: z.number().nullable(),
  profileId: z.uuid().nullable(),
  profileName: z.string().nullable(),
});
export type AlertRule = z.infer<typeof alertRuleSchema>;

const personSchema = z.object({ id: z.uuid(), name: z.string() });

export const alertSchema = z.object({
  id: z.uuid(),
  farmId: z.uuid(),
  unitId: z.uuid().nullable(),
  unitCode: z.string().nullable(),
  unitName: z.string().nullable(),
  probeId: z.uuid().nullable(),
  probeLabel: z.string().nullable(),
  kind: alertKindSchema,
  /** The highest level reached while open (a watch → act upgrade is an event; the level never drops while open). */
  level: alertLevelSchema,
  state: z.enum(alertStates),
  /** One alert per open condition: this key is unique among the farm's alerts that are not resolved. */
  conditionKey: z.string(),
  title: z.string(),
  message: z.string(),
  /** The measured values behind the alert, newest evaluation (shape per kind: docs/alerts.md). */
  values: z.record(z.string(), z.unknown()),
  rule: alertRuleSchema,
  openedAt: isoTime,
  lastSeenAt: isoTime,
  acknowledgedAt: isoTime.nullable(),
  acknowledgedBy: personSchema.nullable(),
  assignedTo: personSchema.nullable(),
  resolvedAt: isoTime.nullable(),
  /** Null for an automatic resolution (the condition cleared). */
  resolvedBy: personSchema.nullable(),
  resolutionNote: z.string().nullable(),
  /** Notification steps taken so far (first e-mail = 1). */
  escalationStep: z.number().int(),
  nextEscalationAt: isoTime.nullable(),
  realertAt: isoTime.nullable(),
});
export type AlertDto = z.infer<typeof alertSchema>;

export const alertEventTypes = ['opened', 'escalated_level', 'acknowledged', 'assigned', 'notified', 'escalated', 'realerted', 'resolved'] as const;
export const alertEventSchema = z.object({
  id: z.uuid(),
  alertId: z.uuid(),
  at: isoTime,
  type: z.enum(alertEventTypes),
  /** Who did it; null for the system (evaluation, escalation). */
  user: personSchema.nullable(),
  /** opened/escalated_level: level, values; notified/escalated: step, reason, recipients; resolved: note, auto. */
  details: z.record(z.string(), z.unknown()),
});
export type AlertEventDto = z.infer<typeof alertEventSchema>;

export const alertListQuerySchema = z
  .object({
    /** 'active' (default) = open or acknowledged; 'all' includes resolved. */
    state: z.enum(['active', 'open', 'acknowledged', 'resolved', 'all']).default('active'),
    unitId: z.uuid().optional(),
    kind: alertKindSchema.optional(),
    level: alertLevelSchema.optional(),
    limit: z.coerce.number().int().min(1).max(500).default(100),
    /** nextCursor of the previous page (newest first). */
    cursor: z.string().min(1).max(200).optional(),
  })
  .strict();
export type AlertListQuery = z.output<typeof alertListQuerySchema>;

export const alertListResponseSchema = z.object({ alerts: z.array(alertSchema), nextCursor: z.string().nullable() });
export const alertDetailResponseSchema = z.object({ alert: alertSchema, events: z.array(alertEventSchema) });

export const acknowledgeAlertRequestSchema = z.object({ note: z.string().trim().max(500).optional() }).strict();
export const assignAlertRequestSchema = z.object({ userId: z.uuid(), note: z.string().trim().max(500).optional() }).strict();
export const resolveAlertRequestSchema = z.object({ note: z.string().trim().min(3, 'Say what was done').max(1000) }).strict();

// --- unit evaluation (GET …/units/:unitId/evaluation) ---

export const checkVerdicts = ['raise', 'hold', 'clear'] as const;

/** One thing the evaluation looked at and what it concluded. */
export const evaluationCheckSchema = z.object({
  kind: alertKindSchema,
  conditionKey: z.string(),
  /** raise: the condition is present; hold: not present, but an open alert stays (inside the hysteresis band or no fresh data); clear: absent. */
  verdict: z.enum(checkVerdicts),
  level: alertLevelSchema.nullable(),
  probeId: z.uuid().nullable(),
  value: z.number().nullable(),
  /** Unit of `value` (the rule's basis where there is a rule). */
  valueUnit: z.string().nullable(),
  at: isoTime.nullable(),
  /** Where the value came from: 'probe', 'spot test', 'kit result', 'projection', 'probe health', 'schedule'. */
  source: z.string().nullable(),
  rule: alertRuleSchema.nullable(),
  title: z.string().nullable(),
  message: z.string().nullable(),
  /** Why the verdict is hold or clear, in plain words. */
  note: z.string().nullable(),
  values: z.record(z.string(), z.unknown()),
});
export type EvaluationCheck = z.infer<typeof evaluationCheckSchema>;

const projectionSchema = z.object({ doAtDawnMgL: z.number(), crossesAt: isoTime.nullable() });

/** The night's DO decline projected to dawn (husbandry.md §1): both methods, the lower one alarms. */
export const dawnProjectionSchema = z.object({
  duskAt: isoTime,
  dawnAt: isoTime,
  /** The line the alarm is about (the unit's do_min watch limit, e.g. 4 mg/L, the UF/IFAS FA27 aerate line). */
  thresholdMgL: z.number(),
  actThresholdMgL: z.number().nullable(),
  /** Straight line, Boyd, Romaire & Johnston 1978 (procedure in UF/IFAS FA27). */
  linear: projectionSchema,
  /** Exponential decline, Madenjian, Rogers & Fast 1987. */
  logLinear: projectionSchema,
  lower: z.enum(['linear', 'logLinear']),
  doAtDawnMgL: z.number(),
  /** When the lower projection reaches thresholdMgL (null if it stays above until dawn), and as farm-local HH:MM. */
  crossesAt: isoTime.nullable(),
  crossesLocalTime: z.string().nullable(),
  /** 'probe': 15-minute means of the unit's probe DO since dusk; 'spot_test': night-round DO tests. */
  basedOn: z.enum(['probe', 'spot_test']),
  readingsUsed: z.array(z.object({ at: isoTime, doMgL: z.number() })),
});
export type DawnProjectionDto = z.infer<typeof dawnProjectionSchema>;

/** US EPA 2013 freshwater ammonia criteria for the unit's current pH and temperature: a reference line, never an alarm. */
export const epaReferenceSchema = z.object({
  applicable: z.boolean(),
  /** Why it does not apply (not fresh water, no pH/temperature, outside the tables' range), or what it is. */
  note: z.string(),
  pH: z.number().nullable(),
  temperatureC: z.number().nullable(),
  oncorhynchusPresent: z.boolean(),
  /** mg TAN/L, unrounded (the EPA tables print 2 significant figures). */
  cmcMgL: z.number().nullable(),
  cccMgL: z.number().nullable(),
  fourDayMaxMgL: z.number().nullable(),
  /** The unit's latest TAN, mg/L TAN-N, to set beside the lines. */
  latestTanMgL: z.number().nullable(),
  source: z.string(),
});

export const unitEvaluationSchema = z.object({
  farmId: z.uuid(),
  unitId: z.uuid(),
  unitCode: z.string(),
  unitName: z.string(),
  evaluatedAt: isoTime,
  /** Between the farm's dusk and dawn (farm-local), when the dawn projection is evaluated. */
  night: z.boolean(),
  /** Map status after this evaluation, from the unit's open alerts. */
  status: unitStatusLevelSchema,
  fallow: z.boolean(),
  profile: z.object({ id: z.uuid(), name: z.string(), species: z.string() }).nullable(),
  checks: z.array(evaluationCheckSchema),
  dawnProjection: dawnProjectionSchema.nullable(),
  reference: z.object({ epa2013: epaReferenceSchema }),
  openAlerts: z.array(alertSchema),
  caution: z.string(),
});
export type UnitEvaluationDto = z.infer<typeof unitEvaluationSchema>;

// --- farm summary (map colours, badges) ---

export const alertSummaryResponseSchema = z.object({
  farmId: z.uuid(),
  generatedAt: isoTime,
  farmSilent: z.boolean(),
  open: z.object({ watch: z.number().int(), act: z.number().int(), unacknowledged: z.number().int() }),
  units: z.array(
    z.object({
      unitId: z.uuid(),
      status: unitStatusLevelSchema,
      open: z.object({ watch: z.number().int(), act: z.number().int() }),
      kinds: z.array(alertKindSchema),
    }),
  ),
});
export type AlertSummaryResponse = z.infer<typeof alertSummaryResponseSchema>;

// --- on-call list ---

export const onCallEntryInputSchema = z
  .object({
    userId: z.uuid(),
    /** Farm-local start of the hours covered. */
    startsLocal: localTime.default('00:00'),
    /** Farm-local end; '24:00' = end of day. An end before the start covers past midnight (e.g. 18:00–06:00). */
    endsLocal: z.union([localTime, z.literal('24:00')]).default('24:00'),
    /** ISO weekdays covered (1 = Monday); for hours past midnight, the weekday the shift starts. */
    weekdays: z
      .array(z.number().int().min(1).max(7))
      .min(1)
      .max(7)
      .refine((d) => new Set(d).size === d.length, { message: 'each weekday once' })
      .default([1, 2, 3, 4, 5, 6, 7]),
  })
  .strict()
  .refine((e) => e.startsLocal !== e.endsLocal, { message: 'start and end must differ', path: ['endsLocal'] });

/** PUT body: the whole list, in escalation order (first = called first). */
export const putOnCallRequestSchema = z
  .object({ entries: z.array(onCallEntryInputSchema).max(30) })
  .strict();
export type PutOnCallRequest = z.infer<typeof putOnCallRequestSchema>;

export const onCallEntrySchema = z.object({
  id: z.uuid(),
  position: z.number().int(),
  userId: z.uuid(),
  name: z.string(),
  email: z.string(),
  /** The person's role on the farm ('admin' for an admin without a membership). */
  role: z.enum(['hand', 'manager', 'planner', 'admin']),
  startsLocal: z.string(),
  endsLocal: z.string(),
  weekdays: z.array(z.number().int()),
  /** Whether the entry's hours cover the present moment (farm-local). */
  coversNow: z.boolean(),
});
export type OnCallEntryDto = z.infer<typeof onCallEntrySchema>;

export const onCallResponseSchema = z.object({
  farmId: z.uuid(),
  timeZone: z.string(),
  escalationMinutes: z.number().int(),
  entries: z.array(onCallEntrySchema),
  /** The first entry covering now: who an act-level alert would e-mail first. */
  firstNow: onCallEntrySchema.nullable(),
  /** What happens after the last person covering now: the farm's managers are e-mailed once, then escalation stops. */
  afterList: z.literal('managers_then_stop'),
});
export type OnCallResponse = z.infer<typeof onCallResponseSchema>;
