import { z } from 'zod';

// Threshold profiles: per-species limits with a basis and a source label on every rule. The unit
// evaluation (server/modules/alerts) compares the unit's latest values with these; docs/alerts.md.

const isoTime = z.iso.datetime({ offset: true });

export const thresholdMetrics = [
  'nh3',
  'tan',
  'nitrite',
  'ph_min',
  'ph_max',
  'temperature_min',
  'temperature_max',
  'do_min',
  'flow_min',
  'salinity_max',
] as const;
export type ThresholdMetric = (typeof thresholdMetrics)[number];

/** Which way a limit points: an upper limit alarms above it, a lower limit below it. */
export const metricDirection: Record<ThresholdMetric, 'upper' | 'lower'> = {
  nh3: 'upper',
  tan: 'upper',
  nitrite: 'upper',
  ph_min: 'lower',
  ph_max: 'upper',
  temperature_min: 'lower',
  temperature_max: 'upper',
  do_min: 'lower',
  flow_min: 'lower',
  salinity_max: 'upper',
};

/** The bases a rule of each metric may be written in (the evaluation converts the measured value to it). */
export const metricBases: Record<ThresholdMetric, readonly string[]> = {
  nh3: ['mg/L NH3', 'mg/L NH3-N'],
  tan: ['mg/L TAN'],
  nitrite: ['mg/L NO2-N', 'mg/L NO2'],
  ph_min: ['pH'],
  ph_max: ['pH'],
  temperature_min: ['°C'],
  temperature_max: ['°C'],
  do_min: ['mg/L DO'],
  flow_min: ['L/min'],
  salinity_max: ['ppt'],
};

/**
 * Hysteresis (docs/alerts.md): an open condition clears only once the value is back inside the watch
 * limit by this margin — the larger of `relative` × |limit| and `absolute` (in the rule's basis).
 * pH and temperature use fixed steps (a percentage of pH 8.8 would be 0.44 pH); concentrations, DO and
 * flow use 5 %. Product decision.
 */
export const clearMargins: Record<ThresholdMetric, { relative: number; absolute: number }> = {
  nh3: { relative: 0.05, absolute: 0 },
  tan: { relative: 0.05, absolute: 0 },
  nitrite: { relative: 0.05, absolute: 0 },
  ph_min: { relative: 0, absolute: 0.1 },
  ph_max: { relative: 0, absolute: 0.1 },
  temperature_min: { relative: 0, absolute: 0.5 },
  temperature_max: { relative: 0, absolute: 0.5 },
  do_min: { relative: 0.05, absolute: 0.2 },
  flow_min: { relative: 0.05, absolute: 0 },
  salinity_max: { relative: 0.05, absolute: 0 },
};

/** The value an open condition of `metric` must get past to clear, given the inner (watch) limit. */
export function clearsAt(metric: ThresholdMetric, limit: number): number {
  const m = clearMargins[metric];
  const margin = Math.max(m.relative * Math.abs(limit), m.absolute);
  const v = metricDirection[metric] === 'upper' ? limit - margin : limit + margin;
  return Math.round(v * 1e6) / 1e6;
}

export const salinityPointSchema = z
  .object({
    salinityPpt: z.number().min(0).max(70),
    act: z.number().finite().min(0),
    watch: z.number().finite().min(0).optional(),
  })
  .strict();

export const thresholdRuleSchema = z
  .object({
    metric: z.enum(thresholdMetrics),
    /** The first limit: crossing it raises a watch-level condition. Null when the rule has only an act limit. */
    watch: z.number().finite().nullable(),
    /** The second limit: crossing it raises an act-level condition. */
    act: z.number().finite().nullable(),
    /** What the numbers are in, e.g. 'mg/L NH3' or 'mg/L NH3-N' (see metricBases). */
    basis: z.string().min(1).max(40),
    /** Where the numbers come from, with its label (published, from memory, computed, common practice, product decision). */
    source: z.string().trim().min(3).max(600),
    /**
     * Salinity-dependent limits (e.g. whiteleg shrimp, Lin & Chen 2001), interpolated linearly at the
     * unit's salinity and held at the end points. A point without `watch` takes the rule's watch/act ratio.
     */
    bySalinity: z.array(salinityPointSchema).min(2).max(20).optional(),
  })
  .strict()
  .superRefine((r, ctx) => {
    if (r.watch === null && r.act === null) ctx.addIssue({ code: 'custom', path: ['watch'], message: 'give a watch limit, an act limit or both' });
    if (!metricBases[r.metric].includes(r.basis)) {
      ctx.addIssue({ code: 'custom', path: ['basis'], message: `for ${r.metric} the basis must be one of: ${metricBases[r.metric].join(', ')}` });
    }
    if (r.watch !== null && r.act !== null) {
      const upper = metricDirection[r.metric] === 'upper';
      if (upper ? r.watch > r.act : r.watch < r.act) {
        ctx.addIssue({
          code: 'custom',
          path: ['watch'],
          message: upper ? 'the watch limit of an upper limit must not be above its act limit' : 'the watch limit of a lower limit must not be below its act limit',
        });
      }
    }
    if (r.bySalinity) {
      if (r.metric !== 'nh3' && r.metric !== 'nitrite') {
        ctx.addIssue({ code: 'custom', path: ['bySalinity'], message: 'salinity-dependent limits are for nh3 and nitrite only' });
      }
      const s = r.bySalinity.map((p) => p.salinityPpt);
      if (s.some((v, i) => i > 0 && v <= (s[i - 1] ?? -1))) {
        ctx.addIssue({ code: 'custom', path: ['bySalinity'], message: 'list the salinity points in increasing order, each once' });
      }
    }
  });
export type ThresholdRuleDto = z.infer<typeof thresholdRuleSchema>;

/** The limits of a rule at a salinity: the bySalinity points interpolated, or the rule's own numbers. */
export function limitsAt(rule: ThresholdRuleDto, salinityPpt: number | null): { watch: number | null; act: number | null; salinityPpt: number | null } {
  const points = rule.bySalinity;
  if (!points?.length || salinityPpt === null) return { watch: rule.watch, act: rule.act, salinityPpt: null };
  const ratio = rule.watch !== null && rule.act !== null && rule.act > 0 ? rule.watch / rule.act : 0.5;
  const watchOf = (p: z.infer<typeof salinityPointSchema>) => p.watch ?? p.act * ratio;
  const first = points[0]!;
  const last = points[points.length - 1]!;
  const round = (v: number) => Math.round(v * 1e6) / 1e6;
  if (salinityPpt <= first.salinityPpt) return { watch: round(watchOf(first)), act: first.act, salinityPpt };
  if (salinityPpt >= last.salinityPpt) return { watch: round(watchOf(last)), act: last.act, salinityPpt };
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1]!;
    const b = points[i]!;
    if (salinityPpt <= b.salinityPpt) {
      const w = (salinityPpt - a.salinityPpt) / (b.salinityPpt - a.salinityPpt);
      return { act: round(a.act + w * (b.act - a.act)), watch: round(watchOf(a) + w * (watchOf(b) - watchOf(a))), salinityPpt };
    }
  }
  return { watch: rule.watch, act: rule.act, salinityPpt: null };
}

export const thresholdProfileSchema = z.object({
  id: z.uuid(),
  farmId: z.uuid(),
  name: z.string(),
  species: z.string(),
  lifeStage: z.string().nullable(),
  rules: z.array(thresholdRuleSchema),
  /** Units of the farm that use this profile. */
  unitIds: z.array(z.uuid()),
  createdAt: isoTime,
  updatedAt: isoTime,
});
export type ThresholdProfileDto = z.infer<typeof thresholdProfileSchema>;

export const thresholdProfileListResponseSchema = z.object({
  profiles: z.array(thresholdProfileSchema),
  /** Shown beside thresholds everywhere (product.md cautions). */
  caution: z.string(),
  /** The hysteresis margins, so a screen can say where an open condition clears. */
  clearMargins: z.record(z.enum(thresholdMetrics), z.object({ relative: z.number(), absolute: z.number() })),
});

/** PATCH body: the profile's whole rule list (replaces it), with an optional reason for the audit trail. */
export const updateThresholdProfileRequestSchema = z
  .object({
    rules: z
      .array(thresholdRuleSchema)
      .min(1)
      .max(20)
      .refine((rules) => new Set(rules.map((r) => r.metric)).size === rules.length, { message: 'each metric once per profile' }),
    name: z.string().trim().min(1).max(120).optional(),
    reason: z.string().trim().min(3).max(500).optional(),
  })
  .strict();
export type UpdateThresholdProfileRequest = z.infer<typeof updateThresholdProfileRequestSchema>;

export const THRESHOLD_CAUTION =
  'Thresholds are guidance. Fish health decisions rest with the farm’s veterinarian or fish-health professional and with local regulations and licences.';
