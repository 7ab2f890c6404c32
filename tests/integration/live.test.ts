import { randomUUID } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { createServices } from '../../server/container';
import { createLogger } from '../../server/lib/logger';
import { createSmtpMailer } from '../../server/lib/mailer';
import { createRedis } from '../../server/lib/redis';
import { HealthService } from '../../server/modules/health/health.service';
import { startTestApp, type TestApp } from '../setup/test-app';
import { createTestFarm, TEST_FARM_PASSWORD, type TestFarmOptions } from '../factories/test-farm';

let t: TestApp;

// A second "server process": its own Redis connections, LiveService and Express app on its own port,
// sharing the database and the queue prefix with the first.
let second: { baseUrl: string; close(): Promise<void> };

async function startSecondServer() {
  const logger = createLogger({ level: 'silent', name: 'test-b' });
  const redis = createRedis(t.config.REDIS_URL, 'gillwise-test-b');
  const mailer = createSmtpMailer({ host: t.config.SMTP_HOST, port: t.config.SMTP_PORT, from: t.config.MAIL_FROM });
  const services = createServices({ config: t.config, ds: t.ds, redis, queues: t.queues, mailer, logger });
  const health = new HealthService(t.ds, redis, t.config.QUEUE_PREFIX, () => ({ status: 'down', detail: 'not started in this test' }));
  const { app } = createApp({ config: t.config, logger, services, health, clientDir: null });
  const server: Server = createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', () => resolve()));
  const addr = server.address();
  const baseUrl = typeof addr === 'object' && addr ? `http://127.0.0.1:${addr.port}` : '';
  return {
    baseUrl,
    async close() {
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
      await services.live.close();
      await redis.quit();
      mailer.close();
    },
  };
}

beforeAll(async () => {
  t = await startTestApp({ listen: true });
  second = await startSecondServer();
});
afterAll(async () => {
  await second.close();
  await t.services.live.close();
  await t.close();
});

// --- a farm of the test's own: people, profiles (the seeded defaults), units, probes ---

const makeFarm = (tag: string, opts: TestFarmOptions = {}) => createTestFarm(t, tag, opts);


type LiveMessage = { type: string; farmId: string; unitId?: string | null; data?: Record<string, unknown> };

/** Opens the farm's event stream with fetch and collects the parsed events until `done` says so. */
async function openStream(baseUrl: string, farmId: string, cookie: string) {
  const controller = new AbortController();
  const res = await fetch(`${baseUrl}/api/farms/${farmId}/events`, { headers: { cookie, accept: 'text/event-stream' }, signal: controller.signal });
  expect(res.status).toBe(200);
  expect(res.headers.get('content-type')).toMatch(/text\/event-stream/);
  const reader = res.body!.getReader();
  const decoder = new TextDecoder();
  let buffer = '';
  const events: Array<{ event: string; data: LiveMessage }> = [];
  let connected = false;
  const pump = (async () => {
    try {
      for (;;) {
        const { value, done } = await reader.read();
        if (done) return;
        buffer += decoder.decode(value, { stream: true });
        let i: number;
        while ((i = buffer.indexOf('\n\n')) >= 0) {
          const block = buffer.slice(0, i);
          buffer = buffer.slice(i + 2);
          if (block.includes(': connected')) connected = true;
          const event = /^event: (.*)$/m.exec(block)?.[1];
          const data = /^data: (.*)$/m.exec(block)?.[1];
          if (event && data) events.push({ event, data: JSON.parse(data) as LiveMessage });
        }
      }
    } catch {
      // aborted
    }
  })();
  const until = async (what: string, check: () => boolean, timeoutMs = 5000) => {
    const deadline = Date.now() + timeoutMs;
    while (!check()) {
      if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}; got ${JSON.stringify(events)}`);
      await new Promise((r) => setTimeout(r, 25));
    }
  };
  await until('the stream to connect', () => connected);
  return {
    events,
    until,
    async close() {
      controller.abort();
      await pump;
    },
  };
}

async function sessionCookie(email: string): Promise<string> {
  const res = await request(t.app).post('/api/auth/login').set('content-type', 'application/json').send({ email, password: TEST_FARM_PASSWORD });
  const raw = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('gw_session='))!;
  return raw.split(';')[0]!;
}

describe('live events across server processes', () => {
  it('delivers an alert event published by one server process to the SSE streams of both', async () => {
    const f = await makeFarm('live');
    const manager = await f.person('manager', 'manager');
    const pond = await f.unit('P1');
    const alertId = randomUUID();
    await t.ds.query(
      `INSERT INTO alerts (id, farm_id, unit_id, kind, level, state, condition_key, title, message, opened_at, last_seen_at)
       VALUES ($1, $2, $3, 'do_low', 'act', 'open', $4, 'Dissolved oxygen low in P1', 'DO 2.1 mg/L', now(), now())`,
      [alertId, f.farmId, pond.id, `do_low:${pond.id}`],
    );
    const cookie = await sessionCookie(manager.email);
    const onFirst = await openStream(t.baseUrl!, f.farmId, cookie);
    const onSecond = await openStream(second.baseUrl, f.farmId, cookie);
    try {
      // The acknowledgement is handled by the first process only.
      const ack = await fetch(`${t.baseUrl}/api/farms/${f.farmId}/alerts/${alertId}/acknowledge`, {
        method: 'POST',
        headers: { cookie, 'content-type': 'application/json', 'x-gillwise-client': 'web' },
        body: JSON.stringify({}),
      });
      expect(ack.status).toBe(200);
      const isAck = (e: { event: string; data: LiveMessage }) => e.event === 'alert' && e.data.data?.alertId === alertId && e.data.data?.event === 'acknowledged';
      await onFirst.until('the event on the first process', () => onFirst.events.some(isAck));
      await onSecond.until('the event on the second process', () => onSecond.events.some(isAck));
      const got = onSecond.events.find(isAck)!;
      expect(got.data).toMatchObject({ type: 'alert', farmId: f.farmId, unitId: pond.id, data: { state: 'acknowledged', kind: 'do_low', level: 'act' } });

      // And the other way round: a resolve on the second process reaches the first.
      const resolve = await fetch(`${second.baseUrl}/api/farms/${f.farmId}/alerts/${alertId}/resolve`, {
        method: 'POST',
        headers: { cookie, 'content-type': 'application/json', 'x-gillwise-client': 'web' },
        body: JSON.stringify({ note: 'aerator restarted' }),
      });
      expect(resolve.status).toBe(200);
      const isResolved = (e: { event: string; data: LiveMessage }) => e.event === 'alert' && e.data.data?.alertId === alertId && e.data.data?.event === 'resolved';
      await onFirst.until('the resolve on the first process', () => onFirst.events.some(isResolved));
      await onSecond.until('the resolve on the second process', () => onSecond.events.some(isResolved));
    } finally {
      await onFirst.close();
      await onSecond.close();
    }
  });

  it('does not deliver another farm’s events to a stream', async () => {
    const f = await makeFarm('live-mine');
    const other = await makeFarm('live-other');
    const manager = await f.person('manager', 'manager');
    const stream = await openStream(second.baseUrl, f.farmId, await sessionCookie(manager.email));
    try {
      t.services.live.notify({ type: 'status', farmId: other.farmId, unitId: null, data: { status: 'act' } });
      t.services.live.notify({ type: 'status', farmId: f.farmId, unitId: null, data: { status: 'watch' } });
      await stream.until('the own farm event', () => stream.events.some((e) => e.data.farmId === f.farmId));
      expect(stream.events.filter((e) => e.data.farmId === other.farmId)).toEqual([]);
    } finally {
      await stream.close();
    }
  });
});
