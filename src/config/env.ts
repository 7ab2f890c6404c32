import { z } from 'zod';

/** Client configuration, read once from Vite's import.meta.env. Nothing else reads import.meta.env. */
const envSchema = z.object({
  MODE: z.string(),
  DEV: z.boolean(),
  PROD: z.boolean(),
  BASE_URL: z.string().default('/'),
  /** Prefix for API calls; empty means same origin (the dev server proxies /api). */
  VITE_API_BASE_URL: z
    .string()
    .default('')
    .refine((v) => v === '' || v.startsWith('/') || /^https?:\/\//.test(v), 'must be empty, a path or an http(s) URL')
    .transform((v) => v.replace(/\/$/, '')),
  VITE_APP_VERSION: z.string().default('0.1.0'),
});

export type ClientEnv = z.infer<typeof envSchema>;

function parseEnv(raw: Record<string, unknown>): ClientEnv {
  const result = envSchema.safeParse(raw);
  if (!result.success) {
    const problems = result.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
    throw new Error(`Gillwise client configuration is invalid: ${problems}`);
  }
  return result.data;
}

export const env = parseEnv(import.meta.env as unknown as Record<string, unknown>);
