// A whole Gillwise server for one test file: its own database (cloned from the migrated template),
// its own BullMQ prefix, the shared test Redis and SMTP fake. Optionally the MQTT broker on a free
// port, the worker's processors in-process, and an HTTP listener serving the built client.
import 'reflect-metadata';
import { createServer, type Server } from 'node:http';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Worker } from 'bullmq';
import type { Redis } from 'ioredis';
import type { DataSource } from 'typeorm';
import { queueNames, type QueueName } from '../../shared/schemas/jobs.schema';
import { createApp } from '../../server/app';
import { parseEnv, type Env } from '../../server/config/env';
import { createServices, type Services } from '../../server/container';
import { createDataSource } from '../../server/db/data-source';
import { startBroker, type BrokerHandle } from '../../server/ingest/broker';
import { createLogger } from '../../server/lib/logger';
import { createSmtpMailer } from '../../server/lib/mailer';
import { createRedis } from '../../server/lib/redis';
import { HealthService } from '../../server/modules/health/health.service';
import { createQueues, type Queues } from '../../server/queues';
import { createProcessors } from '../../worker/processors';
import '../../worker/processors/register';
import { createTestDatabase } from './test-db';
import { testEnvSource } from './test-env';
import { uniqueQueuePrefix } from './test-db';

export type TestApp = {
  config: Env;
  ds: DataSource;
  redis: Redis;
  queues: Queues;
  services: Services;
  app: ReturnType<typeof createApp>['app'];
  routes: ReturnType<typeof createApp>['routes'];
  broker: BrokerHandle | null;
  baseUrl: string | null;
  /** Resolves when every queue is drained (waiting, active and delayed all empty). */
  drain(options?: { timeoutMs?: number; queues?: QueueName[] }): Promise<void>;
  close(): Promise<void>;
};

export type TestAppOptions = {
  broker?: boolean;
  worker?: boolean;
  listen?: boolean;
  serveClient?: boolean;
  env?: Record<string, string>;
};

export async function startTestApp(options: TestAppOptions = {}): Promise<TestApp> {
  const db = await createTestDatabase();
  const queuePrefix = uniqueQueuePrefix();
  // Uploads, photos and credential files of this test app live in a folder of its own.
  const dataDir = mkdtempSync(join(tmpdir(), 'gillwise-app-'));
  const config = parseEnv(testEnvSource({ databaseUrl: db.databaseUrl, queuePrefix, DATA_DIR: dataDir, ...options.env }));
  const logger = createLogger({ level: process.env.GILLWISE_TEST_LOG ?? 'silent', name: 'test' });
  const ds = createDataSource(config.DATABASE_URL, { poolSize: 8 });
  await ds.initialize();
  const redis = createRedis(config.REDIS_URL, 'gillwise-test');
  const queues = createQueues(redis, queuePrefix);
  const mailer = createSmtpMailer({ host: config.SMTP_HOST, port: config.SMTP_PORT, from: config.MAIL_FROM });
  const services = createServices({ config, ds, redis, queues, mailer, logger });
  const broker = options.broker ? await startBroker({ config, ds, queues, services, logger }) : null;
  const workers: Worker[] = [];
  let heartbeat: NodeJS.Timeout | null = null;
  if (options.worker) {
    const processors = createProcessors({ services, queues, logger });
    for (const name of queueNames) {
      workers.push(
        new Worker(name, (job) => processors.run(name, job), {
          connection: { url: config.REDIS_URL, maxRetriesPerRequest: null },
          prefix: queuePrefix,
          concurrency: 2,
          stalledInterval: 2000,
        }),
      );
    }
    const key = `${queuePrefix}:heartbeat:worker:test`;
    await redis.set(key, 'test', 'EX', 30);
    heartbeat = setInterval(() => void redis.set(key, 'test', 'EX', 30), 10_000);
  }
  const health = new HealthService(ds, redis, queuePrefix, () => broker?.status() ?? { status: 'down', detail: 'not started in this test' });
  const { app, routes } = createApp({
    config,
    logger,
    services,
    health,
    authLimits: { perIp: 10_000, perEmail: 10_000, windowMs: 60_000 },
    clientDir: options.serveClient ? 'dist/client' : null,
    ...(broker ? { broker } : {}),
  });
  let server: Server | null = null;
  let baseUrl: string | null = null;
  if (options.listen || options.serveClient) {
    server = createServer(app);
    await new Promise<void>((resolve) => server?.listen(0, '127.0.0.1', () => resolve()));
    const addr = server.address();
    baseUrl = typeof addr === 'object' && addr ? `http://127.0.0.1:${addr.port}` : null;
  }
  return {
    config,
    ds,
    redis,
    queues,
    services,
    app,
    routes,
    broker,
    baseUrl,
    async drain({ timeoutMs = 15_000, queues: names = [...queueNames] }: { timeoutMs?: number; queues?: QueueName[] } = {}) {
      const deadline = Date.now() + timeoutMs;
      for (;;) {
        let busy = 0;
        for (const name of names) {
          const c = await queues.queue(name).getJobCounts('waiting', 'active', 'delayed', 'prioritized', 'waiting-children');
          busy += Object.values(c).reduce((a, b) => a + b, 0);
        }
        if (!busy) return;
        if (Date.now() > deadline) throw new Error(`queues not drained after ${timeoutMs} ms`);
        await new Promise((r) => setTimeout(r, 50));
      }
    },
    async close() {
      if (heartbeat) clearInterval(heartbeat);
      if (server) await new Promise<void>((resolve) => { server?.close(() => resolve()); server?.closeAllConnections(); });
      await Promise.all(workers.map((w) => w.close()));
      await broker?.close();
      await queues.close();
      await redis.quit();
      mailer.close();
      await ds.destroy();
      await db.drop();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}
