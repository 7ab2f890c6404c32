import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../setup/test-app';
import { createTestFarm, type TestFarmOptions } from '../factories/test-farm';

let t: TestApp;

beforeAll(async () => {
  t = await startTestApp({ worker: true });
});
afterAll(() => t.close());

// --- a farm of the test's own: people, profiles (the seeded defaults), units, probes ---

const makeFarm = (tag: string, opts: TestFarmOptions = {}) => createTestFarm(t, tag, opts);


describe('the dead-letter view of failed jobs', () => {
  it("shows a manager only their farm's failed jobs and retries only those", async () => {
    const mine = await makeFarm('dlq-mine');
    const theirs = await makeFarm('dlq-theirs');
    const manager = await mine.person('manager', 'manager');
    const hand = await mine.person('hand', 'hand');
    // Evaluations of units that do not exist fail (one attempt, so they land in the failed set at once).
    const ghost = randomUUID();
    await t.queues.add('evaluateUnit', { farmId: mine.farmId, unitId: ghost, reason: 'test' }, { jobId: `ghost-${ghost}`, attempts: 1 });
    await t.queues.add('evaluateUnit', { farmId: theirs.farmId, unitId: randomUUID(), reason: 'test' }, { jobId: `other-${ghost}`, attempts: 1 });
    await t.drain();
    const m = await manager.agent();
    const list = await m.get(`/api/farms/${mine.farmId}/jobs/failed`);
    expect(list.status).toBe(200);
    expect(list.body.jobs).toEqual([
      expect.objectContaining({ queue: 'evaluations', id: `ghost-${ghost}`, name: 'evaluate-unit', farmId: mine.farmId, attemptsMade: 1, attempts: 1, failedReason: 'Unit not found.' }),
    ]);
    expect((await (await hand.agent()).get(`/api/farms/${mine.farmId}/jobs/failed`)).status).toBe(403);

    const retry = await m.post(`/api/farms/${mine.farmId}/jobs/failed/retry`).send({ jobs: [{ queue: 'evaluations', id: `ghost-${ghost}` }, { queue: 'evaluations', id: `other-${ghost}` }] });
    expect(retry.status).toBe(200);
    expect(retry.body).toEqual({ retried: [{ queue: 'evaluations', id: `ghost-${ghost}` }], skipped: [{ queue: 'evaluations', id: `other-${ghost}` }] });
    await t.drain();
    const job = await t.queues.queue('evaluations').getJob(`ghost-${ghost}`);
    expect(await job?.getState()).toBe('failed');
    expect(job?.attemptsMade).toBe(2);
  });
});
