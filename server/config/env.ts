import { z } from 'zod';

// Configuration is read from the environment once, here, and nowhere else (house style §3).
// scripts/start.mjs and the test harness set these; defaults suit a developer's loopback stack.
const schema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  HTTP_HOST: z.string().default('127.0.0.1'),
  HTTP_PORT: z.coerce.number().int().min(0).max(65535).default(8080),
  HTTPS_PORT: z.coerce.number().int().min(0).max(65535).optional(),
  /** HTTPS is for phones on the farm network, so it listens on every interface unless told otherwise. */
  HTTPS_HOST: z.string().default('0.0.0.0'),
  PUBLIC_URL: z.url().default('http://127.0.0.1:8080'),
  DATABASE_URL: z.string().default('postgres://postgres@127.0.0.1:54329/gillwise'),
  REDIS_URL: z.string().default('redis://127.0.0.1:63799'),
  QUEUE_PREFIX: z.string().default('gw'),
  MQTT_HOST: z.string().default('127.0.0.1'),
  MQTT_PORT: z.coerce.number().int().min(0).max(65535).default(18830),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  MAIL_FROM: z.string().default('Gillwise <alerts@gillwise.invalid>'),
  MAIL_FAKE_API_URL: z.string().default('http://127.0.0.1:2526'),
  JWT_SECRET: z.string().min(32).default('dev-only-secret-change-me-0123456789abcdef'),
  JWT_TTL_SECONDS: z.coerce.number().int().positive().default(3600),
  DATA_DIR: z.string().default('.data'),
  PROBE_CREDENTIALS_FILE: z.string().optional(),
  CLIENT_DIST_DIR: z.string().default('dist/client'),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  INGEST_BATCH_MAX: z.coerce.number().int().positive().default(5000),
  INGEST_FLUSH_MS: z.coerce.number().int().positive().default(50),
});

export type Env = z.infer<typeof schema>;

export function parseEnv(source: Record<string, string | undefined> = process.env): Env {
  const result = schema.safeParse(source);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Invalid configuration:\n${lines.join('\n')}`);
  }
  return result.data;
}

let cached: Env | undefined;
/** The process configuration, parsed once. */
export function env(): Env {
  cached ??= parseEnv();
  return cached;
}
