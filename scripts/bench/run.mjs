#!/usr/bin/env node
// npm run bench [-- --quick] [-- flags]: Gillwise benchmarks on a private stack of their own.
//
// Starts a throwaway PostgreSQL (PostgreSQL's default durability: fsync on, synchronous_commit on,
// full_page_writes on) and Redis (append-only, fsync every second, as the demo stack) on free loopback
// ports under /var/tmp, an SMTP fake, the Gillwise server (server/index.ts, as a child) and, for the
// decision benchmark, the worker (worker/index.ts). Then runs each benchmark, prints a table and writes
// docs/benchmarks.md (the part between the generated-figures markers; the notes around it are kept).
//
// Flags (each also as env BENCH_<NAME>, e.g. BENCH_PROBES=100):
//   --quick                 ~2 min: shorter runs, smaller growth data; prints, writes the doc only with --write
//   --only ingest,decisions,growth,client   run only these benchmarks
//   --probes 200            simulated probes (each its own credential)
//   --duration 30           seconds of each ingest run (max, throttled, mosquitto)
//   --window 64             unacknowledged QoS 1 publishes per probe connection
//   --copy-rows 1000000     rows of the raw COPY ceiling
//   --tests 60              kit results posted in the decision benchmark
//   --days 7,30,90          growth data sizes (days of 1-minute readings)
//   --units 20              growth units (one probe each, 3–4 quantities)
//   --requests 80           autocannon requests per endpoint and range
//   --connections 4         autocannon connections
//   --profile               write a CPU profile of the server during the max-rate ingest run
//   --batch-max / --flush-ms   INGEST_BATCH_MAX / INGEST_FLUSH_MS for the server
//   --write / --no-write    write docs/benchmarks.md (default: yes, except with --quick)
//   --sync-off / --no-sync-off   one more max-rate run with synchronous_commit=off (an option, never the default)
//   --suspect-index         decisions: experiment with a partial index of suspect readings (see docs)
//   --attached              decisions: keep the simulated probes on the demo units (their evaluations run too)
//   --merge <results.json>  take the sections this run skips (--only) from an earlier run's raw results
//   --keep                  leave the stack's folder in /var/tmp for inspection
import { randomUUID } from 'node:crypto';
import { chmodSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import pg from 'pg';
import { parseFlags, repoRoot, run, sleep, which } from '../stack/common.mjs';
import { freePort, waitForPort } from '../stack/ports.mjs';
import { createDatabase, pgBinDir, startPostgres, stopPostgres } from '../stack/postgres.mjs';
import { startRedis, stopRedis } from '../stack/redis.mjs';
import { startSmtpFake } from '../stack/smtp-fake.mjs';
import { clientBench } from './lib/client-size.mjs';
import { writeDoc, renderTable } from './lib/report.mjs';
import { summarizeProfile } from './lib/profile.mjs';
import { runChild, startChild, stopAllChildren, stopChild, tsx } from './lib/proc.mjs';
import { summarize } from './lib/stats.mjs';
import { cpuOf, machineCpu, pgCpu, pgCpuDelta } from './lib/cpu.mjs';

const { flags } = parseFlags(process.argv.slice(2));
const quick = Boolean(flags.quick ?? process.env.BENCH_QUICK === '1');
const opt = (name, full, q) => {
  const env = process.env[`BENCH_${name.toUpperCase().replaceAll('-', '_')}`];
  const v = flags[name] ?? env;
  if (v === undefined) return quick ? q : full;
  return typeof full === 'number' ? Number(v) : v;
};
const O = {
  probes: opt('probes', 200, 200),
  duration: opt('duration', 30, 8),
  window: opt('window', 64, 64),
  copyRows: opt('copy-rows', 1_000_000, 300_000),
  tests: opt('tests', 60, 15),
  days: String(opt('days', '7,30,90', '1,7')).split(',').map(Number),
  units: opt('units', 20, 20),
  requests: opt('requests', 80, 40),
  connections: opt('connections', 4, 4),
  only: new Set(String(opt('only', 'ingest,decisions,growth,client', 'ingest,decisions,growth,client')).split(',')),
  profile: Boolean(flags.profile ?? process.env.BENCH_PROFILE === '1'),
  batchMax: flags['batch-max'] ?? process.env.BENCH_BATCH_MAX,
  flushMs: flags['flush-ms'] ?? process.env.BENCH_FLUSH_MS,
  write: flags.write ?? (process.env.BENCH_WRITE ? process.env.BENCH_WRITE === '1' : !quick),
  keep: Boolean(flags.keep),
  suspectIndex: Boolean(flags['suspect-index'] ?? process.env.BENCH_SUSPECT_INDEX === '1'),
  attached: Boolean(flags.attached ?? process.env.BENCH_ATTACHED === '1'),
  syncOff: flags['sync-off'] ?? (process.env.BENCH_SYNC_OFF ? process.env.BENCH_SYNC_OFF === '1' : !quick),
};

const say = (m) => process.stdout.write(`[bench] ${m}\n`);
const started = performance.now();
const elapsed = () => `${((performance.now() - started) / 1000).toFixed(0)} s`;

// ---------------------------------------------------------------- stack
const dir = mkdtempSync('/var/tmp/gillwise-bench-');
chmodSync(dir, 0o755);
writeFileSync(path.join(dir, 'owner.pid'), `${process.pid}\n`);
const pgDir = path.join(dir, 'pg');
const redisDir = path.join(dir, 'redis');
let mosquitto = null;
let smtp = null;
let cleaned = false;
async function cleanup() {
  if (cleaned) return;
  cleaned = true;
  await stopAllChildren().catch(() => undefined);
  if (mosquitto) await stopChild(mosquitto, 3000).catch(() => undefined);
  await smtp?.close().catch(() => undefined);
  await stopRedis({ dir: redisDir }).catch(() => undefined);
  await stopPostgres({ dataDir: pgDir, mode: 'fast' }).catch(() => undefined);
  if (!O.keep) rmSync(dir, { recursive: true, force: true });
}
for (const sig of ['SIGINT', 'SIGTERM']) {
  process.once(sig, () => {
    say(`${sig}: stopping the stack`);
    void cleanup().then(() => process.exit(130));
  });
}

const results = {
  mode: quick ? 'quick' : 'full',
  options: { ...O, only: [...O.only] },
  startedAt: new Date().toISOString(),
};

async function main() {
  say(`stack in ${dir}`);
  const [pgPort, redisPort, httpPort, mqttPort] = [await freePort(), await freePort(), await freePort(), await freePort()];
  const pgh = await startPostgres({ dataDir: pgDir, port: pgPort, fsyncOff: false, maxConnections: 200 });
  const redis = await startRedis({ dir: redisDir, port: redisPort, appendOnly: true });
  smtp = await startSmtpFake({ smtpPort: 0, apiPort: 0, keep: 100 });
  await createDatabase(pgh.adminUrl, 'gillwise_bench');
  const dbUrl = pgh.adminUrl.replace(/\/postgres$/, '/gillwise_bench');
  const db = new pg.Client({ connectionString: dbUrl });
  say(`PostgreSQL 127.0.0.1:${pgh.port}, Redis 127.0.0.1:${redis.port}; fixtures for ${O.probes} probes`);

  const fixturesFile = path.join(dir, 'fixtures.json');
  await runChild('setup', tsx, ['scripts/bench/setup.ts', dbUrl, String(O.probes), fixturesFile], { logFile: path.join(dir, 'setup.log') });
  const fx = JSON.parse(readFileSync(fixturesFile, 'utf8'));
  await db.connect();
  results.machine = await machine(db);
  results.pgSettings = (
    await db.query(
      `SELECT name, setting FROM pg_settings WHERE name IN ('fsync','synchronous_commit','full_page_writes','wal_level',
       'shared_buffers','work_mem','max_wal_size','checkpoint_timeout','commit_delay','wal_sync_method') ORDER BY name`,
    )
  ).rows;

  const serverEnv = {
    NODE_ENV: 'production',
    HTTP_HOST: '127.0.0.1',
    HTTP_PORT: String(httpPort),
    PUBLIC_URL: `http://127.0.0.1:${httpPort}`,
    MQTT_HOST: '127.0.0.1',
    MQTT_PORT: String(mqttPort),
    DATABASE_URL: dbUrl,
    REDIS_URL: redis.url,
    QUEUE_PREFIX: 'gwb',
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(smtp.smtpPort),
    MAIL_FAKE_API_URL: smtp.apiUrl,
    JWT_SECRET: `bench-${randomUUID()}-${randomUUID()}`,
    DATA_DIR: path.join(dir, 'data'),
    CLIENT_DIST_DIR: path.join(dir, 'no-client'),
    LOG_LEVEL: process.env.BENCH_LOG_LEVEL ?? 'info',
    ...(O.batchMax ? { INGEST_BATCH_MAX: String(O.batchMax) } : {}),
    ...(O.flushMs ? { INGEST_FLUSH_MS: String(O.flushMs) } : {}),
  };
  const ctx = { loopFile: path.join(dir, 'event-loop.jsonl'), pgPid: pgh.pid, dir, db, dbUrl, fx, serverEnv, httpPort, mqttPort, base: `http://127.0.0.1:${httpPort}`, adminUrl: pgh.adminUrl };

  let server = await startServer(ctx);
  results.load = [{ at: 'start', loadavg: os.loadavg().map((l) => Math.round(l * 100) / 100) }];
  results.calibration = await calibrate(db);
  say(`machine: load average ${results.load[0].loadavg.join(' ')}; count(generate_series(1, 5e6)) in ${results.calibration.generateSeriesMs} ms`);
  if (O.only.has('ingest') || O.only.has('ingest-max') || O.only.has('decisions')) {
    results.ingest = await ingestBench(ctx, server);
    server = ctx.server;
  }
  results.load.push({ at: 'after ingest', loadavg: os.loadavg().map((l) => Math.round(l * 100) / 100) });
  if (O.only.has('decisions')) results.decisions = await decisionBench(ctx);
  if (O.only.has('growth')) results.growth = await growthBench(ctx);
  await stopChild(ctx.server);
  if (O.only.has('client')) {
    say('client: vite build into the stack folder, sizes from the manifest');
    results.client = await clientBench(path.join(dir, 'client'));
  }
  results.load.push({ at: 'end', loadavg: os.loadavg().map((l) => Math.round(l * 100) / 100) });
  results.versions = await versions(db);
  results.finishedAt = new Date().toISOString();
  results.wallS = Math.round((performance.now() - started) / 1000);
  await db.end();

  if (flags.merge) {
    // Sections this run skipped (--only) come from an earlier run's raw results, named in the doc.
    const prev = JSON.parse(readFileSync(String(flags.merge), 'utf8'));
    for (const k of ['ingest', 'decisions', 'growth', 'client']) {
      if (results[k] === undefined && prev[k] !== undefined) {
        results[k] = prev[k];
        (results.merged ??= []).push({ section: k, from: prev.startedAt, mode: prev.mode, load: prev.load, calibration: prev.calibration });
      }
    }
  }
  const resultFile = `/var/tmp/gillwise-bench-results-${results.startedAt.replace(/[:.]/g, '-')}.json`;
  writeFileSync(resultFile, JSON.stringify(results, null, 2));
  process.stdout.write(`\n${renderTable(results)}\n`);
  say(`raw results: ${resultFile}`);
  if (O.write) {
    writeDoc(path.join(repoRoot, 'docs/benchmarks.md'), results);
    say('wrote docs/benchmarks.md');
  } else say('docs/benchmarks.md not written (quick mode; pass --write to write it)');
}

// ---------------------------------------------------------------- server
async function startServer(ctx, { profileDir } = {}) {
  const args = [...(profileDir ? ['--cpu-prof', `--cpu-prof-dir=${profileDir}`] : []), '--import', 'tsx', 'scripts/bench/server-entry.ts'];
  const h = startChild('server', process.execPath, args, { env: { ...ctx.serverEnv, BENCH_LOOP_FILE: ctx.loopFile }, logFile: path.join(ctx.dir, 'server.log') });
  const deadline = Date.now() + 60_000;
  for (;;) {
    const ok = await fetch(`${ctx.base}/api/health`).then((r) => r.status > 0, () => false);
    if (ok) break;
    if (Date.now() > deadline) throw new Error(`server did not answer:\n${h.tail()}`);
    if (h.child.exitCode !== null) throw new Error(`server exited:\n${h.tail()}`);
    await sleep(100);
  }
  await waitForPort(ctx.mqttPort);
  ctx.server = h;
  return h;
}

async function restartServer(ctx, opts) {
  await stopChild(ctx.server);
  return startServer(ctx, opts);
}

/** The server's event-loop delay between two wall-clock times (per-second p99 and max, in ms). */
function loopLag(ctx, from, to) {
  let lines = [];
  try {
    lines = readFileSync(ctx.loopFile, 'utf8').trim().split('\n').map((l) => JSON.parse(l));
  } catch {
    return null;
  }
  const w = lines.filter((l) => l.t >= from && l.t <= to);
  if (!w.length) return null;
  const r = (v) => Math.round(v);
  return { seconds: w.length, p99Median: r(summarize(w.map((l) => l.p99)).p50), p99Worst: r(Math.max(...w.map((l) => l.p99))), max: r(Math.max(...w.map((l) => l.max))) };
}

// ---------------------------------------------------------------- ingest
let runNo = 0;
/** A run's readings use their own slice of time, so runs never collide on the primary key. */
const epochFor = (k) => Date.now() - 12 * 3600_000 + k * 45 * 60_000;

async function load(ctx, cfg, name) {
  const k = ++runNo;
  const cpu0 = { server: ctx.server?.pid ? cpuOf(ctx.server.pid) : 0, pg: pgCpu(ctx.pgPid), machine: machineCpu(), mosquitto: mosquitto ? cpuOf(mosquitto.pid) : 0, wall: Date.now() };
  const config = { host: '127.0.0.1', durationMs: O.duration * 1000, window: O.window, epochMs: epochFor(k), ...cfg };
  const cfgFile = path.join(ctx.dir, `load-${k}.json`);
  const outFile = path.join(ctx.dir, `load-${k}.out.json`);
  writeFileSync(cfgFile, JSON.stringify(config));
  await runChild(name, process.execPath, ['scripts/bench/load.mjs', cfgFile, outFile], { logFile: path.join(ctx.dir, `${name}.log`) });
  const r = JSON.parse(readFileSync(outFile, 'utf8'));
  r.eventLoopMs = loopLag(ctx, cpu0.wall, Date.now());
  const m = machineCpu();
  const cpu = {
    serverS: ctx.server?.pid ? cpuOf(ctx.server.pid) - cpu0.server : 0,
    postgresS: pgCpuDelta(cpu0.pg, pgCpu(ctx.pgPid)),
    loadS: r.cpuS,
    mosquittoS: mosquitto ? cpuOf(mosquitto.pid) - cpu0.mosquitto : 0,
    machineBusyS: m.busy - cpu0.machine.busy,
    machineTotalS: m.total - cpu0.machine.total,
  };
  cpu.otherS = cpu.machineBusyS - cpu.serverS - cpu.postgresS - cpu.loadS - cpu.mosquittoS;
  return { ...r, cpu, epochMs: config.epochMs };
}

/** Every acknowledged message is stored with its 4 readings, and nothing is stored twice. */
async function verify(ctx, run) {
  const ids = run.perProbe.map((p) => p.probeId);
  const from = new Date(run.epochMs).toISOString();
  const to = new Date(run.epochMs + Math.max(...run.perProbe.map((p) => p.sent)) + 1).toISOString();
  const rows = (
    await ctx.db.query(
      `SELECT probe_id::text AS id, count(*)::int AS n, count(DISTINCT (quantity, at))::int AS distinct_n,
              count(DISTINCT at)::int AS messages, min(received_at) AS first_rx, max(received_at) AS last_rx
       FROM readings WHERE probe_id = ANY($1::uuid[]) AND at >= $2 AND at < $3 GROUP BY probe_id`,
      [ids, from, to],
    )
  ).rows;
  const byId = new Map(rows.map((r) => [r.id, r]));
  let stored = 0;
  let duplicates = 0;
  let missingAcked = 0;
  let storedUnacked = 0;
  let incomplete = 0;
  for (const p of run.perProbe) {
    const r = byId.get(p.probeId) ?? { n: 0, distinct_n: 0, messages: 0 };
    stored += r.n;
    duplicates += r.n - r.distinct_n;
    if (r.n !== r.messages * 4) incomplete++;
    // Messages 0..sent-1 were sent; those not in unackedSeqs were acknowledged.
    const acked = p.sent - p.unackedSeqs.length;
    if (r.messages < acked) missingAcked += acked - r.messages;
    if (r.messages > acked) storedUnacked += r.messages - acked;
  }
  if (missingAcked) {
    // Fewer stored messages than acknowledged ones: find exactly which (should never happen).
    say(`WARNING: ${missingAcked} acknowledged message(s) not found`);
  }
  const rx = rows.reduce(
    (a, r) => ({ first: a.first && a.first < r.first_rx ? a.first : r.first_rx, last: a.last && a.last > r.last_rx ? a.last : r.last_rx }),
    { first: null, last: null },
  );
  return { stored, duplicates, missingAcked, storedUnacked, incomplete, firstRx: rx.first, lastRx: rx.last };
}

async function ingestBench(ctx) {
  const out = {};
  const probes = ctx.fx.probes;
  const profileDir = O.profile ? path.join(ctx.dir, 'profile') : null;
  if (profileDir) {
    mkdirSync(profileDir, { recursive: true });
    await restartServer(ctx, { profileDir });
  }
  say(`ingest: ${probes.length} probes, window ${O.window}, ${O.duration} s as fast as the broker acknowledges`);
  const before = Number((await ctx.db.query('SELECT count(*) AS n FROM readings')).rows[0].n);
  const max = await load(ctx, { port: ctx.mqttPort, probes, auth: true, rate: 0 }, 'ingest-max');
  const v = await verify(ctx, max);
  const after = Number((await ctx.db.query('SELECT count(*) AS n FROM readings')).rows[0].n);
  out.max = {
    ...strip(max),
    verify: v,
    rowsCounted: after - before,
    readingsPerSec: v.stored / max.elapsedS,
    cpuPer100k: per100k(max.cpu, v.stored),
  };
  say(`  CPU per 100,000 readings: server ${out.max.cpuPer100k.serverS} s, PostgreSQL ${out.max.cpuPer100k.postgresS} s, load generator ${out.max.cpuPer100k.loadS} s; other processes used ${max.cpu.otherS.toFixed(0)} of ${max.cpu.machineTotalS.toFixed(0)} CPU-s`);
  say(
    `  ${Math.round(out.max.readingsPerSec).toLocaleString('en')} readings/s durable (${v.stored.toLocaleString('en')} rows in ${max.elapsedS.toFixed(1)} s), ` +
      `acked ${max.acked}/${max.sent}, missing ${v.missingAcked}, duplicates ${v.duplicates}; PUBACK p50 ${max.ackLatencyMs.p50} p99 ${max.ackLatencyMs.p99} ms`,
  );
  if (profileDir) {
    await restartServer(ctx);
    const file = readdirSync(profileDir).find((f) => f.endsWith('.cpuprofile'));
    out.profile = file ? summarizeProfile(path.join(profileDir, file)) : null;
    if (out.profile) say(`  profile: ${out.profile.top.slice(0, 6).map((t) => `${t.name} ${t.pct}%`).join(', ')}`);
  }

  if (!O.only.has('ingest')) return out;
  const target = Math.round((0.8 * out.max.readingsPerSec) / 4);
  say(`ingest: throttled to 0.8 × max = ${target.toLocaleString('en')} messages/s, latency publish → PUBACK and → row visible`);
  const thr = await load(
    ctx,
    { port: ctx.mqttPort, probes, auth: true, rate: target, poll: { pgUrl: ctx.dbUrl, sampleEvery: 25, intervalMs: 20 } },
    'ingest-80',
  );
  const v2 = await verify(ctx, thr);
  out.throttled = { ...strip(thr), verify: v2, readingsPerSec: v2.stored / thr.elapsedS, targetMsgsPerSec: target, sustained: thr.ackedPerSec >= 0.95 * target };
  if (!quick || !out.throttled.sustained) {
    // The machine may not sustain 0.8 × a max measured a minute earlier (other load changes): also 0.5 ×.
    const half = Math.round((0.5 * out.max.readingsPerSec) / 4);
    say(`ingest: throttled to 0.5 × max = ${half.toLocaleString('en')} messages/s`);
    const h = await load(ctx, { port: ctx.mqttPort, probes, auth: true, rate: half, poll: { pgUrl: ctx.dbUrl, sampleEvery: 25, intervalMs: 20 } }, 'ingest-50');
    const vh = await verify(ctx, h);
    out.half = { ...strip(h), verify: vh, readingsPerSec: vh.stored / h.elapsedS, targetMsgsPerSec: half, sustained: h.ackedPerSec >= 0.95 * half };
    say(`  ${Math.round(out.half.readingsPerSec).toLocaleString('en')} readings/s; PUBACK p50 ${h.ackLatencyMs.p50} p99 ${h.ackLatencyMs.p99} ms; visible p50 ${h.visibilityMs.p50} p99 ${h.visibilityMs.p99} ms`);
  }
  say(
    `  ${Math.round(out.throttled.readingsPerSec).toLocaleString('en')} readings/s; PUBACK p50 ${thr.ackLatencyMs.p50} p99 ${thr.ackLatencyMs.p99} ms; ` +
      `visible p50 ${thr.visibilityMs.p50} p99 ${thr.visibilityMs.p99} ms (${thr.visibilityMs.samples} samples)`,
  );

  if (O.syncOff) {
    say('ingest option: the same max-rate run with synchronous_commit = off for the bench database (not the product default)');
    await ctx.db.query('ALTER DATABASE gillwise_bench SET synchronous_commit = off');
    await restartServer(ctx);
    const off = await load(ctx, { port: ctx.mqttPort, probes, auth: true, rate: 0 }, 'ingest-max-sync-off');
    const vo = await verify(ctx, off);
    out.syncOff = { ...strip(off), verify: vo, readingsPerSec: vo.stored / off.elapsedS, cpuPer100k: per100k(off.cpu, vo.stored) };
    say(`  ${Math.round(out.syncOff.readingsPerSec).toLocaleString('en')} readings/s; PUBACK p50 ${off.ackLatencyMs.p50} p99 ${off.ackLatencyMs.p99} ms`);
    await ctx.db.query('ALTER DATABASE gillwise_bench RESET synchronous_commit');
    await restartServer(ctx);
  }
  say('ingest hot path in-process (best of 7 rounds, µs)');
  const hp = path.join(ctx.dir, 'hot-path.json');
  await runChild('hot-path', tsx, ['scripts/bench/hot-path.ts', hp], { logFile: path.join(ctx.dir, 'hot-path.log') });
  out.hotPath = JSON.parse(readFileSync(hp, 'utf8'));
  say(`  ${Object.entries(out.hotPath).map(([k, v]) => `${k}: ${v}`).join('; ')}`);
  out.mosquitto = await mosquittoBench(ctx);
  out.copy = await copyBench(ctx);
  out.ratios = {
    vsMosquitto: out.mosquitto ? out.max.readingsPerSec / out.mosquitto.readingsPerSec : null,
    vsCopy: out.max.readingsPerSec / out.copy.rowsPerSec,
  };
  out.counters = await fetch(`${ctx.base}/api/health`).then((r) => r.json(), () => null);
  return out;
}

const per100k = (cpu, rows) => {
  const f = (v) => Math.round((v / rows) * 1e5 * 100) / 100;
  const serverS = f(cpu.serverS);
  const postgresS = f(cpu.postgresS);
  const mosquittoS = f(cpu.mosquittoS);
  // On two dedicated cores the server and PostgreSQL could at best use both: readings/s if CPU were the only limit.
  const bound = Math.round((2 / ((cpu.serverS + cpu.postgresS + cpu.mosquittoS) / rows)) );
  return { serverS, postgresS, loadS: f(cpu.loadS), mosquittoS, cpuBoundReadingsPerSec: bound, otherShare: Math.round((cpu.otherS / cpu.machineTotalS) * 100) };
};

const strip = (r) => {
  const { perProbe, ...rest } = r;
  return { ...rest, probesWithUnacked: perProbe.filter((p) => p.unackedSeqs.length).length };
};

async function mosquittoBench(ctx) {
  const bin = which('mosquitto');
  if (!bin) {
    say('mosquitto: not installed (apt-get install -y mosquitto); skipped');
    return null;
  }
  const port = await freePort();
  const conf = path.join(ctx.dir, 'mosquitto.conf');
  writeFileSync(
    conf,
    [
      `listener ${port} 127.0.0.1`,
      'allow_anonymous true',
      'persistence false',
      'max_inflight_messages 0',
      'max_queued_messages 0',
      'set_tcp_nodelay true',
      `log_dest file ${path.join(ctx.dir, 'mosquitto.log')}`,
      'log_type error',
      'log_type warning',
      '',
    ].join('\n'),
  );
  chmodSync(conf, 0o644);
  mosquitto = startChild('mosquitto', bin, ['-c', conf], { logFile: path.join(ctx.dir, 'mosquitto.out') });
  await waitForPort(port);
  const version = (await run(bin, ['-h'])).stdout.split('\n')[0]?.trim();
  say(`mosquitto (${version}): same messages QoS 1 relayed to one QoS 1 subscriber that stores nothing`);
  const k = ++runNo;
  const subCfg = path.join(ctx.dir, `sub-${k}.json`);
  const subOut = path.join(ctx.dir, `sub-${k}.out.json`);
  writeFileSync(subCfg, JSON.stringify({ role: 'subscribe', host: '127.0.0.1', port, topic: 'gillwise/v1/probes/+/readings', durationMs: (O.duration + 60) * 1000 }));
  let ready;
  const subscribed = new Promise((r) => (ready = r));
  const sub = startChild('mosquitto-sub', process.execPath, ['scripts/bench/load.mjs', subCfg, subOut], {
    onLine: (l) => l.includes('SUBSCRIBED') && ready(),
  });
  await subscribed;
  const pub = await load(ctx, { port, probes: ctx.fx.probes, auth: false, rate: 0 }, 'mosquitto-pub');
  await sub.exited;
  const s = JSON.parse(readFileSync(subOut, 'utf8'));
  await stopChild(mosquitto, 3000);
  mosquitto = null;
  const res = {
    version,
    published: pub.acked,
    delivered: s.received,
    deliveredPerSec: s.perSec,
    readingsPerSec: (s.received * 4) / s.elapsedS,
    publishAckedPerSec: pub.ackedPerSec,
    ackLatencyMs: pub.ackLatencyMs,
    cpuPer100k: per100k({ ...pub.cpu, serverS: 0, postgresS: 0 }, s.received * 4),
  };
  say(`  ${Math.round(res.readingsPerSec).toLocaleString('en')} readings/s relayed (${s.received}/${pub.acked} messages delivered)`);
  return res;
}

async function copyBench(ctx) {
  say(`COPY ceiling: ${O.copyRows.toLocaleString('en')} rows, same shape as readings (primary key + BRIN), one COPY per 20,000 rows`);
  const out = path.join(ctx.dir, 'copy.out.json');
  const pg0 = pgCpu(ctx.pgPid);
  await runChild('copy', process.execPath, ['scripts/bench/copy.mjs', ctx.dbUrl, String(O.copyRows), out, JSON.stringify(ctx.fx.probes.map((p) => p.probeId))], {
    logFile: path.join(ctx.dir, 'copy.log'),
  });
  const r = JSON.parse(readFileSync(out, 'utf8'));
  r.postgresCpuPer100kS = Math.round((pgCpuDelta(pg0, pgCpu(ctx.pgPid)) / (2 * r.rows)) * 1e5 * 100) / 100;
  say(`  ${Math.round(r.rowsPerSec).toLocaleString('en')} rows/s (1 stream); ${Math.round(r.rowsPerSec2 ?? 0).toLocaleString('en')} rows/s (2 streams)`);
  return r;
}

// ---------------------------------------------------------------- decisions
async function signIn(ctx, email, password) {
  const res = await fetch(`${ctx.base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${email}: ${res.status} ${await res.text()}`);
  return res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
}

async function decisionBench(ctx) {
  const maxRate = results.ingest?.max?.readingsPerSec;
  const rate = maxRate ? Math.round((0.5 * maxRate) / 4) : 5000;
  say(`decisions: worker on; ingest at 0.5 × max = ${rate.toLocaleString('en')} messages/s; ${O.tests} kit results posted → result visible`);
  // node --import tsx (not the tsx wrapper), so that the pid whose CPU time is read is the worker itself.
  // The simulated probes publish hundreds of times a minute each, so every evaluation the ingest queues
  // for their units reads thousands of times the history a real probe leaves: with them on the units,
  // the worker's evaluations would measure that artefact (see docs/benchmarks.md). Detached from units,
  // they load ingest exactly as before and queue no evaluations; kit results still queue their own.
  if (!O.attached) {
    await ctx.db.query(`UPDATE probes SET unit_id = NULL WHERE probe_key LIKE 'bench-%'`);
    await restartServer(ctx);
  }
  if (O.suspectIndex) {
    // Experiment (not a migration): probe health counts suspect readings of the last day per probe and
    // quantity; a partial index holds only those, so the count no longer visits every reading of the day.
    say(`  experiment: CREATE INDEX … ON readings (probe_id, quantity, at) WHERE quality = 'suspect'`);
    await ctx.db.query(`CREATE INDEX IF NOT EXISTS bench_readings_suspect ON readings (probe_id, quantity, at) WHERE quality = 'suspect'`);
    await ctx.db.query('ANALYZE readings');
  }
  const worker = startChild('worker', process.execPath, ['--import', 'tsx', 'worker/index.ts'], { env: ctx.serverEnv, logFile: path.join(ctx.dir, 'worker.log') });
  const cookie = await signIn(ctx, ctx.fx.hand, ctx.fx.password);
  const headers = { cookie, 'content-type': 'application/json' };
  // Wait for the worker's heartbeat (health reports it) so the first result does not time its start-up.
  for (let i = 0; i < 200; i++) {
    const h = await fetch(`${ctx.base}/api/health`).then((r) => r.json(), () => null);
    if (JSON.stringify(h ?? {}).match(/"worker"[^}]*"ok"/)) break;
    await sleep(100);
  }
  const spacingMs = 400;
  const durationS = Math.ceil((O.tests * spacingMs) / 1000) + 6;
  const k = ++runNo;
  const cfgFile = path.join(ctx.dir, `load-${k}.json`);
  const outFile = path.join(ctx.dir, `load-${k}.out.json`);
  writeFileSync(
    cfgFile,
    JSON.stringify({ host: '127.0.0.1', port: ctx.mqttPort, probes: ctx.fx.probes, auth: true, rate, durationMs: durationS * 1000, window: O.window, epochMs: Date.now() - 60_000 }),
  );
  const workerCpu0 = cpuOf(worker.pid);
  const serverCpu0 = cpuOf(ctx.server.pid);
  const pg0 = pgCpu(ctx.pgPid);
  const m0 = machineCpu();
  const bg = startChild('decisions-load', process.execPath, ['scripts/bench/load.mjs', cfgFile, outFile], { logFile: path.join(ctx.dir, 'decisions-load.log') });
  await sleep(3000);
  const lat = [];
  const post = [];
  const toStored = [];
  const computeAfterStore = [];
  const loopProbe = [];
  // What the database sessions wait on meanwhile (sampled every 100 ms).
  const waits = new Map();
  const waitDb = new pg.Client({ connectionString: ctx.dbUrl });
  await waitDb.connect();
  let sampling = true;
  const sampler = (async () => {
    while (sampling) {
      const { rows } = await waitDb.query(
        `SELECT coalesce(wait_event_type || ':' || wait_event, 'CPU') AS w, left(regexp_replace(query, '\\s+', ' ', 'g'), 60) AS q
         FROM pg_stat_activity WHERE datname = current_database() AND state = 'active' AND pid <> pg_backend_pid()`,
      );
      for (const r of rows) waits.set(`${r.w} | ${r.q}`, (waits.get(`${r.w} | ${r.q}`) ?? 0) + 1);
      await sleep(100);
    }
  })();
  // Event-loop probe: an unknown API path answers 404 without touching the database or Redis.
  let probing = true;
  const probeLoop = (async () => {
    while (probing) {
      const t = performance.now();
      await fetch(`${ctx.base}/api/bench-no-such-route`).then((r) => r.arrayBuffer(), () => null);
      loopProbe.push(performance.now() - t);
      await sleep(50);
    }
  })();
  const failures = [];
  const one = async (i) => {
    const unitId = ctx.fx.unitIds[i % ctx.fx.unitIds.length];
    const body = {
      clientId: randomUUID(),
      analyte: 'total_ammonia',
      method: 'salicylate',
      basis: 'tan-n',
      value: 0.4 + (i % 10) / 10,
      sampledAt: new Date().toISOString(),
      handheldPh: 7.9,
      handheldTemperatureC: 26,
    };
    const t0 = performance.now();
    const wall0 = Date.now();
    const res = await fetch(`${ctx.base}/api/farms/${ctx.fx.farmId}/units/${unitId}/tests`, { method: 'POST', headers, body: JSON.stringify(body) });
    const created = await res.json();
    post.push(performance.now() - t0);
    if (res.status !== 201) return failures.push(`POST ${res.status} ${JSON.stringify(created).slice(0, 200)}`);
    let t = created;
    while (!t.result) {
      if (performance.now() - t0 > 30_000) return failures.push('no result after 30 s');
      await sleep(10);
      t = await (await fetch(`${ctx.base}/api/farms/${ctx.fx.farmId}/tests/${created.id}`, { headers: { cookie } })).json();
    }
    lat.push(performance.now() - t0);
    // Where the time went: the test row's creation and the result's computation, by the database clock.
    const q = (await lookup.query('SELECT w.created_at, r.computed_at FROM water_tests w JOIN free_ammonia_results r ON r.water_test_id = w.id WHERE w.id = $1', [created.id])).rows[0];
    if (q) {
      toStored.push(q.created_at.getTime() - wall0);
      computeAfterStore.push(q.computed_at.getTime() - q.created_at.getTime());
    }
  };
  const lookup = new pg.Pool({ connectionString: ctx.dbUrl, max: 3 });
  const inflight = [];
  for (let i = 0; i < O.tests; i++) {
    inflight.push(one(i).catch((e) => failures.push(String(e))));
    await sleep(spacingMs);
  }
  await Promise.all(inflight);
  await lookup.end();
  probing = false;
  sampling = false;
  await probeLoop;
  await sampler;
  await waitDb.end();
  await bg.exited;
  const loadRes = JSON.parse(readFileSync(outFile, 'utf8'));
  const lag = loopLag(ctx, Date.now() - durationS * 1000, Date.now());
  const m1 = machineCpu();
  const cpu = {
    workerS: Math.round((cpuOf(worker.pid) - workerCpu0) * 10) / 10,
    serverS: Math.round((cpuOf(ctx.server.pid) - serverCpu0) * 10) / 10,
    postgresS: Math.round(pgCpuDelta(pg0, pgCpu(ctx.pgPid)) * 10) / 10,
    loadS: Math.round(loadRes.cpuS * 10) / 10,
    machineBusyS: Math.round((m1.busy - m0.busy) * 10) / 10,
    machineTotalS: Math.round((m1.total - m0.total) * 10) / 10,
  };
  await stopChild(worker);
  const statuses = (await ctx.db.query(`SELECT status, count(*)::int AS n FROM free_ammonia_results GROUP BY status`)).rows;
  const res = {
    probesOnUnits: O.attached,
    suspectIndex: O.suspectIndex,
    resultStatuses: statuses,
    ingestTargetMsgsPerSec: rate,
    ingestReadingsPerSec: (loadRes.acked * 4) / loadRes.elapsedS,
    ingestAckLatencyMs: loadRes.ackLatencyMs,
    postMs: summarize(post),
    postToTestStoredMs: summarize(toStored),
    storedToComputedMs: summarize(computeAfterStore),
    http404Ms: summarize(loopProbe),
    eventLoopMs: lag,
    cpu,
    dbWaits: [...waits.entries()].sort((a, b) => b[1] - a[1]).slice(0, 12),
    resultVisibleMs: summarize(lat),
    failures,
    pollMs: 10,
    spacingMs,
  };
  say(`  POST alone p50 ${res.postMs.p50} p95 ${res.postMs.p95} ms; test stored → result computed p50 ${res.storedToComputedMs.p50} p95 ${res.storedToComputedMs.p95} ms; 404 probe p50 ${res.http404Ms.p50} p95 ${res.http404Ms.p95} ms; event-loop delay p99 ${lag?.p99Median} ms (worst second ${lag?.p99Worst} ms)`);
  say(`  CPU-s over the run: worker ${cpu.workerS}, server ${cpu.serverS}, PostgreSQL ${cpu.postgresS}, load generator ${cpu.loadS}; machine busy ${cpu.machineBusyS} of ${cpu.machineTotalS}`);
  say(`  POST → result visible p50 ${res.resultVisibleMs.p50} p95 ${res.resultVisibleMs.p95} ms (n ${lat.length}, failures ${failures.length}); ingest ${Math.round(res.ingestReadingsPerSec).toLocaleString('en')} readings/s`);
  return res;
}

// ---------------------------------------------------------------- growth
async function growthBench(ctx) {
  const { db } = ctx;
  const farmId = ctx.fx.farmId;
  say(`growth: ${O.units} units, 1-minute readings, ${O.days.join('/')} days; autocannon ${O.requests} requests × ${O.connections} connections`);
  // Only the growth units' probes remain on the farm: detach the ingest probes, empty readings.
  await db.query(`UPDATE probes SET unit_id = NULL, active = false WHERE probe_key LIKE 'bench-%'`);
  const units = (await db.query(`SELECT id, code FROM culture_units WHERE farm_id = $1 ORDER BY walk_order, code`, [farmId])).rows;
  for (let n = units.length; n < O.units; n++) {
    const code = `G${String(n + 1).padStart(2, '0')}`;
    const { rows } = await db.query(
      `INSERT INTO culture_units (farm_id, code, name, kind, outline, area_m2, volume_m3, water_type, default_salinity_ppt, species,
         life_stage, state, test_frequency_days, qr_label_id, walk_order, threshold_profile_id, feed_protein_fraction)
       SELECT farm_id, $2, 'Growth pond ' || $2, kind, outline, area_m2, volume_m3, water_type, default_salinity_ppt, species,
         life_stage, state, test_frequency_days, qr_label_id || '-' || lower($2), walk_order + 100 + $3, threshold_profile_id, feed_protein_fraction
       FROM culture_units WHERE id = $1 RETURNING id, code`,
      [units[0].id, code, n],
    );
    units.push(rows[0]);
  }
  const chosen = units.slice(0, O.units);
  const qsets = [
    ['ph', 'water_temperature', 'dissolved_oxygen'],
    ['ph', 'water_temperature', 'dissolved_oxygen', 'salinity'],
  ];
  const probeIds = [];
  for (const [i, u] of chosen.entries()) {
    const quantities = qsets[i % 2];
    const existing = (await db.query(`SELECT id FROM probes WHERE unit_id = $1 ORDER BY created_at`, [u.id])).rows;
    if (existing.length) {
      await db.query(`UPDATE probes SET quantities = $2::jsonb WHERE id = $1`, [existing[0].id, JSON.stringify(quantities)]);
      await db.query(`UPDATE probes SET unit_id = NULL WHERE unit_id = $1 AND id <> $2`, [u.id, existing[0].id]);
      probeIds.push({ id: existing[0].id, unitId: u.id, quantities });
    } else {
      const { rows } = await db.query(
        `INSERT INTO probes (farm_id, unit_id, probe_key, label, quantities, secret_hash, secret_rotated_at)
         VALUES ($1, $2, $3, $4, $5::jsonb, 'sha256:none', now()) RETURNING id`,
        [farmId, u.id, `growth-${u.code.toLowerCase()}`, `growth probe ${u.code}`, JSON.stringify(quantities)],
      );
      probeIds.push({ id: rows[0].id, unitId: u.id, quantities });
    }
  }
  await db.query(`CREATE TEMP TABLE growth_pq (probe_id uuid, quantity text, base float8, amp float8)`);
  const bases = { ph: [7.8, 0.4], water_temperature: [26, 2], dissolved_oxygen: [6.5, 2], salinity: [0.4, 0.05] };
  for (const p of probeIds) for (const q of p.quantities) await db.query(`INSERT INTO growth_pq VALUES ($1, $2, $3, $4)`, [p.id, q, ...bases[q]]);

  const cookie = await signIn(ctx, 'manager@harrowbend.example', ctx.fx.password);
  const autocannon = (await import('autocannon')).default;
  const now = new Date(Math.floor(Date.now() / 60_000) * 60_000);
  const ranges = [
    ['24 h', 1],
    ['7 d', 7],
    ['30 d', 30],
    ['90 d', 90],
  ];
  const out = { units: O.units, quantitiesPerUnit: '3–4', connections: O.connections, requests: O.requests, sizes: [] };
  for (const days of O.days) {
    const t0 = performance.now();
    await db.query('TRUNCATE readings');
    // Oldest first, one day per statement, so the table is in time order as live ingest leaves it.
    for (let d = days; d > 0; d--) {
      await db.query(
        `INSERT INTO readings (probe_id, quantity, at, value, quality)
         SELECT pq.probe_id, pq.quantity, m.at,
                pq.base + pq.amp * sin(extract(epoch FROM m.at) / 86400.0 * 2 * pi()) + (random() - 0.5) * pq.amp * 0.05,
                'good'
         FROM generate_series($1::timestamptz, $2::timestamptz - interval '1 minute', interval '1 minute') AS m(at)
         CROSS JOIN growth_pq pq`,
        [new Date(now.getTime() - d * 86400_000), new Date(now.getTime() - (d - 1) * 86400_000)],
      );
    }
    const genS = (performance.now() - t0) / 1000;
    await db.query('VACUUM ANALYZE readings');
    const size = (
      await db.query(
        `SELECT count(*)::bigint AS n, pg_size_pretty(pg_total_relation_size('readings')) AS total,
                pg_size_pretty(pg_relation_size('pk_readings')) AS pk FROM readings`,
      )
    ).rows[0];
    say(`  ${days} days: ${Number(size.n).toLocaleString('en')} rows (${size.total}, primary key ${size.pk}) generated in ${genS.toFixed(0)} s`);
    const entry = { days, rows: Number(size.n), tableSize: size.total, pkSize: size.pk, generateS: Math.round(genS), series: [], status: null };
    for (const [label, rangeDays] of ranges) {
      const from = new Date(now.getTime() - rangeDays * 86400_000).toISOString();
      const to = now.toISOString();
      const paths = chosen.map((u) => `/api/farms/${farmId}/units/${u.id}/series?from=${encodeURIComponent(from)}&to=${encodeURIComponent(to)}`);
      // One response checked by hand: points and buckets.
      const sample = await fetch(`${ctx.base}${paths[0]}`, { headers: { cookie } }).then((r) => r.json());
      const r = await cannon(autocannon, ctx.base, paths, cookie);
      entry.series.push({
        range: label,
        ...r,
        pointsPerSeries: sample.series?.map((s) => s.points.length),
        bucketSeconds: sample.series?.[0]?.bucketSeconds,
        readingsPerSeries: sample.series?.[0]?.readings,
      });
      say(`    series ${label}: p50 ${r.p50} p95 ${r.p95} ms (${r.non2xx} non-2xx)`);
    }
    entry.status = await cannon(autocannon, ctx.base, [`/api/farms/${farmId}/status`], cookie);
    say(`    status: p50 ${entry.status.p50} p95 ${entry.status.p95} ms`);
    if (days === Math.max(...O.days)) {
      const ex = path.join(ctx.dir, 'explain.json');
      const u = chosen[1] ?? chosen[0];
      await runChild('explain', tsx, ['scripts/bench/explain.ts', ctx.dbUrl, JSON.stringify({ farmId, unitId: u.id, now: now.toISOString() }), ex], {
        logFile: path.join(ctx.dir, 'explain.log'),
      });
      entry.explain = JSON.parse(readFileSync(ex, 'utf8'));
      // Experiment (not a migration): a covering index, so series read the index only instead of one
      // heap page per reading (live ingest interleaves every probe's rows in time order).
      say('    experiment: covering index (probe_id, quantity, at) INCLUDE (value, quality), then the same requests');
      const t1 = performance.now();
      await db.query('CREATE INDEX bench_readings_covering ON readings (probe_id, quantity, at) INCLUDE (value, quality)');
      await db.query('VACUUM ANALYZE readings');
      const idx = (await db.query(`SELECT pg_size_pretty(pg_relation_size('bench_readings_covering')) AS s`)).rows[0].s;
      entry.covering = { indexSize: idx, buildS: Math.round((performance.now() - t1) / 1000), series: [] };
      for (const [label, rangeDays] of ranges) {
        const from = new Date(now.getTime() - rangeDays * 86400_000).toISOString();
        const paths = chosen.map((u) => `/api/farms/${farmId}/units/${u.id}/series?from=${encodeURIComponent(from)}&to=${encodeURIComponent(now.toISOString())}`);
        const r = await cannon(autocannon, ctx.base, paths, cookie);
        entry.covering.series.push({ range: label, ...r });
        say(`      series ${label}: p50 ${r.p50} p95 ${r.p95} ms`);
      }
      await runChild('explain', tsx, ['scripts/bench/explain.ts', ctx.dbUrl, JSON.stringify({ farmId, unitId: u.id, now: now.toISOString() }), ex], {
        logFile: path.join(ctx.dir, 'explain.log'),
      });
      entry.covering.explain = JSON.parse(readFileSync(ex, 'utf8'));
      await db.query('DROP INDEX bench_readings_covering');
    }
    out.sizes.push(entry);
  }
  return out;
}

function cannon(autocannon, base, paths, cookie) {
  let i = 0;
  return new Promise((resolve, reject) => {
    autocannon(
      {
        url: base,
        connections: O.connections,
        amount: O.requests,
        timeout: 30,
        headers: { cookie },
        requests: [
          {
            setupRequest: (req) => ({ ...req, method: 'GET', path: paths[i++ % paths.length] }),
          },
        ],
      },
      (err, r) => {
        if (err) return reject(err);
        resolve({
          n: r.requests.total,
          p50: r.latency.p50,
          p90: r.latency.p90,
          p95: r.latency.p97_5 !== undefined ? percentileFromCannon(r, 95) : null,
          p99: r.latency.p99,
          max: r.latency.max,
          mean: Math.round(r.latency.average * 10) / 10,
          rps: Math.round(r.requests.average),
          non2xx: r.non2xx,
          errors: r.errors,
        });
      },
    );
  });
}

/** autocannon reports p2.5…p99.999 but not p95; interpolate between p90 and p97.5. */
function percentileFromCannon(r, q) {
  const { p90, p97_5 } = r.latency;
  return Math.round((p90 + ((q - 90) / 7.5) * (p97_5 - p90)) * 10) / 10;
}

// ---------------------------------------------------------------- machine and versions
/** A CPU yardstick for comparing runs (the machine may be shared): best of three. */
async function calibrate(db) {
  let best = Infinity;
  for (let i = 0; i < 3; i++) {
    const t = performance.now();
    await db.query('SELECT count(*) FROM generate_series(1, 5000000)');
    best = Math.min(best, performance.now() - t);
  }
  return { generateSeriesMs: Math.round(best) };
}

async function machine(db) {
  const cpu = os.cpus()[0]?.model ?? 'unknown';
  let osName = `${os.type()} ${os.release()}`;
  try {
    osName = /PRETTY_NAME="([^"]+)"/.exec(readFileSync('/etc/os-release', 'utf8'))?.[1] ?? osName;
  } catch {
    // keep uname
  }
  let disk = null;
  try {
    disk = (await run('df', ['-h', '--output=fstype,size', '/var/tmp'])).stdout.trim().split('\n')[1]?.trim();
  } catch {
    // none
  }
  return { cores: os.cpus().length, memoryGiB: Math.round(os.totalmem() / 2 ** 30), cpu, os: osName, varTmp: disk, pg: (await db.query('SHOW server_version')).rows[0].server_version };
}

async function versions(db) {
  const pkg = (name) => {
    try {
      return JSON.parse(readFileSync(path.join(repoRoot, 'node_modules', name, 'package.json'), 'utf8')).version;
    } catch {
      return null;
    }
  };
  const redisV = (await run('redis-server', ['--version'])).stdout.match(/v=(\S+)/)?.[1];
  const commit = (await run('git', ['rev-parse', '--short', 'HEAD'], { cwd: repoRoot })).stdout.trim();
  const dirty = (await run('git', ['status', '--porcelain', '--', 'server', 'shared', 'worker', 'src'], { cwd: repoRoot })).stdout.trim().length > 0;
  return {
    node: process.version,
    postgres: (await db.query('SHOW server_version')).rows[0].server_version,
    pgBin: pgBinDir(),
    redis: redisV,
    aedes: pkg('aedes'),
    pg: pkg('pg'),
    bullmq: pkg('bullmq'),
    express: pkg('express'),
    zod: pkg('zod'),
    vite: pkg('vite'),
    autocannon: pkg('autocannon'),
    mosquitto: results.ingest?.mosquitto?.version ?? null,
    commit,
    workingTreeChanged: dirty,
  };
}

try {
  await main();
} catch (err) {
  process.stderr.write(`[bench] failed: ${err.stack ?? err}\n[bench] logs in ${dir} (kept)\n`);
  O.keep = true;
  process.exitCode = 1;
} finally {
  await cleanup();
  say(`done in ${elapsed()}`);
}
