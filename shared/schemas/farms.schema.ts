import { z } from 'zod';
import { displayPrefsSchema, roleSchema } from './auth.schema';
import { quantitySchema } from './mqtt.schema';

const isoTime = z.iso.datetime({ offset: true });

/** True when the runtime's Intl knows the IANA time zone (e.g. 'America/Chicago'). */
export function isValidTimeZone(timeZone: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone }).format(0);
    return true;
  } catch {
    return false;
  }
}

export const timeZoneSchema = z
  .string()
  .min(1)
  .max(64)
  .refine(isValidTimeZone, { message: 'not a time zone this server knows (use an IANA name such as America/Chicago)' });

const localTime = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'a local time as HH:MM (24 h)');

/**
 * Farm settings, all of them. Stored settings are partial; the server merges them over the defaults
 * (server/db/entities/farm.entity.ts defaultFarmSettings) so responses always carry every field.
 */
export const farmSettingsSchema = z.object({
  /** 'auto' applies the default rule (Emerson 1975 below 0.5 ‰, Khoo 1977 above). */
  freeAmmoniaMethod: z.enum(['auto', 'emerson1975', 'khoo1977', 'cw95-total']),
  /** How far from a kit test a probe reading may be to be used for it, minutes. */
  probeWindowMinutes: z.number().int().min(1).max(240),
  /** Hours after a formalin/copper/binder treatment during which a Nessler result is flagged. */
  nesslerInterferenceHours: z.number().int().min(0).max(720),
  morningReportLocalTime: localTime,
  /** Minutes an alert may stay unacknowledged before the next person on call is e-mailed. */
  escalationMinutes: z.number().int().min(1).max(1440),
  realertMinutes: z.number().int().min(1).max(10080),
  /** A probe is silent after this many missed reporting intervals. */
  silentAfterMissedIntervals: z.number().int().min(1).max(1000),
  dawnLocalTime: localTime,
  duskLocalTime: localTime,
});
export type FarmSettingsDto = z.infer<typeof farmSettingsSchema>;
export const farmSettingsPatchSchema = farmSettingsSchema.partial().strict();

const slugSchema = z
  .string()
  .min(2)
  .max(40)
  .regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'lower-case letters, digits and single hyphens, e.g. harrow-bend');

/** A farm as the API answers it. `role` is the caller's role on the farm ('admin' for admins without a membership). */
export const farmSchema = z.object({
  id: z.uuid(),
  slug: z.string(),
  name: z.string(),
  timeZone: z.string(),
  longitude: z.number().nullable(),
  latitude: z.number().nullable(),
  /** Every setting, stored values merged over the defaults. */
  settings: farmSettingsSchema,
  /** Farm-wide display defaults (units people see); each user's own prefs override them. */
  displayPrefs: displayPrefsSchema,
  role: roleSchema,
  createdAt: isoTime,
  updatedAt: isoTime,
});
export type FarmDto = z.infer<typeof farmSchema>;
export const farmListResponseSchema = z.object({ farms: z.array(farmSchema) });

export const createFarmRequestSchema = z
  .object({
    slug: slugSchema,
    name: z.string().trim().min(1).max(120),
    timeZone: timeZoneSchema,
    longitude: z.number().min(-180).max(180).nullable().optional(),
    latitude: z.number().min(-90).max(90).nullable().optional(),
    settings: farmSettingsPatchSchema.optional(),
    displayPrefs: displayPrefsSchema.partial().strict().optional(),
  })
  .strict();
export type CreateFarmRequest = z.infer<typeof createFarmRequestSchema>;

export const updateFarmRequestSchema = z
  .object({
    name: z.string().trim().min(1).max(120).optional(),
    timeZone: timeZoneSchema.optional(),
    longitude: z.number().min(-180).max(180).nullable().optional(),
    latitude: z.number().min(-90).max(90).nullable().optional(),
    /** Merged into the stored settings; a field set to its default stays stored (explicit). */
    settings: farmSettingsPatchSchema.optional(),
    displayPrefs: displayPrefsSchema.partial().strict().optional(),
  })
  .strict()
  .refine((v) => Object.keys(v).length > 0, { message: 'nothing to change' });
export type UpdateFarmRequest = z.infer<typeof updateFarmRequestSchema>;

// --- farm status (the live farm map) ---

/** Status of a unit (product.md): clear ●, watch ▲, act ◆, silent ○. */
export const unitStatusLevelSchema = z.enum(['clear', 'watch', 'act', 'silent']);
export type UnitStatusLevel = z.infer<typeof unitStatusLevelSchema>;

/** The unit's newest free-ammonia result, as the results module supplies it (null until it does). */
export const latestResultSchema = z.object({
  id: z.uuid(),
  waterTestId: z.uuid(),
  sampledAt: isoTime,
  status: z.enum(['ok', 'needs_ph', 'needs_temperature', 'invalid_input']),
  tanMgL: z.number().nullable(),
  nh3NMgL: z.number().nullable(),
  nh3MgL: z.number().nullable(),
  ph: z.number().nullable(),
  temperatureC: z.number().nullable(),
  salinityPpt: z.number().nullable(),
  method: z.string().nullable(),
  /** Today's forecast peak from the unit's diurnal curve, when there was enough probe history. */
  forecastPeak: z.object({ nh3MgL: z.number(), nh3NMgL: z.number(), at: isoTime, localTime: z.string() }).nullable().optional(),
  flags: z.array(z.object({ code: z.string(), message: z.string() })).optional(),
});
export type LatestResult = z.infer<typeof latestResultSchema>;

/** The newest reading of one quantity on a unit (across its probes), in the canonical unit. */
export const latestValueSchema = z.object({
  value: z.number(),
  /** Canonical unit of the quantity (shared/schemas/mqtt.schema canonicalUnit). */
  unit: z.string(),
  at: isoTime,
  quality: z.enum(['good', 'suspect', 'bad']),
  probeId: z.uuid(),
});
export type LatestValue = z.infer<typeof latestValueSchema>;

const polygonOut = z.object({ type: z.literal('Polygon'), coordinates: z.array(z.array(z.array(z.number()))) });

export const unitStatusSchema = z.object({
  id: z.uuid(),
  code: z.string(),
  name: z.string(),
  kind: z.enum(['pond', 'raceway', 'tank']),
  state: z.enum(['active', 'cycling', 'fallow']),
  waterType: z.enum(['fresh', 'brackish', 'marine']),
  walkOrder: z.number().int(),
  outline: polygonOut.nullable(),
  /** Newest value per quantity, only for quantities that have readings. */
  latest: z.partialRecord(quantitySchema, latestValueSchema),
  /** Newest reading time of any quantity; null when the unit has no readings. */
  lastReadingAt: isoTime.nullable(),
  /** From the injected UnitStatusProvider (alerts); null while none is installed or it knows nothing. */
  status: unitStatusLevelSchema.nullable(),
  /** From the injected LatestResultProvider (free-ammonia results); null while none is installed. */
  latestResult: latestResultSchema.nullable(),
});
export type UnitStatusDto = z.infer<typeof unitStatusSchema>;

export const farmStatusResponseSchema = z.object({
  farmId: z.uuid(),
  timeZone: z.string(),
  /** The farm-local calendar day at generatedAt (YYYY-MM-DD). */
  localDay: z.string(),
  generatedAt: isoTime,
  units: z.array(unitStatusSchema),
});
export type FarmStatusResponse = z.infer<typeof farmStatusResponseSchema>;
