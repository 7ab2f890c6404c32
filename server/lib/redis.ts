import { Redis } from 'ioredis';

/** BullMQ needs maxRetriesPerRequest: null on any connection it uses (stack-notes). */
export function createRedis(url: string, name: string): Redis {
  return new Redis(url, { maxRetriesPerRequest: null, connectionName: name, lazyConnect: false });
}
