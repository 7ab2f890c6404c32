// The worker is SIGKILLed in the middle of a batch of kit-result jobs (no graceful shutdown: the
// active jobs keep their locks until they expire). A new worker picks the stalled jobs up again
// (stalledInterval 5 s, lockDuration 15 s in worker/index.ts) and every job completes with one
// free-ammonia result per kit test, and no alert is opened twice for the same condition.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { signedIn } from '../factories/session';
import { startTestApp, type TestApp } from '../setup/test-app';
import { countRows, report } from './support/fixture';
import { errorLines, startWorkerProcess, waitFor, type ChildHandle } from './support/processes';
import { testEnvSource } from '../setup/test-env';

const TESTS = 150;

let t: TestApp;
let farmId: string;
let unitIds: string[];
let worker: ChildHandle | null = null;

beforeAll(async () => {
  // The API in this process (no worker in it); the worker runs as a child process on the same
  // database and queue prefix.
  t = await startTestApp();
  const seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
  unitIds = ['P1', 'P2', 'P3', 'P4', 'P5', 'P6'].map((c) => seed.units[`harrow-bend:${c}`]).filter((id): id is string => Boolean(id));
});

afterAll(async () => {
  await worker?.kill();
  await t?.close();
});

const workerEnv = () =>
  testEnvSource({ databaseUrl: t.config.DATABASE_URL, queuePrefix: t.config.QUEUE_PREFIX, LOG_LEVEL: 'info', REDIS_URL: t.config.REDIS_URL });

async function resultsQueueCounts() {
  const c = await t.queues.queue('results').getJobCounts('waiting', 'active', 'delayed', 'completed', 'failed', 'prioritized');
  return { waiting: c.waiting ?? 0, active: c.active ?? 0, delayed: c.delayed ?? 0, completed: c.completed ?? 0, failed: c.failed ?? 0 };
}

describe('a worker killed in the middle of a batch', () => {
  it('completes every kit-result job after a restart, with one result per test and no duplicate alerts', async () => {
    const started = Date.now();
    const agent = await signedIn(t.app, demoEmail('hand'));
    const testIds: string[] = [];
    // High total ammonia at a high pH: results an alert rule would act on.
    for (let i = 0; i < TESTS; i += 12) {
      const batch = await Promise.all(
        Array.from({ length: Math.min(12, TESTS - i) }, (_, j) => {
          const unitId = unitIds[(i + j) % unitIds.length]!;
          return agent.post(`/api/farms/${farmId}/units/${unitId}/tests`).send({
            clientId: randomUUID(),
            analyte: 'total_ammonia',
            method: 'salicylate',
            basis: 'tan-n',
            value: 2 + ((i + j) % 10) / 10,
            sampledAt: new Date(Date.now() - (i + j + 1) * 60_000).toISOString(),
            handheldPh: 8.6,
            handheldTemperatureC: 28,
          });
        }),
      );
      for (const res of batch) {
        expect(res.status).toBe(201);
        testIds.push(res.body.id as string);
      }
    }
    expect((await resultsQueueCounts()).waiting).toBe(TESTS);
    const postedMs = Date.now() - started;

    worker = await startWorkerProcess(workerEnv(), 'worker#1');
    // Kill once a good part of the batch is done and jobs are in progress.
    const atKill = await waitFor(
      'the first worker to be part way through the batch',
      async () => {
        const c = await resultsQueueCounts();
        return c.completed >= TESTS / 5 && c.active > 0 ? c : null;
      },
      60_000,
      5,
    );
    await worker.kill();
    const killedAt = Date.now();
    expect(atKill.completed).toBeLessThan(TESTS);

    worker = await startWorkerProcess(workerEnv(), 'worker#2');
    const done = await waitFor(
      'every kit-result job to complete',
      async () => {
        const c = await resultsQueueCounts();
        return c.completed === TESTS ? c : null;
      },
      90_000,
      200,
    );
    const recoveredMs = Date.now() - killedAt;
    await t.drain({ timeoutMs: 60_000 }).catch(() => undefined);

    const results = await countRows(t.ds, 'SELECT count(*)::int AS n FROM free_ammonia_results WHERE water_test_id = ANY($1::uuid[])', [testIds]);
    const distinct = await countRows(t.ds, 'SELECT count(DISTINCT water_test_id)::int AS n FROM free_ammonia_results WHERE water_test_id = ANY($1::uuid[])', [testIds]);
    const alerts = await countRows(t.ds, 'SELECT count(*)::int AS n FROM alerts WHERE farm_id = $1', [farmId]);
    const duplicateAlerts = await countRows(
      t.ds,
      `SELECT count(*)::int AS n FROM (SELECT condition_key FROM alerts WHERE farm_id = $1 AND state <> 'resolved' GROUP BY condition_key HAVING count(*) > 1) d`,
      [farmId],
    );
    // An alert opened twice for one condition would show as two 'opened' events (or two open rows).
    const opened = await countRows(
      t.ds,
      `SELECT count(*)::int AS n FROM (SELECT e.alert_id FROM alert_events e JOIN alerts a ON a.id = e.alert_id
         WHERE a.farm_id = $1 AND e.type = 'opened' GROUP BY e.alert_id HAVING count(*) > 1) d`,
      [farmId],
    );
    // Alerts notified more than once for the same step (a re-run notify job sending again).
    const notifications = await countRows(t.ds, `SELECT count(*)::int AS n FROM alert_events e JOIN alerts a ON a.id = e.alert_id WHERE a.farm_id = $1`, [farmId]);
    report('worker SIGKILL mid-batch', {
      tests: TESTS,
      completedAtKill: atKill.completed,
      activeAtKill: atKill.active,
      completed: done.completed,
      failed: done.failed,
      results,
      duplicateResults: results - distinct,
      alerts,
      duplicateAlerts: duplicateAlerts + opened,
      alertEvents: notifications,
      postedMs,
      recoveredMs,
      seconds: ((Date.now() - started) / 1000).toFixed(1),
    });
    expect(done.failed).toBe(0);
    expect(results).toBe(TESTS);
    expect(distinct).toBe(TESTS);
    expect(duplicateAlerts).toBe(0);
    expect(opened).toBe(0);
    expect(errorLines(worker)).toEqual([]);
  });
});
