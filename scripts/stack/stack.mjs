// The whole local stack, as `npm start` (production build) and `npm run dev` (vite + tsx watch)
// run it: PostgreSQL, Redis and the SMTP fake, then migrations and seed, then the app processes.
import { randomBytes } from 'node:crypto';
import { chmodSync, existsSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { ensureDir, pidAlive, processCmdline, readPidFile, repoRoot } from './common.mjs';
import { ensureSystem } from './ensure-system.mjs';
import { isPortFree } from './ports.mjs';
import { createDatabase, DEFAULT_PG_PORT, dataRoot, runningCluster, startPostgres, stopPostgres } from './postgres.mjs';
import { DEFAULT_REDIS_PORT, runningRedis, startRedis, stopRedis } from './redis.mjs';
import { DEFAULT_MAIL_API_PORT, DEFAULT_SMTP_PORT } from './smtp-fake.mjs';
import { say, stopRecordedChildren, Supervisor } from './supervisor.mjs';

export const DATABASE_NAME = 'gillwise';
const TSX = 'node_modules/.bin/tsx';
const VITE = 'node_modules/vite/bin/vite.js';

/** Paths inside the data root; stack-reset uses the same layout. */
export function stackPaths(root = dataRoot()) {
  return {
    root,
    pg: path.join(root, 'pg'),
    redis: path.join(root, 'redis'),
    mail: path.join(root, 'mail'),
    run: path.join(root, 'run'),
    lock: path.join(root, 'run', 'stack.pid'),
    secrets: path.join(root, 'secrets.json'),
    probeCredentials: path.join(root, 'probe-credentials.json'),
  };
}

function portOption(flags, flag, envNames, fallback) {
  const raw = flags[flag] ?? envNames.map((n) => process.env[n]).find((v) => v !== undefined && v !== '');
  if (raw === undefined) return fallback;
  const port = Number(raw);
  if (!Number.isInteger(port) || port < 1 || port > 65535) {
    throw new Error(`invalid port ${JSON.stringify(raw)} for --${flag} / ${envNames.join(' / ')}`);
  }
  return port;
}

export function resolveOptions(flags) {
  const httpPort = portOption(flags, 'http-port', ['GILLWISE_HTTP_PORT'], 8080);
  return {
    httpPort,
    pgPort: portOption(flags, 'pg-port', ['GILLWISE_PG_PORT', 'PGPORT'], DEFAULT_PG_PORT),
    redisPort: portOption(flags, 'redis-port', ['GILLWISE_REDIS_PORT'], DEFAULT_REDIS_PORT),
    smtpPort: portOption(flags, 'smtp-port', ['GILLWISE_SMTP_PORT'], DEFAULT_SMTP_PORT),
    mailApiPort: portOption(flags, 'mail-api-port', ['GILLWISE_MAIL_API_PORT'], DEFAULT_MAIL_API_PORT),
    mqttPort: portOption(flags, 'mqtt-port', ['GILLWISE_MQTT_PORT'], 18830),
    vitePort: portOption(flags, 'vite-port', ['GILLWISE_VITE_PORT'], 5173),
    publicUrl: flags['public-url'] ?? process.env.GILLWISE_PUBLIC_URL ?? `http://127.0.0.1:${httpPort}`,
    simulator: flags.simulator,
    // --https [N]: also serve HTTPS (self-signed, generated once) on all interfaces, for phones on the farm network.
    httpsPort: flags.https === undefined && !process.env.GILLWISE_HTTPS_PORT ? null : Number(flags.https === true ? (process.env.GILLWISE_HTTPS_PORT ?? 8443) : (flags.https ?? process.env.GILLWISE_HTTPS_PORT)),
    build: flags.build, // true: always, false: never, undefined: when stale
    chromium: flags.chromium === true,
    system: flags.system !== false,
    healthTimeoutMs: Number(flags['health-timeout'] ?? process.env.GILLWISE_HEALTH_TIMEOUT_MS ?? 60_000),
  };
}

/** The JWT secret for this data root: generated once (48 random bytes), kept mode 600. */
function jwtSecret(file) {
  try {
    const stored = JSON.parse(readFileSync(file, 'utf8'));
    if (typeof stored.jwtSecret === 'string' && stored.jwtSecret.length >= 32) return stored.jwtSecret;
  } catch {
    // first start
  }
  const secret = randomBytes(48).toString('hex');
  writeFileSync(file, `${JSON.stringify({ jwtSecret: secret }, null, 2)}\n`, { mode: 0o600 });
  chmodSync(file, 0o600);
  return secret;
}

function newestMtime(entry) {
  let st;
  try {
    st = statSync(entry);
  } catch {
    return 0;
  }
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = st.mtimeMs;
  for (const name of readdirSync(entry)) {
    if (name === 'node_modules' || name.startsWith('.')) continue;
    newest = Math.max(newest, newestMtime(path.join(entry, name)));
  }
  return newest;
}

/** Why the client bundle must be rebuilt, or undefined when dist/client is newer than its sources. */
export function clientBuildReason() {
  const built = path.join(repoRoot, 'dist', 'client', 'index.html');
  if (!existsSync(built)) return 'no client build yet';
  const builtAt = statSync(built).mtimeMs;
  const sources = ['src', 'shared', 'public', 'index.html', 'vite.config.ts', 'tsconfig.app.json'];
  for (const s of sources) if (newestMtime(path.join(repoRoot, s)) > builtAt) return `${s} changed since the last build`;
  return undefined;
}

function requiredFiles(mode, options) {
  const files = ['server/db/migrate.ts', 'server/db/seed/index.ts', 'server/index.ts', 'worker/index.ts'];
  if (options.simulator !== false && mode === 'start') files.push('simulator/index.ts');
  if (options.simulator === true && mode === 'dev') files.push('simulator/index.ts');
  files.push('index.html', 'vite.config.ts');
  return files.filter((f) => !existsSync(path.join(repoRoot, f)));
}

/** Refuse a second stack from the same checkout; clean up after one that was killed. */
async function takeLock(paths) {
  const pid = readPidFile(paths.lock);
  if (pid && pid !== process.pid && pidAlive(pid) && /scripts\/(start|dev)\.mjs/.test(processCmdline(pid))) {
    throw new Error(`the stack already runs from this checkout (pid ${pid}). Stop it with Ctrl-C there, or: kill ${pid}`);
  }
  const leftovers = await stopRecordedChildren(paths.run);
  if (leftovers.length > 0) say(`stopped processes left by an earlier run: ${leftovers.join(', ')}`);
  writeFileSync(paths.lock, `${process.pid}\n`);
}

function banner(lines) {
  const width = Math.max(...lines.map((l) => l.length)) + 2;
  const bar = '═'.repeat(width);
  return [`╔${bar}╗`, ...lines.map((l) => `║ ${l.padEnd(width - 1)}║`), `╚${bar}╝`].join('\n');
}

async function waitForHealth(url, timeoutMs, supervisor) {
  const deadline = Date.now() + timeoutMs;
  let last = 'no answer';
  while (Date.now() < deadline) {
    const dead = supervisor.exitedChildren().filter(([, c]) => c.critical);
    if (dead.length > 0) throw new Error(`${dead.map(([n]) => n).join(', ')} exited before ${url} answered`);
    try {
      const res = await fetch(url, { signal: AbortSignal.timeout(2000) });
      if (res.status === 200) return;
      last = `HTTP ${res.status}`;
    } catch (err) {
      last = err.cause?.code ?? err.message;
    }
    await new Promise((r) => setTimeout(r, 500));
  }
  throw new Error(`${url} did not answer 200 within ${Math.round(timeoutMs / 1000)} s (last: ${last})`);
}

/**
 * Run the stack until Ctrl-C / SIGTERM or until an app process dies.
 * mode 'start': production build served by the server; 'dev': vite dev server + tsx watch.
 */
export async function runStack(mode, flags) {
  const options = resolveOptions(flags);
  const missing = requiredFiles(mode, options);
  if (missing.length > 0) {
    console.error(
      `Cannot start: ${missing.map((f) => `${f} is missing`).join('; ')}.\n` +
        'These files belong to the app itself; start again once they exist.',
    );
    return 1;
  }

  const paths = stackPaths();
  ensureDir(paths.root);
  ensureDir(paths.run);
  await takeLock(paths);

  let exitCode = 0;
  let shuttingDown;
  const started = { pg: false, redis: false };
  const supervisor = new Supervisor({
    runDir: paths.run,
    onUnexpectedExit: (name, code, signal) => {
      say(`${name} exited unexpectedly (${signal ? `signal ${signal}` : `code ${code}`}); stopping everything`);
      void shutdown(1);
    },
  });

  async function shutdown(code) {
    if (shuttingDown) return shuttingDown;
    exitCode = code;
    shuttingDown = (async () => {
      say('stopping…');
      await supervisor.stopAll(10_000);
      if (started.redis || runningRedis(paths.redis)) {
        await stopRedis({ dir: paths.redis }).catch((err) => say(`redis: ${err.message}`));
      }
      if (started.pg || runningCluster(paths.pg)) {
        await stopPostgres({ dataDir: paths.pg }).catch((err) => say(`postgres: ${err.message}`));
      }
      rmSync(paths.lock, { force: true });
      say(`stopped${exitCode ? ` (exit code ${exitCode})` : ''}`);
      process.exit(exitCode);
    })();
    return shuttingDown;
  }
  for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) process.on(signal, () => void shutdown(0));

  try {
    if (options.system) await ensureSystem({ chromium: options.chromium });

    // Fail early and clearly when another program holds one of our ports.
    const wanted = [
      ['HTTP', options.httpPort, '--http-port / GILLWISE_HTTP_PORT'],
      ['MQTT', options.mqttPort, '--mqtt-port / GILLWISE_MQTT_PORT'],
      ['SMTP', options.smtpPort, '--smtp-port / GILLWISE_SMTP_PORT'],
      ['mail API', options.mailApiPort, '--mail-api-port / GILLWISE_MAIL_API_PORT'],
    ];
    if (mode === 'dev') wanted.push(['Vite', options.vitePort, '--vite-port / GILLWISE_VITE_PORT']);
    if (!runningCluster(paths.pg)) wanted.push(['PostgreSQL', options.pgPort, '--pg-port / PGPORT']);
    if (!runningRedis(paths.redis)) wanted.push(['Redis', options.redisPort, '--redis-port / GILLWISE_REDIS_PORT']);
    for (const [what, port, how] of wanted) {
      if (!(await isPortFree(port))) throw new Error(`port ${port} (${what}) is in use by another program; choose another with ${how}`);
    }

    say(`data lives in ${paths.root}`);
    const pg = await startPostgres({ dataDir: paths.pg, port: options.pgPort });
    started.pg = true;
    say(`PostgreSQL ${pg.reused ? 'already running' : 'started'} on 127.0.0.1:${pg.port} (${paths.pg})`);
    if (await createDatabase(pg.adminUrl, DATABASE_NAME)) say(`created database ${DATABASE_NAME}`);

    const redis = await startRedis({ dir: paths.redis, port: options.redisPort });
    started.redis = true;
    say(`Redis ${redis.reused ? 'already running' : 'started'} on 127.0.0.1:${redis.port} (append-only, ${paths.redis})`);

    const mail = await supervisor.fork(
      'mail',
      path.join(repoRoot, 'scripts', 'stack', 'smtp-fake.mjs'),
      ['--smtp-port', String(options.smtpPort), '--api-port', String(options.mailApiPort), '--store', paths.mail],
      { env: process.env },
    );

    const env = {
      ...process.env,
      NODE_ENV: mode === 'dev' ? 'development' : 'production',
      HTTP_HOST: '127.0.0.1',
      HTTP_PORT: String(options.httpPort),
      ...(options.httpsPort ? { HTTPS_PORT: String(options.httpsPort) } : {}),
      PUBLIC_URL: mode === 'dev' && !flags['public-url'] && !process.env.GILLWISE_PUBLIC_URL ? `http://127.0.0.1:${options.vitePort}` : options.publicUrl,
      DATABASE_URL: `postgres://postgres@127.0.0.1:${pg.port}/${DATABASE_NAME}`,
      REDIS_URL: redis.url,
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: String(mail.ready.smtpPort),
      MAIL_FAKE_API_URL: mail.ready.apiUrl,
      MQTT_HOST: '127.0.0.1',
      MQTT_PORT: String(options.mqttPort),
      DATA_DIR: paths.root,
      PROBE_CREDENTIALS_FILE: paths.probeCredentials,
      CLIENT_DIST_DIR: path.join(repoRoot, 'dist', 'client'),
      JWT_SECRET: jwtSecret(paths.secrets),
    };

    for (const [name, script] of [
      ['migrate', 'server/db/migrate.ts'],
      ['seed', 'server/db/seed/index.ts'],
    ]) {
      if (shuttingDown) return await shuttingDown;
      const code = await supervisor.step(name, TSX, [script], { env });
      if (code !== 0) throw new Error(`${name} (${script}) failed with exit code ${code}`);
    }

    if (mode === 'start') {
      const reason = options.build === true ? 'requested' : options.build === false ? undefined : clientBuildReason();
      if (reason) {
        say(`building the client (${reason})`);
        const code = await supervisor.step('build', process.execPath, [VITE, 'build'], { env: { ...env, NODE_ENV: 'production' } });
        if (code !== 0) throw new Error(`vite build failed with exit code ${code}`);
      } else if (options.build === undefined) {
        say('client build is up to date (dist/client)');
      }
    }
    if (shuttingDown) return await shuttingDown;

    if (mode === 'start') {
      supervisor.spawn('server', TSX, ['server/index.ts'], { env });
      supervisor.spawn('worker', TSX, ['worker/index.ts'], { env });
      if (options.simulator !== false) supervisor.spawn('simulator', TSX, ['simulator/index.ts'], { env });
    } else {
      supervisor.spawn('server', TSX, ['watch', '--clear-screen=false', 'server/index.ts'], { env });
      supervisor.spawn('worker', TSX, ['watch', '--clear-screen=false', 'worker/index.ts'], { env });
      supervisor.spawn(
        'vite',
        process.execPath,
        [VITE, '--host', '127.0.0.1', '--port', String(options.vitePort), '--strictPort'],
        { env: { ...env, GILLWISE_API_URL: `http://127.0.0.1:${options.httpPort}` } },
      );
      if (options.simulator === true) supervisor.spawn('simulator', TSX, ['watch', 'simulator/index.ts'], { env });
    }

    const healthUrl = `http://127.0.0.1:${options.httpPort}/api/health`;
    await waitForHealth(healthUrl, options.healthTimeoutMs, supervisor);
    if (shuttingDown) return await shuttingDown;

    const address = mode === 'dev' ? `http://127.0.0.1:${options.vitePort}` : options.publicUrl;
    console.log(
      `\n${banner([
        `Gillwise is running${mode === 'dev' ? ' (development: vite + tsx watch)' : ''}`,
        '',
        `Open          ${address}`,
        `API health    ${healthUrl}`,
        ...(options.httpsPort ? [`HTTPS (LAN)   https://<this machine's address>:${options.httpsPort}  (self-signed: accept it once on each phone)`] : []),
        `MQTT broker   127.0.0.1:${options.mqttPort}`,
        `Caught mail   ${mail.ready.apiUrl}/messages   (SMTP 127.0.0.1:${mail.ready.smtpPort})`,
        '',
        'Demo sign-ins (demo data only), password: gillwise-demo',
        '  hand@harrowbend.example      manager@harrowbend.example',
        '  planner@harrowbend.example   admin@harrowbend.example',
        '',
        `Data          ${paths.root}`,
        `              PostgreSQL 127.0.0.1:${pg.port}, Redis 127.0.0.1:${redis.port}`,
        `Probe logins  ${paths.probeCredentials}`,
        '',
        'Stop: Ctrl-C (data is kept).  Wipe the data: npm run stack:reset -- --yes',
      ])}\n`,
    );
    await new Promise(() => {}); // until a signal or a child's death calls shutdown()
  } catch (err) {
    if (!shuttingDown) say(`error: ${err.message}`);
    await shutdown(1);
  }
  return exitCode;
}
