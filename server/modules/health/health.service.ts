import type { Redis } from 'ioredis';
import type { DataSource } from 'typeorm';

export type CheckResult = { status: 'ok' | 'down'; detail?: string };
export type HealthReport = { status: 'ok' | 'degraded'; checks: Record<'database' | 'redis' | 'broker' | 'worker', CheckResult> };

export const WORKER_HEARTBEAT_TTL_SECONDS = 30;
export const workerHeartbeatKey = (prefix: string, workerId: string) => `${prefix}:heartbeat:worker:${workerId}`;

const CHECK_TIMEOUT_MS = 2000;
function withTimeout(check: Promise<CheckResult>): Promise<CheckResult> {
  let timer: NodeJS.Timeout | undefined;
  const late = new Promise<CheckResult>((resolve) => {
    timer = setTimeout(() => resolve({ status: 'down', detail: `no answer within ${CHECK_TIMEOUT_MS} ms` }), CHECK_TIMEOUT_MS);
  });
  return Promise.race([check, late]).finally(() => clearTimeout(timer));
}

export class HealthService {
  constructor(
    private readonly ds: DataSource,
    private readonly redis: Redis,
    private readonly queuePrefix: string,
    private readonly brokerStatus: () => CheckResult,
  ) {}

  async report(): Promise<HealthReport> {
    // Each check answers within 2 s: a store that hangs is reported down, not a health page that hangs.
    const [database, redis, worker] = await Promise.all([withTimeout(this.database()), withTimeout(this.redisCheck()), withTimeout(this.worker())]);
    const checks = { database, redis, broker: this.brokerStatus(), worker };
    const status = Object.values(checks).every((c) => c.status === 'ok') ? 'ok' : 'degraded';
    return { status, checks };
  }

  private async database(): Promise<CheckResult> {
    try {
      await this.ds.query('SELECT 1');
      return { status: 'ok' };
    } catch (err) {
      return { status: 'down', detail: err instanceof Error ? err.message : 'unreachable' };
    }
  }
  private async redisCheck(): Promise<CheckResult> {
    try {
      return (await this.redis.ping()) === 'PONG' ? { status: 'ok' } : { status: 'down' };
    } catch (err) {
      return { status: 'down', detail: err instanceof Error ? err.message : 'unreachable' };
    }
  }
  private async worker(): Promise<CheckResult> {
    try {
      const keys = await this.redis.keys(workerHeartbeatKey(this.queuePrefix, '*'));
      return keys.length ? { status: 'ok', detail: `${keys.length} worker(s)` } : { status: 'down', detail: 'no worker heartbeat' };
    } catch {
      return { status: 'down', detail: 'redis unreachable' };
    }
  }
}
