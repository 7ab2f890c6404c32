import { z } from 'zod';

// Probe quantities and the units a probe may report them in. Ingest normalises every value to the
// first (canonical) unit of its list before storing.
export const quantityUnits = {
  ph: ['pH'],
  water_temperature: ['C', 'F'],
  salinity: ['ppt', 'psu'],
  conductivity: ['mS/cm', 'uS/cm'], // in-situ conductivity; needs water_temperature in the same sample
  specific_conductance: ['mS/cm', 'uS/cm'], // referenced to 25 °C
  dissolved_oxygen: ['mg/L'],
  flow: ['L/min', 'm3/h', 'gpm'],
  water_level: ['m', 'cm'],
  aerator_running: ['bool'],
  pump_running: ['bool'],
} as const;

export type Quantity = keyof typeof quantityUnits;
export const quantities = Object.keys(quantityUnits) as [Quantity, ...Quantity[]];
export const quantitySchema = z.enum(quantities);

/** Canonical unit stored for each quantity. */
export const canonicalUnit: Record<Quantity, string> = Object.fromEntries(
  Object.entries(quantityUnits).map(([q, units]) => [q, units[0]]),
) as Record<Quantity, string>;

const isoTime = z.iso.datetime({ offset: true });

export const readingValueSchema = z
  .object({
    quantity: quantitySchema,
    value: z.number().finite(),
    unit: z.string().min(1).max(16),
  })
  .strict()
  .refine((r) => (quantityUnits[r.quantity] as readonly string[]).includes(r.unit), {
    message: 'unit not allowed for this quantity',
    path: ['unit'],
  });

export const readingSampleSchema = z
  .object({
    at: isoTime,
    values: z.array(readingValueSchema).min(1).max(32),
  })
  .strict();

/** Payload of gillwise/v1/probes/<probeKey>/readings. One message may carry a probe's buffer. */
export const probeReadingsPayloadSchema = z
  .object({
    v: z.literal(1),
    sentAt: isoTime.optional(),
    batteryPct: z.number().min(0).max(100).optional(),
    rssiDbm: z.number().min(-150).max(0).optional(),
    samples: z.array(readingSampleSchema).min(1).max(1000),
  })
  .strict();

export type ReadingValue = z.infer<typeof readingValueSchema>;
export type ReadingSample = z.infer<typeof readingSampleSchema>;
export type ProbeReadingsPayload = z.infer<typeof probeReadingsPayloadSchema>;

/** Largest payload the broker accepts on a readings topic, in bytes. */
export const MAX_READINGS_PAYLOAD_BYTES = 256 * 1024;

/** Format of the probe credential file the seed writes (mode 600) and the simulator reads. */
export const probeCredentialFileSchema = z.object({
  brokerUrl: z.string(),
  probes: z.array(
    z.object({
      probeKey: z.string(),
      secret: z.string(),
      farmSlug: z.string(),
      unitCode: z.string(),
      unitKind: z.enum(['pond', 'raceway', 'tank']),
      waterType: z.enum(['fresh', 'brackish', 'marine']),
      salinityPpt: z.number(),
      species: z.string(),
      quantities: z.array(quantitySchema),
      intervalSeconds: z.number().int().positive(),
      scenario: z.string().default('steady'),
      /** Unit the probe reports water temperature in (some demo probes use °F to exercise normalisation). */
      temperatureUnit: z.enum(['C', 'F']).optional(),
      /** The farm's time zone and position, so the simulator's sun and weather follow the farm's local day. */
      farmTimeZone: z.string().optional(),
      latitude: z.number().min(-90).max(90).optional(),
      longitude: z.number().min(-180).max(180).optional(),
      /** Unit geometry the simulator's model uses (design flow of a raceway, water depth). */
      designFlowLpm: z.number().positive().optional(),
      depthM: z.number().positive().optional(),
    }),
  ),
});
export type ProbeCredentialFile = z.infer<typeof probeCredentialFileSchema>;
