// The simulator against a real in-process aedes broker (MQTT 3.1.1), with the same rules as the
// server's ingest broker: each probe authenticates with its own key and secret and may publish
// only to its own readings topic.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { type AddressInfo, type Server, createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Aedes, type Client } from 'aedes';
import { type MqttClient, connectAsync } from 'mqtt';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { parseTopic, readingsTopic } from '../shared/mqtt/topics';
import { type ProbeReadingsPayload, probeReadingsPayloadSchema } from '../shared/schemas/mqtt.schema';
import { type SimulatorConfig, parseConfig } from './config';
import type { ProbeCredential } from './credentials';
import { createLogger } from './log';
import { siteFor, startSimulator } from './run';

interface TestBroker {
  url: string;
  port: number;
  secrets: Map<string, string>;
  connects: string[];
  refusePublishes: boolean;
  close(): Promise<void>;
}

async function startBroker(port = 0, secrets = new Map<string, string>()): Promise<TestBroker> {
  const usernames = new WeakMap<Client, string>();
  const state = { refusePublishes: false, connects: [] as string[] };
  const broker = await Aedes.createBroker({
    authenticate: (client, username, password, done) => {
      const ok = username === 'listener' || (username !== undefined && secrets.get(username) === password?.toString());
      if (!ok || username === undefined) {
        done(Object.assign(new Error('bad username or password'), { returnCode: 4 }), null);
        return;
      }
      usernames.set(client, username);
      state.connects.push(username);
      done(null, true);
    },
    authorizePublish: (client, packet, callback) => {
      const username = client ? usernames.get(client) : undefined;
      if (state.refusePublishes || !username || packet.topic !== readingsTopic(username)) {
        callback(new Error('not allowed'));
        return;
      }
      callback(null);
    },
  });
  const server: Server = createServer(broker.handle);
  await new Promise<void>((resolve) => server.listen(port, '127.0.0.1', resolve));
  const actualPort = (server.address() as AddressInfo).port;
  return {
    url: `mqtt://127.0.0.1:${actualPort}`,
    port: actualPort,
    secrets,
    get connects() {
      return state.connects;
    },
    get refusePublishes() {
      return state.refusePublishes;
    },
    set refusePublishes(value: boolean) {
      state.refusePublishes = value;
    },
    close: () =>
      new Promise<void>((resolve) => {
        broker.close(() => server.close(() => resolve()));
      }),
  };
}

interface Received {
  probeKey: string;
  payload: ProbeReadingsPayload;
}

async function subscribe(url: string): Promise<{ client: MqttClient; received: Received[] }> {
  const client = await connectAsync(url, { username: 'listener', password: 'x', protocolVersion: 4, reconnectPeriod: 200 });
  const received: Received[] = [];
  client.on('message', (topic, message) => {
    const parsed = parseTopic(topic);
    if (parsed) received.push({ probeKey: parsed.probeKey, payload: JSON.parse(message.toString()) as ProbeReadingsPayload });
  });
  await client.subscribeAsync('gillwise/v1/probes/+/readings', { qos: 1 });
  return { client, received };
}

const credential = (probeKey: string, extra: Partial<ProbeCredential> = {}): ProbeCredential => ({
  probeKey,
  secret: `s3cret-${probeKey}`,
  farmSlug: 'harrow-bend',
  unitCode: probeKey.toUpperCase(),
  unitKind: 'pond',
  waterType: 'fresh',
  salinityPpt: 0.2,
  species: 'channel catfish',
  quantities: ['ph', 'dissolved_oxygen', 'water_temperature', 'aerator_running'],
  intervalSeconds: 60,
  scenario: 'steady',
  ...extra,
});

async function waitFor(condition: () => boolean, timeoutMs = 8000, what = 'condition'): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!condition()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

describe('farm sites', () => {
  it('each farm gets its own --farm time zone; others use --tz', () => {
    const result = parseConfig(['--tz', 'UTC', '--lat', '10', '--lon', '20', '--farm', 'cedar-flats=America/Denver'], {});
    if (!result.ok) throw new Error(result.errors.join());
    expect(siteFor(result.config, 'cedar-flats')).toEqual({ timeZone: 'America/Denver', latitude: 10, longitude: 20 });
    expect(siteFor(result.config, 'harrow-bend')).toEqual({ timeZone: 'UTC', latitude: 10, longitude: 20 });
  });
});

describe('simulator against an in-process aedes broker', () => {
  let dir: string;
  let file: string;
  let lines: string[];
  const cleanups: Array<() => Promise<void> | void> = [];
  const log = () => createLogger({ level: 'debug', write: (line) => lines.push(line) });

  const writeCredentials = (brokerUrl: string, probes: ProbeCredential[]) =>
    writeFileSync(file, JSON.stringify({ brokerUrl, probes }), { mode: 0o600 });

  const config = (argv: string[]): SimulatorConfig => {
    const result = parseConfig(['--credentials', file, '--tz', 'UTC', ...argv], {});
    if (!result.ok) throw new Error(result.errors.join('; '));
    return result.config;
  };

  beforeEach(() => {
    dir = mkdtempSync(join(tmpdir(), 'gillwise-sim-'));
    file = join(dir, 'probe-credentials.json');
    lines = [];
  });

  afterEach(async () => {
    for (const cleanup of cleanups.splice(0).reverse()) await cleanup();
    rmSync(dir, { recursive: true, force: true });
  });

  it('with --once, every probe connects as itself, publishes one valid message and the process exits 0', async () => {
    const probes = [
      credential('pond-1'),
      credential('rw-1', { unitKind: 'raceway', quantities: ['flow', 'dissolved_oxygen', 'water_temperature'] }),
    ];
    const broker = await startBroker(0, new Map(probes.map((p) => [p.probeKey, p.secret])));
    cleanups.push(() => broker.close());
    const { client, received } = await subscribe(broker.url);
    cleanups.push(() => client.endAsync());
    writeCredentials(broker.url, probes);

    const code = await startSimulator(config(['--once', '--fahrenheit', 'rw-1']), { log: log() }).done;
    expect(code).toBe(0);
    await waitFor(() => received.length >= 2, 5000, 'two messages');
    expect(received.map((r) => r.probeKey).sort()).toEqual(['pond-1', 'rw-1']);
    for (const r of received) {
      expect(probeReadingsPayloadSchema.safeParse(r.payload).success).toBe(true);
      expect(r.payload.samples).toHaveLength(1);
    }
    expect(broker.connects.filter((k) => k !== 'listener').sort()).toEqual(['pond-1', 'rw-1']);
    const unitOf = (key: string) =>
      received.find((r) => r.probeKey === key)?.payload.samples[0]?.values.find((v) => v.quantity === 'water_temperature')?.unit;
    expect(unitOf('pond-1')).toBe('C');
    expect(unitOf('rw-1')).toBe('F');
  });

  it('during a dropout the probe goes offline, buffers, then re-sends its buffer without a gap', async () => {
    const probes = [credential('pond-1', { scenario: 'dropout:minutes=1s,at=+0.6s,every=0' })];
    const broker = await startBroker(0, new Map(probes.map((p) => [p.probeKey, p.secret])));
    const { client, received } = await subscribe(broker.url);
    writeCredentials(broker.url, probes);
    const sim = startSimulator(config(['--interval', '0.1']), { log: log(), minBackoffMs: 100 });
    cleanups.push(async () => {
      await sim.stop();
      await client.endAsync();
      await broker.close();
    });
    await waitFor(() => lines.some((l) => l.includes('link down (dropout)')), 5000, 'dropout');
    const during = received.length;
    await new Promise((r) => setTimeout(r, 500));
    expect(received.length).toBe(during); // silent while the link is down
    await waitFor(() => lines.some((l) => l.includes('link back up')), 5000, 'link back');
    await waitFor(() => received.slice(during).some((r) => r.payload.samples.length >= 5), 5000, 'backlog');
    await new Promise((r) => setTimeout(r, 300));
    const times = [...new Set(received.flatMap((r) => r.payload.samples.map((s) => Date.parse(s.at))))].sort((a, b) => a - b);
    const gaps = times.slice(1).map((t, i) => t - (times[i] ?? t));
    expect(Math.max(...gaps)).toBeLessThan(300);
  });

  it('with --once --backfill, sends the history in chunks of at most 200 samples', async () => {
    const probes = [credential('pond-1', { intervalSeconds: 60 })];
    const broker = await startBroker(0, new Map(probes.map((p) => [p.probeKey, p.secret])));
    cleanups.push(() => broker.close());
    const { client, received } = await subscribe(broker.url);
    cleanups.push(() => client.endAsync());
    writeCredentials(broker.url, probes);

    const code = await startSimulator(config(['--once', '--backfill', '6']), { log: log() }).done;
    expect(code).toBe(0);
    await waitFor(() => received.reduce((n, r) => n + r.payload.samples.length, 0) >= 361, 5000, 'backfill');
    expect(received.map((r) => r.payload.samples.length)).toEqual([200, 161]);
  });

  it('keeps readings across a broker restart and sends the backlog once it is back', async () => {
    const probes = [credential('pond-1')];
    const secrets = new Map(probes.map((p) => [p.probeKey, p.secret]));
    let broker = await startBroker(0, secrets);
    const port = broker.port;
    writeCredentials(broker.url, probes);
    const sim = startSimulator(config(['--interval', '0.1']), { log: log(), minBackoffMs: 100 });
    cleanups.push(async () => {
      await sim.stop();
      await broker.close();
    });
    let sub = await subscribe(broker.url);
    await waitFor(() => sub.received.length >= 3, 5000, 'first messages');
    await sub.client.endAsync();
    const before = sub.received.flatMap((r) => r.payload.samples.map((s) => s.at));

    await broker.close();
    await new Promise((r) => setTimeout(r, 800)); // ~8 samples buffered meanwhile
    expect(sim.runners.get('pond-1')?.queue.size).toBeGreaterThan(3);
    broker = await startBroker(port, secrets);
    sub = await subscribe(broker.url);
    cleanups.push(() => sub.client.endAsync());
    await waitFor(() => sim.runners.get('pond-1')?.queue.size === 0 && sub.received.length > 0, 8000, 'backlog sent');
    await waitFor(() => sub.received.length >= 2, 3000, 'more messages');

    const after = sub.received.flatMap((r) => r.payload.samples.map((s) => s.at));
    const all = [...new Set([...before, ...after])].map(Date.parse).sort((a, b) => a - b);
    const firstAfter = Date.parse(after[0] ?? '');
    const lastBefore = Math.max(...before.map(Date.parse));
    expect(firstAfter - lastBefore).toBeLessThan(300); // nothing between the two runs was lost
    const gaps = all.slice(1).map((t, i) => t - (all[i] ?? t));
    expect(Math.max(...gaps)).toBeLessThan(300);
    expect(sub.received.some((r) => r.payload.samples.length > 3)).toBe(true); // the backlog went as one message
  });

  it('when the broker refuses its publishes, logs it once and backs off', async () => {
    const probes = [credential('pond-1')];
    const broker = await startBroker(0, new Map(probes.map((p) => [p.probeKey, p.secret])));
    broker.refusePublishes = true;
    writeCredentials(broker.url, probes);
    const sim = startSimulator(config(['--interval', '0.1']), { log: log(), minBackoffMs: 100 });
    cleanups.push(async () => {
      await sim.stop();
      await broker.close();
    });
    await new Promise((r) => setTimeout(r, 2500));
    const warnings = lines.filter((l) => l.includes('refused by its ACL'));
    expect(warnings).toHaveLength(1);
    // Backoff 100, 200, 400, 800 ms…: a handful of attempts, not one every 100 ms.
    const probeConnects = broker.connects.filter((k) => k === 'pond-1').length;
    expect(probeConnects).toBeGreaterThanOrEqual(2);
    expect(probeConnects).toBeLessThanOrEqual(7);
    expect(sim.runners.get('pond-1')?.queue.size).toBeGreaterThan(10); // readings kept, not dropped
  });

  it('waits for a missing credential file, then picks up probes added and secrets rotated later', async () => {
    const secrets = new Map<string, string>();
    const broker = await startBroker(0, secrets);
    const { client, received } = await subscribe(broker.url);
    const sim = startSimulator(config(['--interval', '0.2']), { log: log(), retryMs: 100, minBackoffMs: 100 });
    cleanups.push(async () => {
      await sim.stop();
      await client.endAsync();
      await broker.close();
    });
    await new Promise((r) => setTimeout(r, 300));
    expect(lines.filter((l) => l.includes('waiting for the probe credential file'))).toHaveLength(1);

    const first = credential('pond-1');
    secrets.set(first.probeKey, first.secret);
    writeCredentials(broker.url, [first]);
    await waitFor(() => received.some((r) => r.probeKey === 'pond-1'), 5000, 'pond-1');

    const second = credential('pond-2');
    secrets.set(second.probeKey, second.secret);
    const rotated = { ...first, secret: 'rotated-secret' };
    secrets.set(first.probeKey, rotated.secret);
    writeCredentials(broker.url, [rotated, second]);
    await sim.reload();
    await waitFor(() => received.some((r) => r.probeKey === 'pond-2'), 5000, 'pond-2');
    const connectsBefore = broker.connects.filter((k) => k === 'pond-1').length;
    await waitFor(
      () => broker.connects.filter((k) => k === 'pond-1').length > connectsBefore || connectsBefore >= 2,
      5000,
      'pond-1 reconnect',
    );
    expect(lines.some((l) => l.includes('[pond-1] secret rotated'))).toBe(true);
    const count = received.length;
    await waitFor(() => received.slice(count).some((r) => r.probeKey === 'pond-1'), 5000, 'pond-1 after rotation');
  });

  it('refuses a burst larger than the credential file, since probes cannot share a clientId', async () => {
    writeCredentials('mqtt://127.0.0.1:1', [credential('pond-1'), credential('pond-2')]);
    const code = await startSimulator(config(['--scenario', 'burst', '--probes', '5']), { log: log() }).done;
    expect(code).toBe(2);
    expect(lines.join('\n')).toMatch(/burst: asked for 5 probes but the credential file has 2/);
  });
});
