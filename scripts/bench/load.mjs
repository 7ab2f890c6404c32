// Load generator for the ingest benchmarks (a child of scripts/bench/run.mjs):
//   node scripts/bench/load.mjs <config.json> <result.json>
// role "publish": one MQTT connection per simulated probe, QoS 1 messages of 4 readings each, a window
//   of unacknowledged publishes per connection (pipelining), for a fixed time, either as fast as the
//   broker acknowledges or paced to a total rate. Records publish → PUBACK latency of every message and,
//   with `poll`, publish → row visible in PostgreSQL for a sample of messages.
// role "subscribe": one QoS 1 subscriber that counts what a broker relays (the mosquitto ceiling).
import { readFileSync, writeFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { WireClient, publishPacket } from './lib/mqtt-wire.mjs';
import { summarize } from './lib/stats.mjs';

const [configFile, resultFile] = process.argv.slice(2);
const cfg = JSON.parse(readFileSync(configFile, 'utf8'));
const now = () => performance.now();
const sleep = (ms) => new Promise((r) => setTimeout(r, ms));

/** One sample of four readings at `at`; ~240 bytes, like a real probe message. */
function payload(atIso, i) {
  const ph = (7.6 + (i % 7) * 0.05).toFixed(2);
  return Buffer.from(
    `{"v":1,"samples":[{"at":"${atIso}","values":[` +
      `{"quantity":"ph","value":${ph},"unit":"pH"},` +
      `{"quantity":"water_temperature","value":26.4,"unit":"C"},` +
      `{"quantity":"dissolved_oxygen","value":6.8,"unit":"mg/L"},` +
      `{"quantity":"salinity","value":0.4,"unit":"ppt"}]}]}`,
  );
}

async function publishRole() {
  const { host, port, probes, auth, durationMs, window: win, rate = 0, epochMs, poll } = cfg;
  const t0 = now();
  const clients = [];
  // Connect in groups so that authentication lookups are not all at once.
  for (let i = 0; i < probes.length; i += 50) {
    await Promise.all(
      probes.slice(i, i + 50).map(async (p, k) => {
        const c = new WireClient({
          host,
          port,
          clientId: p.probeKey,
          ...(auth ? { username: p.probeKey, password: p.secret } : {}),
        });
        await c.connect();
        const topic = Buffer.from(`gillwise/v1/probes/${p.probeKey}/readings`);
        const st = { c, p, idx: i + k, topic, seq: 0, acked: 0, inflight: new Map(), nextId: 1, tokens: 0, closedEarly: false };
        c.onPuback = (id) => onAck(st, id);
        c.onClose = () => {
          if (!stopping) st.closedEarly = true;
        };
        clients.push(st);
      }),
    );
  }
  const connectMs = now() - t0;

  const latencies = [];
  const visibility = [];
  const perSecond = [];
  let sent = 0;
  let acked = 0;
  let stopping = false;
  let firstSend = 0;
  let lastAck = 0;
  const dirty = new Set();
  let refillScheduled = false;
  const pending = []; // sampled messages waiting to be seen in PostgreSQL
  const sampleEvery = poll?.sampleEvery ?? 0;

  function sendOne(st) {
    const seq = st.seq++;
    const id = st.nextId;
    st.nextId = id === 65535 ? 1 : id + 1;
    const atIso = new Date(epochMs + seq).toISOString();
    const t = now();
    if (!firstSend) firstSend = t;
    st.inflight.set(id, { seq, t });
    st.c.write(publishPacket(st.topic, id, payload(atIso, seq)));
    sent++;
    if (sampleEvery && seq % sampleEvery === 0) pending.push({ probeId: st.p.probeId, atIso, t });
  }

  function fill(st) {
    if (stopping || st.c.closed) return;
    st.c.sock.cork();
    while (st.inflight.size < win && (rate === 0 || st.tokens >= 1)) {
      if (rate) st.tokens -= 1;
      sendOne(st);
    }
    st.c.sock.uncork();
  }

  function onAck(st, id) {
    const m = st.inflight.get(id);
    if (!m) return;
    st.inflight.delete(id);
    const t = now();
    latencies.push(t - m.t);
    st.acked++;
    acked++;
    lastAck = t;
    const sec = Math.floor((t - firstSend) / 1000);
    perSecond[sec] = (perSecond[sec] ?? 0) + 1;
    if (rate === 0) {
      dirty.add(st);
      if (!refillScheduled) {
        refillScheduled = true;
        setImmediate(() => {
          refillScheduled = false;
          for (const s of dirty) fill(s);
          dirty.clear();
        });
      }
    }
  }

  // Visibility poller: which sampled messages are readable in PostgreSQL yet?
  let pollDone = Promise.resolve();
  let pollQueries = 0;
  if (poll) {
    const pg = (await import('pg')).default;
    const db = new pg.Client({ connectionString: poll.pgUrl });
    await db.connect();
    pollDone = (async () => {
      for (;;) {
        if (stopping && !pending.length) break;
        if (!pending.length) {
          await sleep(poll.intervalMs);
          continue;
        }
        const batch = pending.splice(0, 5000);
        const res = await db.query(
          `SELECT probe_id::text AS p, at FROM readings WHERE quantity = 'ph'
             AND (probe_id, at) IN (SELECT * FROM unnest($1::uuid[], $2::timestamptz[]))`,
          [batch.map((b) => b.probeId), batch.map((b) => b.atIso)],
        );
        pollQueries++;
        const seen = now();
        const found = new Set(res.rows.map((r) => `${r.p}|${r.at.toISOString()}`));
        for (const b of batch) {
          if (found.has(`${b.probeId}|${b.atIso}`)) visibility.push(seen - b.t);
          else if (seen - b.t < 30_000) pending.push(b);
        }
        await sleep(poll.intervalMs);
      }
      await db.end();
    })();
  }

  const start = now();
  let ticker = null;
  if (rate) {
    const perClient = rate / clients.length;
    let last = now();
    ticker = setInterval(() => {
      const t = now();
      const add = ((t - last) / 1000) * perClient;
      last = t;
      for (const st of clients) {
        // Up to a quarter second of credit, so a late timer tick does not lose rate.
        st.tokens = Math.min(st.tokens + add, Math.max(4, perClient * 0.25));
        fill(st);
      }
    }, 2);
  } else {
    for (const st of clients) fill(st);
  }
  await sleep(durationMs);
  stopping = true;
  if (ticker) clearInterval(ticker);
  const stopSending = now();
  // Every message sent must be acknowledged before the count means anything: wait for the tail.
  const drainDeadline = now() + 30_000;
  while (clients.some((s) => s.inflight.size && !s.c.closed) && now() < drainDeadline) await sleep(20);
  const drainMs = now() - stopSending;
  await pollDone;
  await Promise.all(clients.map((s) => s.c.end()));

  const elapsedS = (lastAck - firstSend) / 1000;
  return {
    role: 'publish',
    clients: clients.length,
    window: win,
    rate,
    durationMs,
    connectMs: Math.round(connectMs),
    sent,
    acked,
    unacked: sent - acked,
    closedEarly: clients.filter((s) => s.closedEarly).length,
    elapsedS,
    drainMs: Math.round(drainMs),
    ackedPerSec: acked / elapsedS,
    sinceStartS: (lastAck - start) / 1000,
    ackLatencyMs: summarize(latencies),
    visibilityMs: poll ? { ...summarize(visibility), samples: visibility.length, pollQueries, pollIntervalMs: poll.intervalMs } : null,
    perSecond,
    perProbe: clients.map((s) => ({
      probeId: s.p.probeId,
      sent: s.seq,
      acked: s.acked,
      unackedSeqs: [...s.inflight.values()].map((m) => m.seq),
    })),
  };
}

async function subscribeRole() {
  const { host, port, topic, expect, durationMs, idleMs = 3000 } = cfg;
  const c = new WireClient({ host, port, clientId: `bench-sink-${process.pid}` });
  await c.connect();
  await c.subscribe(topic, 1);
  let received = 0;
  let bytes = 0;
  let first = 0;
  let last = 0;
  const perSecond = [];
  c.onPublish = (_t, p) => {
    const t = now();
    if (!first) first = t;
    last = t;
    received++;
    bytes += p.length;
    const sec = Math.floor((t - first) / 1000);
    perSecond[sec] = (perSecond[sec] ?? 0) + 1;
  };
  process.stdout.write('SUBSCRIBED\n');
  const deadline = now() + durationMs;
  for (;;) {
    await sleep(50);
    if (expect && received >= expect) break;
    if (first && now() - last > idleMs) break;
    if (now() > deadline) break;
  }
  await c.end();
  const elapsedS = (last - first) / 1000;
  return { role: 'subscribe', received, bytes, elapsedS, perSec: received / elapsedS, perSecond };
}

const result = cfg.role === 'subscribe' ? await subscribeRole() : await publishRole();
const cpu = process.cpuUsage();
result.cpuS = (cpu.user + cpu.system) / 1e6;
writeFileSync(resultFile, JSON.stringify(result));
process.exit(0);
