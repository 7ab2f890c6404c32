import { z } from 'zod';

const isoTime = z.iso.datetime({ offset: true });

export const unitKinds = ['pond', 'raceway', 'tank'] as const;
export const waterTypes = ['fresh', 'brackish', 'marine'] as const;
export const unitStates = ['active', 'cycling', 'fallow'] as const;
export const unitKindSchema = z.enum(unitKinds);
export const waterTypeSchema = z.enum(waterTypes);
/** active: established biofilter; cycling: new or re-started, tested daily; fallow: empty. */
export const unitStateSchema = z.enum(unitStates);

/** Rings are limited so one outline cannot carry a megabyte of points. */
const MAX_POSITIONS = 2000;

/**
 * A GeoJSON Polygon (RFC 7946 §3.1.6) in WGS 84 lon/lat: one outer ring, optional holes; each ring
 * closed (first position = last) with at least 4 positions. Messages name the ring and position,
 * because the error answer lists them under the `outline` field.
 */
export const polygonSchema = z
  .object({
    type: z.literal('Polygon'),
    coordinates: z
      .array(z.array(z.array(z.number())))
      .min(1, 'a polygon needs an outer ring')
      .max(50),
  })
  .strict()
  .superRefine((poly, ctx) => {
    const issue = (message: string, path: Array<string | number>) =>
      ctx.addIssue({ code: 'custom', message, path: ['coordinates', ...path] });
    poly.coordinates.forEach((ring, r) => {
      if (ring.length < 4) issue(`ring ${r} has ${ring.length} positions; a closed ring needs at least 4`, [r]);
      if (ring.length > MAX_POSITIONS) issue(`ring ${r} has more than ${MAX_POSITIONS} positions`, [r]);
      ring.forEach((pos, i) => {
        if (pos.length < 2 || pos.length > 3) return issue(`ring ${r} position ${i} must be [longitude, latitude]`, [r, i]);
        const [lon, lat] = pos as [number, number];
        if (!(lon >= -180 && lon <= 180)) issue(`ring ${r} position ${i}: longitude ${lon} is outside −180…180`, [r, i, 0]);
        if (!(lat >= -90 && lat <= 90)) issue(`ring ${r} position ${i}: latitude ${lat} is outside −90…90`, [r, i, 1]);
      });
      const first = ring[0];
      const last = ring[ring.length - 1];
      if (first && last && ring.length >= 2 && (first[0] !== last[0] || first[1] !== last[1])) {
        issue(`ring ${r} is not closed: its first and last positions differ`, [r]);
      }
      const distinct = new Set(ring.slice(0, -1).map((p) => `${p[0]},${p[1]}`));
      if (ring.length >= 4 && distinct.size < 3) issue(`ring ${r} needs at least 3 distinct corners`, [r]);
    });
  });
export type PolygonDto = z.infer<typeof polygonSchema>;

const code = z
  .string()
  .trim()
  .min(1)
  .max(32)
  .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, 'letters, digits, dot, underscore or hyphen, e.g. P1 or R-03');

const unitFields = {
  code,
  name: z.string().trim().min(1).max(120),
  kind: unitKindSchema,
  /** Outline on the farm map; null for units without one (indoor tanks). */
  outline: polygonSchema.nullable(),
  /** Water surface, m². When absent it is computed from the outline. */
  areaM2: z.number().positive().max(1e8).nullable(),
  volumeM3: z.number().positive().max(1e8).nullable(),
  waterType: waterTypeSchema,
  /** Used when no probe or handheld salinity is available (‰). */
  defaultSalinityPpt: z.number().min(0).max(45),
  species: z.string().trim().min(1).max(60).nullable(),
  lifeStage: z.string().trim().min(1).max(60).nullable(),
  state: unitStateSchema,
  /** Days between routine ammonia tests; null = the rule for its state (cycling daily, established weekly). */
  testFrequencyDays: z.number().int().min(1).max(365).nullable(),
  /** Position on the walking route of rounds (ascending). */
  walkOrder: z.number().int().min(0).max(100_000),
  thresholdProfileId: z.uuid().nullable(),
  /** Crude protein fraction of the feed in use (0.32 = 32 %), for the ammonia load. */
  feedProteinFraction: z.number().min(0.05).max(0.8),
};

export const createUnitRequestSchema = z
  .object({
    code: unitFields.code,
    name: unitFields.name,
    kind: unitFields.kind,
    outline: unitFields.outline.optional(),
    areaM2: unitFields.areaM2.optional(),
    volumeM3: unitFields.volumeM3.optional(),
    waterType: unitFields.waterType.default('fresh'),
    defaultSalinityPpt: unitFields.defaultSalinityPpt.default(0),
    species: unitFields.species.optional(),
    lifeStage: unitFields.lifeStage.optional(),
    state: unitFields.state.default('active'),
    testFrequencyDays: unitFields.testFrequencyDays.optional(),
    walkOrder: unitFields.walkOrder.optional(),
    thresholdProfileId: unitFields.thresholdProfileId.optional(),
    feedProteinFraction: unitFields.feedProteinFraction.default(0.32),
  })
  .strict();
export type CreateUnitRequest = z.infer<typeof createUnitRequestSchema>;

/** Only the fields sent change. Changing the outline without an area recomputes the area. */
export const updateUnitRequestSchema = z
  .object(
    Object.fromEntries(Object.entries(unitFields).map(([k, s]) => [k, s.optional()])) as {
      [K in keyof typeof unitFields]: z.ZodOptional<(typeof unitFields)[K]>;
    },
  )
  .strict()
  .refine((v) => Object.keys(v).length > 0, { message: 'nothing to change' });
export type UpdateUnitRequest = z.infer<typeof updateUnitRequestSchema>;

const polygonOut = z.object({ type: z.literal('Polygon'), coordinates: z.array(z.array(z.array(z.number()))) });

/** A culture unit as the API answers it. */
export const unitSchema = z.object({
  id: z.uuid(),
  farmId: z.uuid(),
  code: z.string(),
  name: z.string(),
  kind: unitKindSchema,
  outline: polygonOut.nullable(),
  areaM2: z.number().nullable(),
  volumeM3: z.number().nullable(),
  waterType: waterTypeSchema,
  defaultSalinityPpt: z.number(),
  species: z.string().nullable(),
  lifeStage: z.string().nullable(),
  state: unitStateSchema,
  testFrequencyDays: z.number().int().nullable(),
  /** Id printed in the unit's QR label; resolve with GET /api/farms/:farmId/labels/:qrLabelId. */
  qrLabelId: z.string(),
  walkOrder: z.number().int(),
  thresholdProfileId: z.uuid().nullable(),
  feedProteinFraction: z.number(),
  /** Until when the unit is under closer watch (set by observations); tests are due daily until then. */
  closeWatchUntil: isoTime.nullable(),
  createdAt: isoTime,
  updatedAt: isoTime,
});
export type UnitDto = z.infer<typeof unitSchema>;
export const unitListResponseSchema = z.object({ units: z.array(unitSchema) });

export const unitListQuerySchema = z
  .object({
    kind: unitKindSchema.optional(),
    state: unitStateSchema.optional(),
  })
  .strict();

export const unitLabelResponseSchema = z.object({
  unitId: z.uuid(),
  farmId: z.uuid(),
  code: z.string(),
  name: z.string(),
  qrLabelId: z.string(),
  /** What the QR code encodes: the pondside test screen of this unit. */
  url: z.url(),
  /** The QR code as an SVG document (print it with the code and name beside it). */
  svg: z.string(),
});
export type UnitLabelResponse = z.infer<typeof unitLabelResponseSchema>;

export const labelParamsSchema = z.object({
  farmId: z.uuid(),
  qrLabelId: z
    .string()
    .min(1)
    .max(100)
    .regex(/^[A-Za-z0-9_-]+$/),
});

export const labelResolveResponseSchema = z.object({
  farmId: z.uuid(),
  unitId: z.uuid(),
  code: z.string(),
  name: z.string(),
  kind: unitKindSchema,
  /** Client path of the pondside test screen for this unit. */
  testPath: z.string(),
});
export type LabelResolveResponse = z.infer<typeof labelResolveResponseSchema>;

// --- flow (raceways and tanks) ---

export const flowSources = ['manual', 'design'] as const;

export const createFlowRequestSchema = z
  .object({
    /** When the flow was measured; defaults to now. */
    measuredAt: isoTime.optional(),
    flowLpm: z.number().min(0).max(1e6),
    /** manual: measured by hand (bucket and stopwatch, weir); design: the design flow (manager/admin). */
    source: z.enum(flowSources).default('manual'),
    note: z.string().trim().max(500).nullable().optional(),
  })
  .strict();
export type CreateFlowRequest = z.infer<typeof createFlowRequestSchema>;

export const flowMeasurementSchema = z.object({
  id: z.uuid(),
  unitId: z.uuid(),
  measuredAt: isoTime,
  flowLpm: z.number(),
  source: z.enum(flowSources),
  note: z.string().nullable(),
  recordedById: z.uuid().nullable(),
  createdAt: isoTime,
});
export type FlowMeasurementDto = z.infer<typeof flowMeasurementSchema>;

/** The flow that counts now: the newest of the probe flow readings and the manual/design measurements. */
export const latestFlowSchema = z.object({
  flowLpm: z.number(),
  at: isoTime,
  source: z.enum(['probe', 'manual', 'design']),
  /** The probe for source 'probe', else null. */
  probeId: z.uuid().nullable(),
  /** The measurement for 'manual'/'design', else null. */
  measurementId: z.uuid().nullable(),
});
export type LatestFlow = z.infer<typeof latestFlowSchema>;

export const flowListQuerySchema = z
  .object({
    limit: z.coerce.number().int().min(1).max(500).default(100),
  })
  .strict();

export const flowListResponseSchema = z.object({
  /** Newest first. */
  items: z.array(flowMeasurementSchema),
  latest: latestFlowSchema.nullable(),
});
