import { z } from 'zod';

export const farmRoles = ['hand', 'manager', 'planner'] as const;
export const roles = ['hand', 'manager', 'planner', 'admin'] as const;
export type FarmRole = (typeof farmRoles)[number];
export type Role = (typeof roles)[number];
export const roleSchema = z.enum(roles);

export const locales = ['en', 'es'] as const;
export type Locale = (typeof locales)[number];

export const displayPrefsSchema = z.object({
  temperatureUnit: z.enum(['C', 'F']).default('C'),
  concentrationUnit: z.enum(['mg/L', 'ppm']).default('mg/L'),
  ammoniaBasis: z.enum(['nh3', 'nh3-n']).default('nh3'),
});
export type DisplayPrefs = z.infer<typeof displayPrefsSchema>;

export const loginRequestSchema = z.object({
  email: z.email().max(254),
  password: z.string().min(1).max(200),
});
export type LoginRequest = z.infer<typeof loginRequestSchema>;

export const passwordResetRequestSchema = z.object({ email: z.email().max(254) });
export const passwordResetConfirmSchema = z.object({
  token: z.string().min(20).max(200),
  password: z.string().min(10, 'at least 10 characters').max(200),
});

export const meUserSchema = z.object({
  id: z.uuid(),
  email: z.string(),
  name: z.string(),
  locale: z.enum(locales),
  isAdmin: z.boolean(),
  prefs: displayPrefsSchema,
});
export const meFarmSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  slug: z.string(),
  timeZone: z.string(),
  role: roleSchema,
});
export const meResponseSchema = z.object({ user: meUserSchema, farms: z.array(meFarmSchema) });
export type MeResponse = z.infer<typeof meResponseSchema>;
export type MeFarm = z.infer<typeof meFarmSchema>;

export const updateMeRequestSchema = z.object({
  name: z.string().min(1).max(120).optional(),
  locale: z.enum(locales).optional(),
  prefs: displayPrefsSchema.partial().optional(),
});

/** Every API error has this shape. */
export const apiErrorSchema = z.object({
  error: z.object({ code: z.string(), message: z.string(), details: z.unknown().optional() }),
});
export type ApiError = z.infer<typeof apiErrorSchema>;

/** Header browsers must send with mutations (CSRF guard); JSON bodies are accepted without it. */
export const CLIENT_HEADER = 'x-gillwise-client';
