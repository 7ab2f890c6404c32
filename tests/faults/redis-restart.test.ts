// Redis (a dedicated one, appendonly yes + appendfsync everysec as scripts/stack/redis.mjs runs it)
// goes away twice: a hard kill (SIGKILL) with jobs waiting and no worker running, and a restart
// (SIGTERM) while a worker child process is busy with them. Queued jobs survive both and processing
// resumes by itself: every kit test gets its one free-ammonia result.
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { signedIn } from '../factories/session';
import { queueNames } from '../../shared/schemas/jobs.schema';
import { startTestApp, type TestApp } from '../setup/test-app';
import { testEnvSource } from '../setup/test-env';
import { startDedicatedRedis, type DedicatedRedis } from './support/dedicated-stack';
import { countRows, report } from './support/fixture';
import { errorLines, sleep, startWorkerProcess, waitFor, type ChildHandle } from './support/processes';

const QUEUED_BEFORE_KILL = 60;
const QUEUED_BEFORE_RESTART = 120;
const POSTED_DURING_RESTART = 10;

let redis: DedicatedRedis;
let t: TestApp;
let farmId: string;
let unitIds: string[];
let worker: ChildHandle | null = null;

beforeAll(async () => {
  redis = await startDedicatedRedis();
  t = await startTestApp({ env: { REDIS_URL: redis.url } });
  // This process's own Queue objects report the outage on 'error' (BullMQ prints it when unheard).
  for (const name of queueNames) t.queues.queue(name).on('error', () => undefined);
  t.redis.on('error', () => undefined);
  const seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
  unitIds = ['P1', 'P2', 'P3', 'P4'].map((c) => seed.units[`harrow-bend:${c}`]).filter((id): id is string => Boolean(id));
});

afterAll(async () => {
  await worker?.kill();
  await t?.close();
  await redis?.destroy();
});

async function counts() {
  const c = await t.queues.queue('results').getJobCounts('waiting', 'active', 'delayed', 'completed', 'failed', 'prioritized');
  return { waiting: c.waiting ?? 0, active: c.active ?? 0, delayed: c.delayed ?? 0, completed: c.completed ?? 0, failed: c.failed ?? 0 };
}

async function postTests(agent: Awaited<ReturnType<typeof signedIn>>, n: number, offset: number): Promise<string[]> {
  const ids: string[] = [];
  for (let i = 0; i < n; i += 10) {
    const batch = await Promise.all(
      Array.from({ length: Math.min(10, n - i) }, (_, j) =>
        agent.post(`/api/farms/${farmId}/units/${unitIds[(i + j) % unitIds.length]!}/tests`).send({
          clientId: randomUUID(),
          analyte: 'total_ammonia',
          method: 'salicylate',
          basis: 'tan-n',
          value: 1 + ((i + j) % 7) / 10,
          sampledAt: new Date(Date.now() - (offset + i + j + 1) * 60_000).toISOString(),
          handheldPh: 7.9,
          handheldTemperatureC: 25,
        }),
      ),
    );
    for (const res of batch) {
      if (res.status !== 201) throw new Error(`POST test: ${res.status} ${JSON.stringify(res.body)}`);
      ids.push(res.body.id as string);
    }
  }
  return ids;
}

describe('Redis restarted with append-only persistence', () => {
  it('keeps queued jobs through a hard kill and a restart, and processing resumes', async () => {
    const started = Date.now();
    const agent = await signedIn(t.app, demoEmail('hand'));

    // 1. Jobs waiting, no worker, Redis killed without a chance to flush. appendfsync everysec:
    //    what was written more than a second before the kill is on disk.
    const first = await postTests(agent, QUEUED_BEFORE_KILL, 0);
    expect((await counts()).waiting).toBe(QUEUED_BEFORE_KILL);
    await sleep(1500);
    await redis.kill();
    await redis.start();
    const afterKill = await waitFor('Redis to answer again', () => counts(), 15_000, 100);
    expect(afterKill.waiting).toBe(QUEUED_BEFORE_KILL);

    // 2. More jobs, a worker busy with them, and a restart (SIGTERM) in the middle.
    const second = await postTests(agent, QUEUED_BEFORE_RESTART, QUEUED_BEFORE_KILL);
    const total = QUEUED_BEFORE_KILL + QUEUED_BEFORE_RESTART;
    worker = await startWorkerProcess(
      testEnvSource({ databaseUrl: t.config.DATABASE_URL, queuePrefix: t.config.QUEUE_PREFIX, REDIS_URL: redis.url, LOG_LEVEL: 'info' }),
      'worker',
    );
    const workerPid = worker.pid;
    const atRestart = await waitFor('the worker to be part way through', async () => {
      const c = await counts();
      return c.completed >= total / 5 ? c : null;
    }, 60_000, 5);
    await redis.stop();
    const downAt = Date.now();
    // Kit results recorded while Redis is away: the API waits for Redis (ioredis queues the
    // command) rather than dropping the job.
    const during = postTests(agent, POSTED_DURING_RESTART, total);
    const healthT0 = Date.now();
    const health = await request(t.app).get('/api/health').timeout(2500).then(
      (res) => ({ status: res.status, redis: (res.body as { checks?: { redis?: { status: string } } }).checks?.redis?.status ?? '' }),
      (err: Error) => ({ status: 0, redis: err.message }),
    );
    const healthMs = Date.now() - healthT0;
    await sleep(Math.max(0, 1000 - healthMs));
    await redis.start();
    const downMs = Date.now() - downAt;
    const third = await during;
    const all = [...first, ...second, ...third];
    const grand = all.length;
    const done = await waitFor('every job to complete after the restart', async () => {
      const c = await counts();
      return c.completed >= grand ? c : null;
    }, 90_000, 200);
    const results = await countRows(t.ds, 'SELECT count(*)::int AS n FROM free_ammonia_results WHERE water_test_id = ANY($1::uuid[])', [all]);
    report('Redis SIGKILL with jobs queued, then SIGTERM restart mid-batch', {
      queuedBeforeKill: QUEUED_BEFORE_KILL,
      waitingAfterKill: afterKill.waiting,
      queuedBeforeRestart: QUEUED_BEFORE_RESTART,
      completedAtRestart: atRestart.completed,
      postedDuringRestart: POSTED_DURING_RESTART,
      redisDownMs: downMs,
      completed: done.completed,
      failed: done.failed,
      results,
      lost: grand - results,
      seconds: ((Date.now() - started) / 1000).toFixed(1),
      workerErrorLines: errorLines(worker!).length,
      healthDuringOutage: `${health.status}/${health.redis}`,
      healthMs,
    });
    // Not asserted: /api/health waits for Redis while it is away (ioredis queues the PING with
    // maxRetriesPerRequest null) instead of answering "redis down" — a known gap in docs/security.md,
    // reported in the line above as healthDuringOutage.
    expect(worker.alive()).toBe(true);
    expect(worker.pid).toBe(workerPid);
    expect(done.failed).toBe(0);
    expect(results).toBe(grand);
    // While Redis is away the worker logs connection errors, and a job active across the restart can
    // lose its lock (BullMQ then moves it back and runs it again): expected, as long as nothing else is.
    const expected = /ECONNREFUSED|ECONNRESET|Connection is closed|Missing lock for job|Lock mismatch/;
    expect(errorLines(worker).filter((l) => !expected.test(l))).toEqual([]);
  });
});
