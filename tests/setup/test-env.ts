// Configuration for app code under test, in the shape server/config/env.ts parses
// (parseEnv(testEnvSource({ databaseUrl }))), pointing at the throwaway test stack.
import { inject } from 'vitest';

export function testEnvSource({
  databaseUrl,
  queuePrefix,
  ...overrides
}: { databaseUrl: string; queuePrefix?: string } & Record<string, string | undefined>): Record<string, string | undefined> {
  return {
    NODE_ENV: 'test',
    HTTP_HOST: '127.0.0.1',
    HTTP_PORT: '0',
    MQTT_HOST: '127.0.0.1',
    MQTT_PORT: '0',
    DATABASE_URL: databaseUrl,
    REDIS_URL: inject('redisUrl'),
    QUEUE_PREFIX: queuePrefix ?? 'gw',
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(inject('smtpPort')),
    MAIL_FAKE_API_URL: inject('mailApiUrl'),
    JWT_SECRET: 'test-only-secret-0123456789abcdef0123456789abcdef',
    LOG_LEVEL: 'silent',
    ...overrides,
  };
}
