import { createServer, type Server } from 'node:net';
import { Aedes, type AedesOptions } from 'aedes';
import { performance } from 'node:perf_hooks';
import type { DataSource } from 'typeorm';
import { isValidProbeKey, parseTopic, readingsTopic } from '../../shared/mqtt/topics';
import type { Env } from '../config/env';
import type { Services } from '../container';
import { Probe } from '../db/entities';
import type { Logger } from '../lib/logger';
import { ReadingsRepository } from '../modules/readings/readings.repository';
import { verifyProbeSecret } from '../modules/probes/probe-secrets';
import type { Queues } from '../queues';
import { BatchWriter } from './batch-writer';
import { optimisticInsert } from './insert-strategy';
import { ReadingHandler, type ProbeIdentity, type ReadingRow, type Reject } from './reading-handler';

type Client = Parameters<NonNullable<AedesOptions['authenticate']>>[0];

export type BrokerHandle = {
  port: number;
  status(): { status: 'ok' | 'down'; detail?: string };
  /** Disconnects a probe at once (credential rotated or probe removed). */
  disconnectProbe(probeKey: string): void;
  counters(): IngestCounters;
  close(): Promise<void>;
};

export type IngestCounters = {
  messages: number;
  readingsStored: number;
  readingsDuplicate: number;
  rejects: Record<string, number>;
  refusedConnections: number;
  refusedTopics: number;
  writeFailures: number;
};

export type BrokerDeps = {
  config: Pick<Env, 'MQTT_HOST' | 'MQTT_PORT' | 'INGEST_BATCH_MAX' | 'INGEST_FLUSH_MS'>;
  ds: DataSource;
  queues: Queues;
  services?: Services;
  logger: Logger;
};

/** The MQTT broker embedded in the server: per-probe credentials, a topic ACL, validated durable ingest. */
export async function startBroker(deps: BrokerDeps): Promise<BrokerHandle> {
  const { ds, queues, logger } = deps;
  const readings = new ReadingsRepository(ds);
  const handler = new ReadingHandler();
  const identities = new WeakMap<Client, ProbeIdentity>();
  const topics = new WeakMap<ProbeIdentity, string>();
  /** Every live connection of a probe (a rotated or removed credential closes them all), and who holds each client id. */
  const clientsByKey = new Map<string, Set<Client>>();
  const byClientId = new Map<string, Client>();
  const probeUnits = new Map<string, { farmId: string; unitId: string | null }>();
  const counters: IngestCounters = {
    messages: 0,
    readingsStored: 0,
    readingsDuplicate: 0,
    rejects: {},
    refusedConnections: 0,
    refusedTopics: 0,
    writeFailures: 0,
  };
  // Rejects are counted in memory and folded into probe_rejects every few seconds.
  const pendingRejects = new Map<string, { probeKey: string; reason: string; count: number; lastDetail: string }>();
  const seen = new Map<string, { at: Date; batteryPct?: number; rssiDbm?: number }>();

  const countRejects = (probeKey: string, rejects: Reject[]) => {
    for (const r of rejects) {
      counters.rejects[r.reason] = (counters.rejects[r.reason] ?? 0) + 1;
      const key = `${probeKey}|${r.reason}`;
      const cur = pendingRejects.get(key) ?? { probeKey, reason: r.reason, count: 0, lastDetail: '' };
      cur.count++;
      cur.lastDetail = r.detail;
      pendingRejects.set(key, cur);
    }
    if (rejects.length) logger.debug({ probeKey, rejects: rejects.slice(0, 3) }, 'payload rejected');
  };

  const queueEvaluations = (rows: ReadingRow[]) => {
    const units = new Map<string, string>();
    for (const r of rows) {
      const u = probeUnits.get(r.probeId);
      if (u?.unitId) units.set(u.unitId, u.farmId);
    }
    for (const [unitId, farmId] of units) {
      // One pending evaluation per unit; a request made while one runs is kept and runs after it.
      queues
        .add('evaluateUnit', { farmId, unitId, reason: 'readings' }, { deduplication: { id: `unit:${unitId}`, keepLastIfActive: true } })
        .catch((err: unknown) => logger.warn({ err, unitId }, 'could not queue unit evaluation'));
    }
  };

  const writer = new BatchWriter({
    maxRows: deps.config.INGEST_BATCH_MAX,
    flushMs: deps.config.INGEST_FLUSH_MS,
    concurrency: 3,
    insert: optimisticInsert(readings),
    onDurable: (rows, inserted) => {
      counters.readingsStored += inserted;
      counters.readingsDuplicate += rows.length - inserted;
      queueEvaluations(rows);
    },
  });

  const flushSide = async () => {
    const rejects = [...pendingRejects.values()];
    pendingRejects.clear();
    const touched = new Map(seen);
    seen.clear();
    // Two writes that fail on their own: reject counters that cannot be stored must not stop the probes'
    // last-seen times (a silent-looking probe raises alerts), and the other way round.
    try {
      await readings.addRejects(rejects);
    } catch (err) {
      // Put the counts back, added to what arrived while the write was failing.
      for (const r of rejects) {
        const key = `${r.probeKey}|${r.reason}`;
        const cur = pendingRejects.get(key);
        if (cur) cur.count += r.count;
        else pendingRejects.set(key, r);
      }
      logger.warn({ err }, 'could not store probe reject counters; will retry');
    }
    try {
      await readings.touchProbes(touched);
    } catch (err) {
      for (const [k, v] of touched) if (!seen.has(k)) seen.set(k, v);
      logger.warn({ err }, 'could not store probe last-seen times; will retry');
    }
  };
  const sideTimer = setInterval(() => void flushSide(), 2000);

  type Pending = { identity: ProbeIdentity; payload: Buffer; callback: (err: Error | null) => void };
  const backlog: Array<Pending | undefined> = [];
  let backlogHead = 0;
  let draining = false;
  const SLICE_MS = 4;
  const drainBacklog = () => {
    const until = performance.now() + SLICE_MS;
    let n = 0;
    while (backlogHead < backlog.length) {
      const m = backlog[backlogHead];
      backlog[backlogHead++] = undefined;
      if (m) accept(m.identity, m.payload, m.callback);
      if (++n % 16 === 0 && performance.now() >= until) break;
    }
    if (backlogHead >= backlog.length) {
      backlog.length = 0;
      backlogHead = 0;
      draining = false;
    } else setImmediate(drainBacklog);
  };

  const accept = (identity: ProbeIdentity, raw: Buffer, callback: (err: Error | null) => void) => {
    const { rows, rejects, payload } = handler.handle(identity, raw);
    countRejects(identity.probeKey, rejects);
    // One entry per probe between two flushes, updated in place (this runs for every message).
    const last = seen.get(identity.probeId);
    if (last) {
      last.at = new Date();
      if (payload?.batteryPct !== undefined) last.batteryPct = payload.batteryPct;
      if (payload?.rssiDbm !== undefined) last.rssiDbm = payload.rssiDbm;
    } else {
      seen.set(identity.probeId, {
        at: new Date(),
        ...(payload?.batteryPct !== undefined ? { batteryPct: payload.batteryPct } : {}),
        ...(payload?.rssiDbm !== undefined ? { rssiDbm: payload.rssiDbm } : {}),
      });
    }
    // A malformed payload is acknowledged without storing, or the probe would replay it forever.
    if (!rows.length) return callback(null);
    // Acknowledge only once the readings are durable; on a failed write refuse, and the probe re-sends.
    writer.add(rows, (err?: unknown) => {
      if (err === undefined) return callback(null);
      counters.writeFailures++;
      logger.error({ err: err instanceof Error ? err.message : err, probeKey: identity.probeKey }, 'readings not stored; refusing message');
      callback(new Error('storage unavailable'));
    });
  };

  const broker = await Aedes.createBroker({
    concurrency: 1000,
    heartbeatInterval: 60_000,
    authenticate: (client, username, password, done) => {
      const refuse = () => {
        counters.refusedConnections++;
        logger.warn({ username, clientId: client.id }, 'MQTT connection refused: bad credentials');
        done(Object.assign(new Error('Bad username or password'), { returnCode: 4 as const }), null);
      };
      const refuseClientId = (probeKey: string) => {
        counters.refusedConnections++;
        logger.warn({ username: probeKey, clientId: client.id }, 'MQTT connection refused: client id belongs to another probe');
        done(Object.assign(new Error('Client id belongs to another probe'), { returnCode: 2 as const }), null);
      };
      const accept = (probe: Probe) => {
        const identity = { probeId: probe.id, probeKey: probe.probeKey, farmId: probe.farmId, unitId: probe.unitId };
        identities.set(client, identity);
        if (isValidProbeKey(probe.probeKey)) topics.set(identity, readingsTopic(probe.probeKey));
        probeUnits.set(probe.id, { farmId: probe.farmId, unitId: probe.unitId });
        const own = clientsByKey.get(probe.probeKey) ?? new Set<Client>();
        own.add(client);
        clientsByKey.set(probe.probeKey, own);
        byClientId.set(client.id, client);
        done(null, true);
      };
      if (!username || !password) return refuse();
      ds.getRepository(Probe)
        .findOneBy({ probeKey: username, active: true })
        .then((probe) => {
          if (!probe || !verifyProbeSecret(password.toString('utf8'), probe.secretHash)) return refuse();
          // aedes lets a new connection take over a connected client id ([MQTT-3.1.4-2]): without these
          // checks any valid credential could push another probe off the broker, again and again, or
          // squat the client id (its probe key) that probe reconnects with.
          const holder = byClientId.get(client.id);
          if (holder && identities.get(holder)?.probeKey !== probe.probeKey) return refuseClientId(probe.probeKey);
          if (client.id === probe.probeKey || !isValidProbeKey(client.id)) return accept(probe);
          return ds
            .getRepository(Probe)
            .existsBy({ probeKey: client.id })
            .then((another) => (another ? refuseClientId(probe.probeKey) : accept(probe)));
        })
        .catch((err: unknown) => {
          logger.error({ err }, 'MQTT authentication lookup failed');
          done(Object.assign(new Error('Server unavailable'), { returnCode: 3 as const }), null);
        });
    },
    authorizeSubscribe: (client, sub, callback) => {
      // Probes only publish; no subscription is granted (the SUBACK carries a failure code).
      logger.warn({ clientId: client.id, topic: sub.topic }, 'MQTT subscription refused');
      counters.refusedTopics++;
      callback(null, null);
    },
    authorizePublish: (client, packet, callback) => {
      const identity = client ? identities.get(client) : undefined;
      // The topic a probe publishes to is the same every time: compare with its own before parsing.
      if (!identity || (packet.topic !== topics.get(identity) && parseTopic(packet.topic)?.probeKey !== identity.probeKey)) {
        counters.refusedTopics++;
        logger.warn({ clientId: client?.id, topic: packet.topic }, 'MQTT publish refused: not this probe’s topic');
        // MQTT 3.1.1 has no negative PUBACK: refusing closes the connection.
        return callback(new Error('topic not allowed'));
      }
      packet.retain = false;
      counters.messages++;
      // Validation and batching run in slices of a few milliseconds (see drainBacklog), not inside the
      // socket read that delivered the packet: hundreds of connections can each hand over dozens of
      // pipelined messages in one turn of the event loop, and HTTP requests must not wait behind them.
      backlog.push({ identity, payload: packet.payload as Buffer, callback });
      if (!draining) {
        draining = true;
        setImmediate(drainBacklog);
      }
    },
  });
  broker.on('clientDisconnect', (client) => {
    const id = identities.get(client);
    const own = id ? clientsByKey.get(id.probeKey) : undefined;
    own?.delete(client);
    if (id && own && !own.size) clientsByKey.delete(id.probeKey);
    if (byClientId.get(client.id) === client) byClientId.delete(client.id);
  });

  const server: Server = createServer(broker.handle);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(deps.config.MQTT_PORT, deps.config.MQTT_HOST, () => resolve());
  });
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : deps.config.MQTT_PORT;
  logger.info({ port }, 'MQTT broker listening');

  return {
    port,
    status: () => (server.listening && !broker.closed ? { status: 'ok', detail: `${broker.connectedClients} probe(s) connected` } : { status: 'down' }),
    disconnectProbe(probeKey) {
      const own = clientsByKey.get(probeKey);
      clientsByKey.delete(probeKey);
      for (const client of own ?? []) client.close();
    },
    counters: () => structuredClone(counters),
    async close() {
      clearInterval(sideTimer);
      // Close the broker first: it ends every client connection, which lets the listener close.
      await new Promise<void>((resolve) => broker.close(() => resolve()));
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await writer.close().catch(() => undefined);
      await flushSide();
    },
  };
}
