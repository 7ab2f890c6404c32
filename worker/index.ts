import 'reflect-metadata';
import { hostname } from 'node:os';
import { Worker } from 'bullmq';
import { queueNames } from '../shared/schemas/jobs.schema';
import { env } from '../server/config/env';
import { createServices } from '../server/container';
import { createDataSource } from '../server/db/data-source';
import { createLogger } from '../server/lib/logger';
import { createSmtpMailer } from '../server/lib/mailer';
import { createRedis } from '../server/lib/redis';
import { createShutdown } from '../server/lib/shutdown';
import { WORKER_HEARTBEAT_TTL_SECONDS, workerHeartbeatKey } from '../server/modules/health/health.service';
import { createQueues } from '../server/queues';
import { createProcessors } from './processors';
import './processors/register';

const config = env();
const logger = createLogger({ level: config.LOG_LEVEL, name: 'worker' });
const shutdown = createShutdown(logger, 15_000);
const workerId = `${hostname()}-${process.pid}`;

const ds = createDataSource(config.DATABASE_URL, { poolSize: 10 });
await ds.initialize();
shutdown.add('database', () => ds.destroy());
const redis = createRedis(config.REDIS_URL, 'gillwise-worker');
shutdown.add('redis', () => redis.quit());
const queues = createQueues(redis, config.QUEUE_PREFIX);
shutdown.add('queues', () => queues.close());
const mailer = createSmtpMailer({ host: config.SMTP_HOST, port: config.SMTP_PORT, from: config.MAIL_FROM });
shutdown.add('mailer', () => mailer.close());
const services = createServices({ config, ds, redis, queues, mailer, logger });

const processors = createProcessors({ services, queues, logger });
const workers: Worker[] = [];
for (const name of queueNames) {
  const worker = new Worker(name, (job) => processors.run(name, job), {
    connection: { url: config.REDIS_URL, maxRetriesPerRequest: null },
    prefix: config.QUEUE_PREFIX,
    concurrency: name === 'evaluations' ? 4 : 2,
    // Short stall checks so a killed worker's jobs are picked up again within seconds, not 30 s.
    stalledInterval: 5000,
    maxStalledCount: 3,
    lockDuration: 15000,
  });
  worker.on('failed', (job, err) => logger.warn({ queue: name, job: job?.name, id: job?.id, err: err.message }, 'job failed'));
  worker.on('error', (err) => logger.error({ queue: name, err: err.message }, 'worker error'));
  workers.push(worker);
}
shutdown.add('workers', () => Promise.all(workers.map((w) => w.close())));
await processors.schedule();

// The heartbeat the server's /api/health reports.
const beat = () =>
  redis
    .set(workerHeartbeatKey(config.QUEUE_PREFIX, workerId), new Date().toISOString(), 'EX', WORKER_HEARTBEAT_TTL_SECONDS)
    .catch((err: unknown) => logger.warn({ err }, 'heartbeat failed'));
await beat();
const heartbeat = setInterval(() => void beat(), 10_000);
shutdown.add('heartbeat', async () => {
  clearInterval(heartbeat);
  await redis.del(workerHeartbeatKey(config.QUEUE_PREFIX, workerId)).catch(() => 0);
});
logger.info({ workerId, queues: queueNames }, 'Gillwise worker ready');
