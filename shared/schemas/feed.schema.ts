import { z } from 'zod';
import { biomassEstimateSchema } from './stock.schema';

// Feeding tables, the feed rule, daily rations and recommendations, planner decisions and what was fed.

export const daySchema = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'a day as YYYY-MM-DD');
const isoTime = z.iso.datetime({ offset: true });

// --- feeding tables ---------------------------------------------------------------------------

export const feedingTableRowSchema = z
  .object({
    minTemperatureC: z.number().finite().min(-5).max(50),
    maxTemperatureC: z.number().finite().min(-5).max(50),
    minWeightG: z.number().finite().min(0).max(1e6),
    maxWeightG: z.number().finite().min(0).max(1e6),
    /** % body weight per day; 0 = no feeding; −1 = hatchery-constant method; −0.5 = half of it. */
    pctBodyWeightPerDay: z.number().finite().min(-1).max(40),
    /** 7 daily, 3.5 every other day, 2 twice a week, 0 none. */
    daysPerWeek: z.number().finite().min(0).max(7),
    note: z.string().max(500).optional(),
    /** Hatchery-constant inputs for this row (rule defaults 1.2 and 0.1 cm/day when absent). */
    fcr: z.number().finite().positive().max(20).optional(),
    dailyLengthGainCm: z.number().finite().min(0).max(10).optional(),
  })
  .superRefine((r, ctx) => {
    if (r.maxTemperatureC <= r.minTemperatureC) ctx.addIssue({ code: 'custom', path: ['maxTemperatureC'], message: 'The band must end above where it starts' });
    if (r.maxWeightG <= r.minWeightG) ctx.addIssue({ code: 'custom', path: ['maxWeightG'], message: 'The weight band must end above where it starts' });
    if (r.pctBodyWeightPerDay < 0 && r.pctBodyWeightPerDay !== -1 && r.pctBodyWeightPerDay !== -0.5) {
      ctx.addIssue({ code: 'custom', path: ['pctBodyWeightPerDay'], message: 'Use a percentage ≥ 0, −1 for the hatchery-constant ration or −0.5 for half of it' });
    }
  });
export type FeedingTableRowDto = z.infer<typeof feedingTableRowSchema>;

export const feedingTableSchema = z.object({
  id: z.uuid(),
  farmId: z.uuid(),
  species: z.string(),
  name: z.string(),
  /** Where the numbers come from, with the reference's label (published, from memory, product decision). */
  source: z.string(),
  maxKgPerHaPerDay: z.number().nullable(),
  rows: z.array(feedingTableRowSchema),
});
export type FeedingTableDto = z.infer<typeof feedingTableSchema>;

export const patchFeedingTableSchema = z
  .object({
    name: z.string().min(1).max(200).optional(),
    source: z.string().min(1).max(1000).optional(),
    maxKgPerHaPerDay: z.number().finite().positive().max(10_000).nullable().optional(),
    /** The whole list of rows, replacing the stored ones. */
    rows: z.array(feedingTableRowSchema).min(1).max(100).optional(),
    reason: z.string().max(500).optional(),
  })
  .strict();
export type PatchFeedingTable = z.infer<typeof patchFeedingTableSchema>;

// --- the feed rule ----------------------------------------------------------------------------

const pct = z.number().finite().min(0).max(100);
const hours = z.number().finite().min(0).max(24 * 60);
const speciesNumbers = z.record(z.string(), z.number().finite().min(0).max(1000));

export const feedRuleSchema = z.object({
  criticalDoMgL: speciesNumbers,
  doRecoveryMarginMgL: z.number().finite().min(0).max(10),
  dawnWindowHours: z.number().finite().min(0).max(12),
  doMaxAgeHours: hours,
  doAlertKinds: z.array(z.string().max(64)).max(20),
  ammonia: z.object({
    watchCutPct: pct,
    actCutPct: pct,
    risingExtraCutPct: pct,
    trendResults: z.number().int().min(2).max(10),
    maxCutPct: pct,
    maxResultAgeHours: hours,
  }),
  treatment: z.object({ skipWithinHours: hours, cutWithinHours: hours, cutPct: pct }),
  dieOffKinds: z.array(z.string().max(64)).max(20),
  noteKinds: z.array(z.string().max(64)).max(20),
  raceway: z.object({
    reducedFlowFraction: z.number().finite().min(0).max(1),
    reducedFlowCutPct: pct,
    inletTanMgL: z.number().finite().min(0).max(100),
    flowReadingMaxAgeHours: hours,
  }),
  loading: z.object({
    densityIndexMax: z.number().finite().positive().max(100),
    flowIndexMax: z.number().finite().positive().max(10),
    densityCapKgPerM3: speciesNumbers,
    minExchangesPerHour: z.number().finite().min(0).max(100),
  }),
  temperatureScaling: z.record(z.string(), z.object({ zeroAtC: z.number().finite(), fullAtC: z.number().finite(), source: z.string().max(500) })),
  hatcheryConstant: z.object({ fcr: z.number().finite().positive().max(20), dailyLengthGainCm: z.number().finite().min(0).max(10) }),
  temperatureMeanHours: z.number().finite().min(1).max(168),
  weightStaleDays: z.number().finite().min(1).max(365),
});
export type FeedRuleDto = z.infer<typeof feedRuleSchema>;

/** A farm's changes to the rule: any part, merged key by key over the defaults. */
export const feedRulePatchSchema = z
  .object({
    criticalDoMgL: speciesNumbers,
    doRecoveryMarginMgL: feedRuleSchema.shape.doRecoveryMarginMgL,
    dawnWindowHours: feedRuleSchema.shape.dawnWindowHours,
    doMaxAgeHours: hours,
    doAlertKinds: feedRuleSchema.shape.doAlertKinds,
    ammonia: feedRuleSchema.shape.ammonia.partial().strict(),
    treatment: feedRuleSchema.shape.treatment.partial().strict(),
    dieOffKinds: feedRuleSchema.shape.dieOffKinds,
    noteKinds: feedRuleSchema.shape.noteKinds,
    raceway: feedRuleSchema.shape.raceway.partial().strict(),
    loading: feedRuleSchema.shape.loading.partial().strict(),
    temperatureScaling: feedRuleSchema.shape.temperatureScaling,
    hatcheryConstant: feedRuleSchema.shape.hatcheryConstant.partial().strict(),
    temperatureMeanHours: feedRuleSchema.shape.temperatureMeanHours,
    weightStaleDays: feedRuleSchema.shape.weightStaleDays,
  })
  .partial()
  .strict();
export type FeedRulePatch = z.infer<typeof feedRulePatchSchema>;

export const updateFeedRuleSchema = z.object({
  /** The farm's whole set of changes (replaces the previous one); {} returns to the defaults. */
  overrides: feedRulePatchSchema,
  reason: z.string().max(500).optional(),
});

export const feedRuleResponseSchema = z.object({
  version: z.string(),
  rule: feedRuleSchema,
  defaults: feedRuleSchema,
  overrides: z.record(z.string(), z.unknown()),
  sources: z.record(z.string(), z.string()),
});

// --- rations and recommendations --------------------------------------------------------------

export const feedActions = ['feed', 'cut', 'withhold'] as const;
export const recommendationStatuses = ['pending', 'accepted', 'overridden'] as const;

export const feedReasonSchema = z.object({
  code: z.string(),
  text: z.string(),
  source: z.string().nullable(),
  effect: z.enum(['withhold', 'cut', 'cap', 'note']),
});
export type FeedReasonDto = z.infer<typeof feedReasonSchema>;

/** A proposal computed after the planner decided: kept beside the decision, never over it. */
export const laterProposalSchema = z.object({
  computedAt: z.string(),
  action: z.enum(feedActions),
  cutPct: z.number(),
  plannedKg: z.number(),
  recommendedKg: z.number(),
  reasons: z.array(feedReasonSchema),
  ruleVersion: z.string(),
});

export const recommendationSchema = z.object({
  id: z.uuid(),
  farmId: z.uuid(),
  unitId: z.uuid(),
  day: z.string(),
  biomassKg: z.number(),
  plannedKg: z.number(),
  plannedPctBw: z.number(),
  action: z.enum(feedActions),
  cutPct: z.number(),
  recommendedKg: z.number(),
  reasons: z.array(feedReasonSchema),
  /** Every input the rule used (biomass, temperature, DO, ammonia, flow, treatments, observations, the rule). */
  inputs: z.record(z.string(), z.unknown()),
  ruleVersion: z.string(),
  status: z.enum(recommendationStatuses),
  approvedKg: z.number().nullable(),
  overrideNote: z.string().nullable(),
  decidedById: z.string().nullable(),
  decidedAt: z.string().nullable(),
  computedAt: z.string(),
  createdAt: z.string(),
  /** The newest proposal computed after the decision, if it differs from the decided one. */
  laterProposal: laterProposalSchema.nullable(),
});
export type RecommendationDto = z.infer<typeof recommendationSchema>;

export const rationPlanSchema = z.object({
  status: z.enum(['ok', 'not_feeding_day', 'out_of_band', 'no_plan']),
  text: z.string(),
  steps: z.array(z.string()),
  method: z.enum(['table', 'hatchery_constant', 'none']),
  tableId: z.string().nullable(),
  tableName: z.string().nullable(),
  tableSource: z.string().nullable(),
  rowIndex: z.number().nullable(),
  row: feedingTableRowSchema.nullable(),
  tablePctBw: z.number().nullable(),
  temperatureFactor: z.number().nullable(),
  pctBodyWeightPerDay: z.number(),
  uncappedKg: z.number(),
  capKg: z.number().nullable(),
  capApplied: z.boolean(),
  plannedKg: z.number(),
  daysPerWeek: z.number().nullable(),
  feedingDay: z.boolean(),
  nextFeedingDay: z.string().nullable(),
  temperature: z.object({
    temperatureC: z.number().nullable(),
    basis: z.enum(['probe_mean', 'probe_latest', 'kit_result', 'none']),
    text: z.string(),
    readings: z.number(),
    from: z.string().nullable(),
    to: z.string().nullable(),
  }),
});
export type RationPlanDto = z.infer<typeof rationPlanSchema>;

/** Piper et al. (1982) loading beside the ration (raceways and tanks; density for every unit). */
export const loadingSchema = z.object({
  biomassKg: z.number().nullable(),
  volumeM3: z.number().nullable(),
  densityKgPerM3: z.number().nullable(),
  densityCapKgPerM3: z.number().nullable(),
  lengthCm: z.number().nullable(),
  flowLpm: z.number().nullable(),
  densityIndex: z.number().nullable(),
  densityIndexMax: z.number(),
  flowIndex: z.number().nullable(),
  flowIndexMax: z.number(),
  capacityKg: z.number().nullable(),
  capacityByDensityKg: z.number().nullable(),
  capacityByFlowKg: z.number().nullable(),
  governedBy: z.enum(['density', 'flow']).nullable(),
  /** Capacity at the design flow, for comparison when the flow is reduced. */
  designCapacityKg: z.number().nullable(),
  overCapacity: z.boolean().nullable(),
  exchangesPerHour: z.number().nullable(),
  minExchangesPerHour: z.number(),
  notes: z.array(z.string()),
  source: z.string(),
});
export type LoadingDto = z.infer<typeof loadingSchema>;

export const flowSchema = z.object({
  flowLpm: z.number().nullable(),
  source: z.enum(['probe', 'measurement', 'design', 'none']),
  at: z.string().nullable(),
  designFlowLpm: z.number().nullable(),
  pctOfDesign: z.number().nullable(),
  reduced: z.boolean(),
});

/** TAN produced by the ration; for raceways the rise at the current flow and the most feed under the NH3 target. */
export const ammoniaLoadSchema = z.object({
  proteinFraction: z.number(),
  plannedKg: z.number(),
  plannedTanKgPerDay: z.number(),
  recommendedKg: z.number().nullable(),
  recommendedTanKgPerDay: z.number().nullable(),
  flow: flowSchema.nullable(),
  inletTanMgL: z.number().nullable(),
  plannedTanRiseMgL: z.number().nullable(),
  pH: z.number().nullable(),
  temperatureC: z.number().nullable(),
  salinityPpt: z.number().nullable(),
  fraction: z.number().nullable(),
  plannedNh3MgL: z.number().nullable(),
  targetNh3MgL: z.number().nullable(),
  targetNh3NMgL: z.number().nullable(),
  targetSource: z.string().nullable(),
  maxFeedKgPerDay: z.number().nullable(),
  check: z.enum(['under', 'over', 'unknown', 'not_raceway']),
  notes: z.array(z.string()),
  source: z.string(),
});
export type AmmoniaLoadDto = z.infer<typeof ammoniaLoadSchema>;

export const unitSummarySchema = z.object({
  id: z.uuid(),
  code: z.string(),
  name: z.string(),
  kind: z.string(),
  species: z.string().nullable(),
  walkOrder: z.number(),
});

/** The live plan of one unit for a day (nothing stored), beside the stored recommendation. */
export const unitRationSchema = z.object({
  day: z.string(),
  unit: unitSummarySchema,
  biomass: biomassEstimateSchema,
  plan: rationPlanSchema,
  loading: loadingSchema,
  ammoniaLoad: ammoniaLoadSchema,
  proposal: z.object({
    action: z.enum(feedActions),
    cutPct: z.number(),
    recommendedKg: z.number(),
    reasons: z.array(feedReasonSchema),
    ruleVersion: z.string(),
  }),
  recommendation: recommendationSchema.nullable(),
});
export type UnitRationDto = z.infer<typeof unitRationSchema>;

export const feedingResponses = ['eager', 'normal', 'slow', 'refused'] as const;

export const feedingRecordSchema = z.object({
  id: z.uuid(),
  farmId: z.uuid(),
  unitId: z.uuid(),
  day: z.string(),
  fedKg: z.number(),
  withheld: z.boolean(),
  reason: z.string().nullable(),
  response: z.enum(feedingResponses).nullable(),
  fedAt: z.string(),
  recordedById: z.string().nullable(),
  createdAt: z.string(),
});
export type FeedingRecordDto = z.infer<typeof feedingRecordSchema>;

export const rationSheetRowSchema = z.object({
  unit: unitSummarySchema,
  recommendation: recommendationSchema.nullable(),
  plannedKg: z.number().nullable(),
  recommendedKg: z.number().nullable(),
  approvedKg: z.number().nullable(),
  status: z.enum(['pending', 'accepted', 'overridden', 'none']),
  action: z.enum(feedActions).nullable(),
  reasons: z.array(feedReasonSchema),
  /** What the hands should feed: the approved amount once decided, null while the proposal waits. */
  toFeedKg: z.number().nullable(),
  feeding: feedingRecordSchema.nullable(),
  fedKg: z.number().nullable(),
  withheld: z.boolean().nullable(),
});
export type RationSheetRowDto = z.infer<typeof rationSheetRowSchema>;

export const rationSheetSchema = z.object({
  farmId: z.uuid(),
  day: z.string(),
  today: z.string(),
  rows: z.array(rationSheetRowSchema),
  totals: z.object({
    plannedKg: z.number(),
    recommendedKg: z.number(),
    approvedKg: z.number(),
    fedKg: z.number(),
    pending: z.number(),
    decided: z.number(),
    fed: z.number(),
  }),
  caution: z.string(),
});
export type RationSheetDto = z.infer<typeof rationSheetSchema>;

export const dayQuerySchema = z.object({ day: daySchema.optional() });
export const recomputeSchema = z.object({ day: daySchema.optional() });

export const overrideRecommendationSchema = z.object({
  approvedKg: z.number({ message: 'Enter the ration in kg' }).finite().min(0, 'A ration cannot be negative').max(100_000),
  note: z.string().trim().min(3, 'Say why the recommendation is overridden').max(2000),
});
export type OverrideRecommendation = z.infer<typeof overrideRecommendationSchema>;

export const acceptRecommendationSchema = z.object({ note: z.string().max(2000).optional() });

export const acceptDaySchema = z.object({
  day: daySchema,
  /** Only these units; all pending units of the day when absent. */
  unitIds: z.array(z.uuid()).max(500).optional(),
});

export const acceptDayResponseSchema = z.object({
  day: z.string(),
  accepted: z.array(recommendationSchema),
  skipped: z.array(z.object({ id: z.string(), unitId: z.string(), status: z.enum(recommendationStatuses) })),
});

export const createFeedingSchema = z
  .object({
    day: daySchema,
    fedKg: z.number({ message: 'Enter the feed in kg' }).finite().min(0, 'Feed cannot be negative').max(100_000),
    withheld: z.boolean().default(false),
    reason: z.string().trim().max(2000).nullish(),
    response: z.enum(feedingResponses).nullish(),
    fedAt: isoTime.optional(),
  })
  .superRefine((f, ctx) => {
    if (f.withheld && f.fedKg > 0) ctx.addIssue({ code: 'custom', path: ['fedKg'], message: 'Feed withheld means 0 kg fed' });
    if (f.withheld && !f.reason) ctx.addIssue({ code: 'custom', path: ['reason'], message: 'Say why feed was withheld' });
    if (f.fedAt && Date.parse(f.fedAt) > Date.now() + 5 * 60_000) ctx.addIssue({ code: 'custom', path: ['fedAt'], message: 'The feeding time is in the future' });
  });
export type CreateFeeding = z.infer<typeof createFeedingSchema>;

export const feedingQuerySchema = z.object({ from: daySchema.optional(), to: daySchema.optional() });

export const recomputeResponseSchema = z.object({
  day: z.string(),
  computed: z.number(),
  failed: z.array(z.object({ unitId: z.string(), message: z.string() })),
  sheet: rationSheetSchema,
});

export const feedingResponseSchema = z.object({ feeding: feedingRecordSchema, replaced: z.boolean() });

/** A farm's stored rule overrides (farm settings `feedRule`), or {} when absent or not valid. */
export function feedRuleOverridesFrom(settings: unknown): FeedRulePatch {
  const raw = settings && typeof settings === 'object' ? (settings as Record<string, unknown>).feedRule : undefined;
  const parsed = feedRulePatchSchema.safeParse(raw ?? {});
  return parsed.success ? parsed.data : {};
}
