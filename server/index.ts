import 'reflect-metadata';
import { createServer } from 'node:http';
import { createServer as createHttpsServer } from 'node:https';
import { createApp } from './app';
import { env } from './config/env';
import { createServices } from './container';
import { createDataSource } from './db/data-source';
import { startBroker } from './ingest/broker';
import { createLogger } from './lib/logger';
import { createSmtpMailer } from './lib/mailer';
import { createRedis } from './lib/redis';
import { createShutdown } from './lib/shutdown';
import { ensureCertificate } from './lib/tls';
import { HealthService } from './modules/health/health.service';
import { createQueues } from './queues';

const config = env();
const logger = createLogger({ level: config.LOG_LEVEL, name: 'server' });
const shutdown = createShutdown(logger);

const ds = createDataSource(config.DATABASE_URL, { poolSize: 20 });
await ds.initialize();
shutdown.add('database', () => ds.destroy());

const redis = createRedis(config.REDIS_URL, 'gillwise-server');
shutdown.add('redis', () => redis.quit());
const queues = createQueues(redis, config.QUEUE_PREFIX);
shutdown.add('queues', () => queues.close());
const mailer = createSmtpMailer({ host: config.SMTP_HOST, port: config.SMTP_PORT, from: config.MAIL_FROM });
shutdown.add('mailer', () => mailer.close());

const services = createServices({ config, ds, redis, queues, mailer, logger });
const broker = await startBroker({ config, ds, queues, services, logger: logger.child({ component: 'ingest' }) });
shutdown.add('broker', () => broker.close());

const health = new HealthService(ds, redis, config.QUEUE_PREFIX, () => broker.status());
const { app } = createApp({ config, logger, services, health, broker });
const server = createServer(app);
server.listen(config.HTTP_PORT, config.HTTP_HOST, () => {
  logger.info({ url: `http://${config.HTTP_HOST}:${config.HTTP_PORT}`, mqttPort: config.MQTT_PORT }, 'Gillwise server listening');
});
if (config.HTTPS_PORT) {
  const tls = await ensureCertificate(config.DATA_DIR);
  const secure = createHttpsServer({ key: tls.key, cert: tls.cert }, app);
  secure.listen(config.HTTPS_PORT, config.HTTPS_HOST, () => logger.info({ port: config.HTTPS_PORT, host: config.HTTPS_HOST, certificate: tls.path }, 'HTTPS listening (self-signed)'));
  shutdown.add('https', () => new Promise<void>((done) => { secure.close(() => done()); secure.closeAllConnections(); }));
}
// Stop taking HTTP first (registered last, runs first), then the broker, queues, Redis and the database.
shutdown.add('http', () => new Promise<void>((done) => { server.close(() => done()); server.closeAllConnections(); }));
