import { z } from 'zod';
import { quantitySchema } from './mqtt.schema';

const isoTime = z.iso.datetime({ offset: true });

const quantityList = z
  .array(quantitySchema)
  .min(1)
  .max(10)
  .refine((qs) => new Set(qs).size === qs.length, { message: 'each quantity once' });

export const createProbeRequestSchema = z
  .object({
    label: z.string().trim().min(1).max(80),
    /** The unit the probe sits in; null for a probe kept in the store. */
    unitId: z.uuid().nullable(),
    quantities: quantityList,
    /** How often the probe reports, seconds; silence is judged against it. */
    intervalSeconds: z.number().int().min(5).max(86_400).default(60),
    model: z.string().trim().min(1).max(80).nullable().optional(),
  })
  .strict();
export type CreateProbeRequest = z.infer<typeof createProbeRequestSchema>;

export const updateProbeRequestSchema = z
  .object({
    label: z.string().trim().min(1).max(80).optional(),
    unitId: z.uuid().nullable().optional(),
    quantities: quantityList.optional(),
    intervalSeconds: z.number().int().min(5).max(86_400).optional(),
    model: z.string().trim().min(1).max(80).nullable().optional(),
    /** true re-activates a deactivated probe (its old secret still works; rotate it if in doubt). */
    active: z.boolean().optional(),
  })
  .strict()
  .refine((v) => Object.keys(v).length > 0, { message: 'nothing to change' });
export type UpdateProbeRequest = z.infer<typeof updateProbeRequestSchema>;

// --- health findings (ProbeHealthService.evaluate) ---

export const probeFindingSchema = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('silent'),
    /** Newest stored reading, or null if the probe never delivered one. */
    lastReadingAt: isoTime.nullable(),
    silentForSeconds: z.number(),
    /** silentAfterMissedIntervals × intervalSeconds. */
    thresholdSeconds: z.number(),
  }),
  z.object({
    kind: z.literal('maintenance'),
    windowId: z.uuid(),
    reason: z.string(),
    endsAt: isoTime,
  }),
  z.object({
    kind: z.literal('flatline'),
    quantity: quantitySchema,
    value: z.number(),
    /** Identical readings at the end of the series (at least the threshold). */
    readings: z.number().int(),
    sinceAt: isoTime,
    minutes: z.number(),
  }),
  z.object({
    kind: z.literal('spike'),
    quantity: quantitySchema,
    /** Readings flagged suspect by ingest (implausible step) in the last 24 h. */
    suspectCount: z.number().int(),
    lastAt: isoTime,
  }),
  z.object({
    kind: z.literal('drift'),
    quantity: z.enum(['ph', 'water_temperature']),
    /** Mean of (probe − handheld) over the pairs: positive = the probe reads high. */
    meanDifference: z.number(),
    threshold: z.number(),
    pairs: z.number().int(),
  }),
  z.object({
    kind: z.literal('calibration_due'),
    quantity: quantitySchema,
    /** Due date of the newest calibration; null when the quantity was never calibrated. */
    nextDueAt: isoTime.nullable(),
    lastCalibratedAt: isoTime.nullable(),
  }),
]);
export type ProbeFinding = z.infer<typeof probeFindingSchema>;
export type ProbeFindingKind = ProbeFinding['kind'];

export const probeRejectCountSchema = z.object({
  reason: z.string(),
  count: z.number().int(),
  lastAt: isoTime,
  lastDetail: z.string().nullable(),
});

/**
 * One probe's health. `state`: inactive (deactivated), maintenance (in a maintenance window: no
 * silence or quality findings), silent, attention (any other finding), ok.
 */
export const probeHealthSchema = z.object({
  probeId: z.uuid(),
  probeKey: z.string(),
  unitId: z.uuid().nullable(),
  state: z.enum(['ok', 'attention', 'silent', 'maintenance', 'inactive']),
  lastSeenAt: isoTime.nullable(),
  lastReadingAt: isoTime.nullable(),
  batteryPct: z.number().nullable(),
  rssiDbm: z.number().nullable(),
  rejects: z.array(probeRejectCountSchema),
  findings: z.array(probeFindingSchema),
});
export type ProbeHealth = z.infer<typeof probeHealthSchema>;

/** A probe as the API answers it (its secret never leaves the server after creation or rotation). */
export const probeSchema = z.object({
  id: z.uuid(),
  farmId: z.uuid(),
  unitId: z.uuid().nullable(),
  /** MQTT username and topic segment. */
  probeKey: z.string(),
  label: z.string(),
  model: z.string().nullable(),
  quantities: z.array(quantitySchema),
  intervalSeconds: z.number().int(),
  active: z.boolean(),
  secretRotatedAt: isoTime,
  lastSeenAt: isoTime.nullable(),
  batteryPct: z.number().nullable(),
  rssiDbm: z.number().nullable(),
  createdAt: isoTime,
  health: probeHealthSchema,
});
export type ProbeDto = z.infer<typeof probeSchema>;
export const probeListResponseSchema = z.object({ probes: z.array(probeSchema) });
export const probeListQuerySchema = z.object({ unitId: z.uuid().optional() }).strict();

/** Answer to probe creation and credential rotation: the secret is shown this once and never again. */
export const probeCredentialResponseSchema = z.object({
  probe: probeSchema,
  credential: z.object({
    /** MQTT username (= probeKey). */
    username: z.string(),
    /** MQTT password. Store it in the probe now: the server keeps only a hash. */
    secret: z.string(),
    /** The only topic the probe may publish to. */
    topic: z.string(),
    issuedAt: isoTime,
  }),
});
export type ProbeCredentialResponse = z.infer<typeof probeCredentialResponseSchema>;

// --- calibrations (husbandry.md §5) ---

const calibrationCommon = {
  /** When the calibration was done; defaults to now. */
  performedAt: isoTime.optional(),
  /** When the next one is due; defaults to 30 days after performedAt (a failed one is due at once). */
  nextDueAt: isoTime.optional(),
  method: z.string().trim().min(1).max(200).optional(),
  note: z.string().trim().max(1000).nullable().optional(),
};

const buffer = z.object({ pH: z.number().min(0).max(14), mV: z.number().min(-2000).max(2000) }).strict();

export const createCalibrationRequestSchema = z.discriminatedUnion('quantity', [
  z
    .object({
      quantity: z.literal('ph'),
      /** The two calibration buffers with the electrode's mV in each (at least 0.5 pH apart). */
      buffers: z.tuple([buffer, buffer]),
      /** Optional check buffer: its nominal pH and what the calibrated probe read (must be within ±0.1). */
      check: z
        .object({ bufferPh: z.number().min(0).max(14), readPh: z.number().min(0).max(14) })
        .strict()
        .optional(),
      temperatureC: z.number().min(0).max(50).default(25),
      ...calibrationCommon,
    })
    .strict(),
  z
    .object({
      quantity: z.enum(['conductivity', 'specific_conductance', 'salinity']),
      /** The standard's nominal value and what the probe read, in the quantity's canonical unit. Pass within ±3 %. */
      standard: z.number().positive(),
      reading: z.number().min(0),
      ...calibrationCommon,
    })
    .strict(),
  z
    .object({
      quantity: z.enum(['dissolved_oxygen', 'water_temperature', 'flow', 'water_level']),
      passed: z.boolean(),
      /** What was recorded, e.g. { airSaturationPct: 100.4, pressureKpa: 101.1 }. */
      details: z.record(z.string(), z.union([z.number(), z.string(), z.boolean()])).default({}),
      ...calibrationCommon,
    })
    .strict(),
]);
export type CreateCalibrationRequest = z.infer<typeof createCalibrationRequestSchema>;

export const calibrationSchema = z.object({
  id: z.uuid(),
  probeId: z.uuid(),
  quantity: z.string(),
  performedAt: isoTime,
  performedById: z.uuid().nullable(),
  method: z.string(),
  /** pH: buffers, temperatureC, slopePct, offsetMv, limits, check; conductivity: standard, reading, errorPct. */
  details: z.record(z.string(), z.unknown()),
  passed: z.boolean(),
  nextDueAt: isoTime,
  note: z.string().nullable(),
  createdAt: isoTime,
});
export type CalibrationDto = z.infer<typeof calibrationSchema>;
export const calibrationListResponseSchema = z.object({ calibrations: z.array(calibrationSchema) });

// --- maintenance windows ---

export const createMaintenanceWindowRequestSchema = z
  .object({
    startsAt: isoTime,
    endsAt: isoTime,
    reason: z.string().trim().min(1).max(300),
  })
  .strict()
  .refine((w) => Date.parse(w.endsAt) > Date.parse(w.startsAt), { message: 'endsAt must be after startsAt', path: ['endsAt'] })
  .refine((w) => Date.parse(w.endsAt) - Date.parse(w.startsAt) <= 31 * 86_400_000, {
    message: 'a maintenance window lasts at most 31 days',
    path: ['endsAt'],
  });
export type CreateMaintenanceWindowRequest = z.infer<typeof createMaintenanceWindowRequestSchema>;

export const maintenanceWindowSchema = z.object({
  id: z.uuid(),
  probeId: z.uuid(),
  startsAt: isoTime,
  endsAt: isoTime,
  reason: z.string(),
  createdById: z.uuid().nullable(),
  createdAt: isoTime,
  /** startsAt ≤ now < endsAt. */
  current: z.boolean(),
});
export type MaintenanceWindowDto = z.infer<typeof maintenanceWindowSchema>;
export const maintenanceWindowListResponseSchema = z.object({ windows: z.array(maintenanceWindowSchema) });

// --- ingest counters ---

export const ingestCountersSchema = z.object({
  messages: z.number(),
  readingsStored: z.number(),
  readingsDuplicate: z.number(),
  rejects: z.record(z.string(), z.number()),
  refusedConnections: z.number(),
  refusedTopics: z.number(),
  writeFailures: z.number(),
});

export const ingestStatusResponseSchema = z.object({
  /** Counters of the broker in this server process since it started (all farms); null when it runs no broker. */
  broker: ingestCountersSchema.nullable(),
  /** Stored reject counts of this farm's probes, per probe and reason. */
  rejects: z.array(probeRejectCountSchema.extend({ probeId: z.uuid(), probeKey: z.string() })),
});
export type IngestStatusResponse = z.infer<typeof ingestStatusResponseSchema>;
