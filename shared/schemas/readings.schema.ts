import { z } from 'zod';
import { quantities, quantitySchema, type Quantity } from './mqtt.schema';

const isoTime = z.iso.datetime({ offset: true });

export const SERIES_MAX_POINTS = 2000;
export const SERIES_MAX_RANGE_DAYS = 400;
const DAY_MS = 86_400_000;

/** `quantities=ph,water_temperature` (or the parameter repeated); absent = every quantity of the unit's probes. */
const quantityListParam = z
  .union([z.string(), z.array(z.string())])
  .transform((v) =>
    (Array.isArray(v) ? v : [v])
      .flatMap((s) => s.split(','))
      .map((s) => s.trim())
      .filter(Boolean),
  )
  .pipe(
    z
      .array(z.enum(quantities, { message: `each quantity must be one of ${quantities.join(', ')}` }))
      .min(1)
      .max(quantities.length),
  )
  .transform((qs) => [...new Set(qs)] as Quantity[]);

export const seriesQuerySchema = z
  .object({
    quantities: quantityListParam.optional(),
    /** Start of the range (inclusive); default 24 h before `to`. */
    from: isoTime.optional(),
    /** End of the range (exclusive); default now. */
    to: isoTime.optional(),
    /** Most points per series (≤ 2000); more readings than this are averaged into time buckets. */
    maxPoints: z.coerce.number().int().min(2).max(SERIES_MAX_POINTS).default(SERIES_MAX_POINTS),
  })
  .strict()
  .transform((q, ctx) => {
    const to = q.to ? new Date(q.to) : new Date();
    const from = q.from ? new Date(q.from) : new Date(to.getTime() - DAY_MS);
    if (from.getTime() >= to.getTime()) {
      ctx.addIssue({ code: 'custom', message: '`from` must be before `to`', path: ['from'] });
      return z.NEVER;
    }
    if (to.getTime() - from.getTime() > SERIES_MAX_RANGE_DAYS * DAY_MS) {
      ctx.addIssue({ code: 'custom', message: `the range may span at most ${SERIES_MAX_RANGE_DAYS} days`, path: ['from'] });
      return z.NEVER;
    }
    return { quantities: q.quantities ?? null, from, to, maxPoints: q.maxPoints };
  });
export type SeriesQuery = z.output<typeof seriesQuerySchema>;

export const seriesPointSchema = z.object({
  /** Bucket start (or the reading time when bucketSeconds is 0). */
  t: isoTime,
  avg: z.number(),
  min: z.number(),
  max: z.number(),
  /** Readings in the bucket (raw points: 1, or more when two probes reported at the same instant). */
  n: z.number().int(),
  /** Of those, how many ingest flagged suspect or bad. */
  suspect: z.number().int(),
});
export type SeriesPoint = z.infer<typeof seriesPointSchema>;

export const seriesSchema = z.object({
  quantity: quantitySchema,
  /** Canonical unit of the values. */
  unit: z.string(),
  /** 0 = raw readings; otherwise the bucket width (buckets aligned to the Unix epoch). */
  bucketSeconds: z.number().int(),
  /** Readings in the range before downsampling. */
  readings: z.number().int(),
  points: z.array(seriesPointSchema),
});
export type SeriesDto = z.infer<typeof seriesSchema>;

export const seriesResponseSchema = z.object({
  unitId: z.uuid(),
  from: isoTime,
  to: isoTime,
  maxPoints: z.number().int(),
  /** The unit's probes that contributed (all probes currently attached to the unit). */
  probeIds: z.array(z.uuid()),
  series: z.array(seriesSchema),
});
export type SeriesResponse = z.infer<typeof seriesResponseSchema>;
