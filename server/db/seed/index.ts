import 'reflect-metadata';
import { env } from '../../config/env';
import { createDataSource } from '../data-source';
import { createRedis } from '../../lib/redis';
import { createQueues } from '../../queues';
import { seedDemo } from './seed';
import { storeSimulatedHistory } from './history';

// `npm run db:seed`: the invented demo farms. Safe to run again: an existing demo farm is left as it is.
const config = env();
const ds = createDataSource(config.DATABASE_URL, { poolSize: 4 });
await ds.initialize();
const credentialsFile = config.PROBE_CREDENTIALS_FILE ?? `${config.DATA_DIR}/probe-credentials.json`;
try {
  const result = await seedDemo(ds, {
    brokerUrl: `mqtt://${config.MQTT_HOST}:${config.MQTT_PORT}`,
    credentialsFile,
    history: storeSimulatedHistory,
  });
  if (result.created) {
    // The worker turns each seeded kit result into a free-ammonia result, as it would for a real entry.
    const redis = createRedis(config.REDIS_URL, 'gillwise-seed');
    const queues = createQueues(redis, config.QUEUE_PREFIX);
    for (const id of result.waterTestIds) {
      await queues.add('computeWaterTest', { farmId: result.farms['harrow-bend']!, waterTestId: id, version: 1 }, { jobId: `wt:${id}:1` });
    }
    // Every stocked unit gets today's feed recommendation, also those without a kit result yet.
    for (const farmId of Object.values(result.farms)) await queues.add('recommendFeed', { farmId }, { jobId: `seed-feed-${farmId}` });
    await queues.close();
    await redis.quit();
    process.stdout.write(`demo farms seeded (${result.probes.length} probes, ${result.waterTestIds.length} kit results); credentials in ${credentialsFile}\n`);
  } else {
    process.stdout.write('demo farm already present; nothing to seed\n');
  }
} finally {
  await ds.destroy();
}
