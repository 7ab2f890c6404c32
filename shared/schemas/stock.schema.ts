import { z } from 'zod';

// Stock events of a culture unit and the biomass, density and FCR worked out from them.

export const stockEventKinds = ['stocking', 'transfer_in', 'transfer_out', 'mortality', 'sample_weighing', 'harvest'] as const;
export type StockEventKind = (typeof stockEventKinds)[number];

const isoTime = z.iso.datetime({ offset: true });
const count = z.number().int('A count is a whole number of fish').min(0, 'A count cannot be negative').max(100_000_000);
const kg = z.number().finite().min(0, 'A weight cannot be negative').max(10_000_000);

/**
 * One stock event as the planner (or, for mortalities, the hand) enters it. A transfer is recorded on
 * the unit the fish leave (`transfer_out` with `relatedUnitId`); the matching `transfer_in` on the
 * other unit is created with it.
 */
export const createStockEventSchema = z
  .object({
    kind: z.enum(stockEventKinds),
    at: isoTime.optional(),
    count: count.nullish(),
    totalWeightKg: kg.nullish(),
    meanWeightG: z.number().finite().positive('A mean weight must be above 0').max(100_000).nullish(),
    sampleSize: z.number().int().min(1, 'A sample has at least one fish').max(100_000).nullish(),
    sampleSdG: z.number().finite().min(0, 'A standard deviation cannot be negative').max(100_000).nullish(),
    meanLengthCm: z.number().finite().positive().max(500).nullish(),
    relatedUnitId: z.uuid().nullish(),
    note: z.string().max(2000).nullish(),
  })
  .superRefine((e, ctx) => {
    const need = (path: keyof typeof e, message: string) => ctx.addIssue({ code: 'custom', path: [path], message });
    if (e.at && Date.parse(e.at) > Date.now() + 5 * 60_000) need('at', 'The event time is in the future');
    switch (e.kind) {
      case 'stocking':
        if (e.count == null || e.count < 1) need('count', 'Give the number of fish stocked');
        if (e.meanWeightG == null && e.totalWeightKg == null) need('meanWeightG', 'Give the mean weight or the total weight of the fish stocked');
        break;
      case 'transfer_in':
        need('kind', 'Record a transfer on the unit the fish leave (transfer_out with relatedUnitId); the matching transfer_in is created for you');
        break;
      case 'transfer_out':
        if (e.count == null || e.count < 1) need('count', 'Give the number of fish moved');
        if (!e.relatedUnitId) need('relatedUnitId', 'Say which unit the fish go to');
        break;
      case 'mortality':
        if (e.count == null) need('count', 'Give the number of dead fish picked up (0 if none)');
        break;
      case 'harvest':
        if (e.count == null) need('count', 'Give the number of fish harvested');
        break;
      case 'sample_weighing':
        if (e.sampleSize == null) need('sampleSize', 'Give how many fish were weighed');
        if (e.meanWeightG == null && e.totalWeightKg == null) need('meanWeightG', 'Give the mean weight or the total weight of the sample');
        break;
    }
    if (e.kind !== 'transfer_out' && e.relatedUnitId) need('relatedUnitId', 'Only a transfer names another unit');
  });
export type CreateStockEvent = z.infer<typeof createStockEventSchema>;

export const stockEventQuerySchema = z.object({
  from: isoTime.optional(),
  to: isoTime.optional(),
  limit: z.coerce.number().int().min(1).max(2000).default(500),
});

export const stockEventSchema = z.object({
  id: z.uuid(),
  farmId: z.uuid(),
  unitId: z.uuid(),
  kind: z.enum(stockEventKinds),
  at: z.string(),
  count: z.number().nullable(),
  totalWeightKg: z.number().nullable(),
  meanWeightG: z.number().nullable(),
  sampleSize: z.number().nullable(),
  sampleSdG: z.number().nullable(),
  meanLengthCm: z.number().nullable(),
  relatedUnitId: z.string().nullable(),
  note: z.string().nullable(),
  createdById: z.string().nullable(),
  createdAt: z.string(),
});
export type StockEventDto = z.infer<typeof stockEventSchema>;

export const createStockEventResponseSchema = z.object({
  event: stockEventSchema,
  /** The matching transfer_in on the receiving unit, for a transfer. */
  related: stockEventSchema.nullable(),
});

/** Current biomass of a unit: count, mean weight from the latest weighing (no growth added), uncertainty, density. */
export const biomassEstimateSchema = z.object({
  asOf: z.string(),
  stocked: z.boolean(),
  count: z.number(),
  meanWeightG: z.number().nullable(),
  /** Standard error of the mean weight, g (sample SD / √n). */
  meanWeightSeG: z.number().nullable(),
  sampleSize: z.number().nullable(),
  biomassKg: z.number().nullable(),
  biomassSeKg: z.number().nullable(),
  /** 95 % interval of the biomass (Student t on the sample; the count is taken as exact). */
  biomass95: z.object({ lowKg: z.number(), highKg: z.number() }).nullable(),
  meanLengthCm: z.number().nullable(),
  lengthAt: z.string().nullable(),
  /** Which event the mean weight comes from. */
  weightFrom: z.object({ eventId: z.string(), kind: z.enum(stockEventKinds), at: z.string() }).nullable(),
  weightAt: z.string().nullable(),
  /** Days since the weight was measured; no growth is assumed for them. */
  estimateAgeDays: z.number().nullable(),
  /** Set when the weight is older than the rule's limit, e.g. "Mean weight is 21 days old; weigh a sample". */
  ageWarning: z.string().nullable(),
  volumeM3: z.number().nullable(),
  areaM2: z.number().nullable(),
  densityKgPerM3: z.number().nullable(),
  kgPerHa: z.number().nullable(),
});
export type BiomassEstimateDto = z.infer<typeof biomassEstimateSchema>;

export const fcrPeriodSchema = z.object({
  fromEventId: z.string(),
  toEventId: z.string(),
  from: z.string(),
  to: z.string(),
  days: z.number(),
  feedKg: z.number(),
  feedings: z.number(),
  startBiomassKg: z.number(),
  endBiomassKg: z.number(),
  removedKg: z.number(),
  addedKg: z.number(),
  gainKg: z.number(),
  gainSeKg: z.number().nullable(),
  fcr: z.number().nullable(),
  fcrSe: z.number().nullable(),
  fcr95: z.object({ low: z.number(), high: z.number().nullable() }).nullable(),
  note: z.string().nullable(),
});
export type FcrPeriodDto = z.infer<typeof fcrPeriodSchema>;

export const stockPointSchema = z.object({
  eventId: z.string(),
  kind: z.enum(stockEventKinds),
  at: z.string(),
  count: z.number(),
  meanWeightG: z.number().nullable(),
  biomassKg: z.number().nullable(),
  biomassSeKg: z.number().nullable(),
});

export const unitStockSchema = z.object({
  unit: z.object({ id: z.uuid(), code: z.string(), name: z.string(), kind: z.string(), species: z.string().nullable() }),
  current: biomassEstimateSchema,
  /** Every stock event, oldest first, with the unit's state after it. */
  history: z.array(z.object({ event: stockEventSchema, after: stockPointSchema })),
  fcr: z.object({ periods: z.array(fcrPeriodSchema), overall: fcrPeriodSchema.nullable(), method: z.string() }),
  notes: z.array(z.string()),
});
export type UnitStockDto = z.infer<typeof unitStockSchema>;

export const farmStockSchema = z.object({
  asOf: z.string(),
  units: z.array(
    z.object({
      unit: z.object({ id: z.uuid(), code: z.string(), name: z.string(), kind: z.string(), species: z.string().nullable() }),
      current: biomassEstimateSchema,
      latestFcr: fcrPeriodSchema.nullable(),
    }),
  ),
});
export type FarmStockDto = z.infer<typeof farmStockSchema>;
