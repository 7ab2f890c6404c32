import { randomUUID } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CultureUnit, Farm, Membership, OnCallEntry, Probe, ThresholdProfile, User, type FarmSettings } from '../../server/db/entities';
import { thresholdProfiles } from '../../server/db/seed/harrow-bend';
import { createApp } from '../../server/app';
import { createServices } from '../../server/container';
import { createLogger } from '../../server/lib/logger';
import { createSmtpMailer } from '../../server/lib/mailer';
import { createRedis } from '../../server/lib/redis';
import { AuthService } from '../../server/modules/auth/auth.service';
import { HealthService } from '../../server/modules/health/health.service';
import { signedIn } from '../factories/session';
import { startTestApp, type TestApp } from '../setup/test-app';

let t: TestApp;
const PASSWORD = 'live-test-passphrase';
let passwordHash = '';

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
  passwordHash = await AuthService.hashPassword(PASSWORD);
  second = await startSecondServer();
});
afterAll(async () => {
  await second.close();
  await t.services.live.close();
  await t.close();
});

// --- a farm of the test's own: people, profiles (the seeded defaults), units, probes ---

async function makeFarm(tag: string, opts: { timeZone?: string; settings?: Partial<FarmSettings> } = {}) {
  const ds = t.ds;
  const id = randomUUID().slice(0, 8);
  const farm = await ds.getRepository(Farm).save(
    ds.getRepository(Farm).create({ slug: `${tag}-${id}`, name: `Test farm ${tag} ${id}`, timeZone: opts.timeZone ?? 'America/Chicago', settings: opts.settings ?? {}, displayPrefs: {} }),
  );
  const profiles = new Map<string, string>();
  for (const p of thresholdProfiles) {
    const saved = await ds.getRepository(ThresholdProfile).save(ds.getRepository(ThresholdProfile).create({ farmId: farm.id, name: p.name, species: p.species, lifeStage: null, rules: p.rules }));
    profiles.set(p.species, saved.id);
  }
  const person = async (role: 'hand' | 'manager' | 'planner', label: string) => {
    const email = `${label}-${id}@gillwise-tests.example`;
    const user = await ds.getRepository(User).save(ds.getRepository(User).create({ email, name: `${label} ${id}`, passwordHash, isAdmin: false, locale: 'en', prefs: {} }));
    await ds.getRepository(Membership).save(ds.getRepository(Membership).create({ farmId: farm.id, userId: user.id, role }));
    return { id: user.id, email, name: user.name, agent: () => signedIn(t.app, email, PASSWORD) };
  };
  const unit = async (code: string, o: { species?: string; kind?: CultureUnit['kind']; state?: CultureUnit['state']; waterType?: CultureUnit['waterType']; salinityPpt?: number } = {}) => {
    const species = o.species ?? 'channel_catfish';
    return ds.getRepository(CultureUnit).save(
      ds.getRepository(CultureUnit).create({
        farmId: farm.id,
        code,
        name: `${code} (${tag})`,
        kind: o.kind ?? 'pond',
        waterType: o.waterType ?? 'fresh',
        defaultSalinityPpt: o.salinityPpt ?? 0,
        species,
        lifeStage: null,
        state: o.state ?? 'active',
        testFrequencyDays: null,
        qrLabelId: `${tag}-${code}-${randomUUID()}`,
        walkOrder: 0,
        thresholdProfileId: profiles.get(species) ?? null,
        feedProteinFraction: 0.32,
        closeWatchUntil: null,
        outline: null,
        areaM2: 10_000,
        volumeM3: 12_000,
      }),
    );
  };
  const probe = async (unitId: string, quantities: string[], o: { intervalSeconds?: number; createdAt?: Date } = {}) => {
    const p = await ds.getRepository(Probe).save(
      ds.getRepository(Probe).create({
        farmId: farm.id,
        unitId,
        probeKey: `t-${randomUUID().slice(0, 12)}`,
        label: `sonde ${randomUUID().slice(0, 4)}`,
        model: null,
        quantities: quantities as Probe['quantities'],
        intervalSeconds: o.intervalSeconds ?? 60,
        secretHash: 'sha256:test',
        secretRotatedAt: new Date(),
        active: true,
      }),
    );
    if (o.createdAt) await ds.query('UPDATE probes SET created_at = $2 WHERE id = $1', [p.id, o.createdAt]);
    return p;
  };
  const onCall = async (entries: Array<{ userId: string; startsLocal?: string; endsLocal?: string }>) => {
    await ds.getRepository(OnCallEntry).insert(entries.map((e, i) => ({ farmId: farm.id, userId: e.userId, position: i + 1, startsLocal: e.startsLocal ?? '00:00', endsLocal: e.endsLocal ?? '24:00', weekdays: [1, 2, 3, 4, 5, 6, 7] })));
  };
  return { farm, farmId: farm.id, person, unit, probe, onCall };
}


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
  const res = await request(t.app).post('/api/auth/login').set('content-type', 'application/json').send({ email, password: PASSWORD });
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
