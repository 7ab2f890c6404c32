import { z } from 'zod';

export const treatmentProducts = ['formalin', 'copper', 'salt', 'lime', 'ammonia_binder', 'other'] as const;
const isoTime = z.iso.datetime({ offset: true });

export const createTreatmentSchema = z
  .object({
    product: z.enum(treatmentProducts),
    productName: z.string().max(200).nullish(),
    dose: z.number().finite().min(0).max(1e6).nullish(),
    doseUnit: z.string().max(40).nullish(),
    startsAt: isoTime,
    endsAt: isoTime.nullish(),
    withdrawalDays: z.number().min(0).max(3650).nullish(),
    withdrawalDegreeDays: z.number().min(0).max(100_000).nullish(),
    note: z.string().max(2000).nullish(),
  })
  .superRefine((t, ctx) => {
    if (t.endsAt && Date.parse(t.endsAt) < Date.parse(t.startsAt)) ctx.addIssue({ code: 'custom', path: ['endsAt'], message: 'The treatment cannot end before it starts' });
    if (t.withdrawalDays != null && t.withdrawalDegreeDays != null)
      ctx.addIssue({ code: 'custom', path: ['withdrawalDegreeDays'], message: 'Give the withdrawal period in days or in degree-days, not both' });
  });
export type CreateTreatment = z.infer<typeof createTreatmentSchema>;

export const withdrawalSchema = z.object({
  inWithdrawal: z.boolean(),
  endsAt: z.string().nullable(),
  /** 'fixed' for day-based periods; degree-day periods are 'projected' until the logged temperatures reach them. */
  basis: z.enum(['none', 'days', 'degree_days']),
  estimate: z.enum(['fixed', 'projected', 'reached']).nullable(),
  degreeDaysSoFar: z.number().nullable(),
  treatmentId: z.string().nullable(),
  reason: z.string().nullable(),
});
export type Withdrawal = z.infer<typeof withdrawalSchema>;

export const treatmentSchema = z.object({
  id: z.uuid(),
  unitId: z.uuid(),
  product: z.enum(treatmentProducts),
  productName: z.string().nullable(),
  dose: z.number().nullable(),
  doseUnit: z.string().nullable(),
  startsAt: z.string(),
  endsAt: z.string().nullable(),
  withdrawalDays: z.number().nullable(),
  withdrawalDegreeDays: z.number().nullable(),
  withdrawal: withdrawalSchema,
  note: z.string().nullable(),
  createdById: z.string().nullable(),
  createdAt: z.string(),
});

export const observationKinds = ['water_colour', 'streaking', 'off_feed', 'dead_fish', 'odour', 'gasping', 'other'] as const;
/** Signs of a die-off: the unit goes on closer watch (daily tests due). */
export const dieOffKinds: ReadonlyArray<(typeof observationKinds)[number]> = ['dead_fish', 'gasping', 'off_feed'];

export const createObservationSchema = z.object({
  clientId: z.uuid().nullish(),
  kind: z.enum(observationKinds),
  detail: z.string().max(2000).nullish(),
  count: z.number().int().min(0).max(10_000_000).nullish(),
  observedAt: isoTime.optional(),
});
export type CreateObservation = z.infer<typeof createObservationSchema>;

export const observationSchema = z.object({
  id: z.uuid(),
  unitId: z.uuid(),
  kind: z.enum(observationKinds),
  detail: z.string().nullable(),
  count: z.number().nullable(),
  photoUrl: z.string().nullable(),
  observedAt: z.string(),
  createdById: z.string().nullable(),
  closeWatchUntil: z.string().nullable(),
});

export const taskSchema = z.object({
  unitId: z.uuid(),
  code: z.string(),
  name: z.string(),
  kind: z.string(),
  state: z.string(),
  walkOrder: z.number(),
  analyte: z.literal('total_ammonia'),
  everyDays: z.number(),
  lastTestAt: z.string().nullable(),
  dueDay: z.string(),
  status: z.enum(['overdue', 'due', 'upcoming']),
  daysOverdue: z.number(),
  reason: z.string(),
});
export const tasksResponseSchema = z.object({ day: z.string(), timeZone: z.string(), tests: z.array(taskSchema) });
export type Task = z.infer<typeof taskSchema>;
