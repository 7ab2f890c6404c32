// A private PostgreSQL cluster on loopback, owned by the `postgres` user when we run as root
// (initdb and pg_ctl refuse root). The unix socket lives in the data folder (`-k`), so the
// cluster never touches /var/run/postgresql or a system cluster.
import { chownSync, existsSync, mkdirSync, readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import {
  canTraverse,
  dataRoot as checkoutDataRoot,
  ensureDir,
  isRoot,
  lookupUser,
  pidAlive,
  processCmdline,
  run,
  runChecked,
  sleep,
  which,
} from './common.mjs';

export const DEFAULT_PG_PORT = 54329;

/** The checkout's data root: `.data` in the checkout, or the /var/tmp fallback (see common.mjs). */
export function dataRoot() {
  return checkoutDataRoot();
}

/** Folder holding initdb/pg_ctl: $PG_BIN, else the newest /usr/lib/postgresql/N/bin, else PATH. */
export function pgBinDir() {
  if (process.env.PG_BIN) return process.env.PG_BIN;
  const base = '/usr/lib/postgresql';
  if (existsSync(base)) {
    const versions = readdirSync(base)
      .filter((v) => /^\d+$/.test(v) && existsSync(path.join(base, v, 'bin', 'pg_ctl')))
      .sort((a, b) => Number(b) - Number(a));
    if (versions.length > 0) return path.join(base, versions[0], 'bin');
  }
  const pgCtl = which('pg_ctl');
  return pgCtl ? path.dirname(pgCtl) : undefined;
}

function requireBinDir() {
  const dir = pgBinDir();
  if (!dir) {
    throw new Error(
      'PostgreSQL binaries not found (looked in $PG_BIN, /usr/lib/postgresql/*/bin and PATH). ' +
        'Install them with: apt-get install -y postgresql-15   (or run node scripts/stack/ensure-system.mjs)',
    );
  }
  return dir;
}

/** Command + args that run a PostgreSQL tool as the cluster owner. */
function asOwner(tool, args) {
  const bin = path.join(requireBinDir(), tool);
  if (!isRoot) return [bin, args];
  return ['runuser', ['-u', 'postgres', '--', bin, ...args]];
}

function shellQuote(value) {
  return `'${String(value).replaceAll("'", `'\\''`)}'`;
}

function logTail(file, lines = 30) {
  try {
    return readFileSync(file, 'utf8').trimEnd().split('\n').slice(-lines).join('\n');
  } catch {
    return '(no server log)';
  }
}

/** { pid, port } of the postmaster recorded in dataDir/postmaster.pid when it is still alive. */
export function runningCluster(dataDir) {
  let lines;
  try {
    lines = readFileSync(path.join(dataDir, 'postmaster.pid'), 'utf8').split('\n');
  } catch {
    return undefined;
  }
  const pid = Number.parseInt(lines[0], 10);
  const port = Number.parseInt(lines[3], 10);
  if (!pidAlive(pid) || !/postgres|postmaster/.test(processCmdline(pid))) return undefined;
  return { pid, port };
}

function adminUrlFor(port) {
  return `postgres://postgres@127.0.0.1:${port}/postgres`;
}

async function initCluster(dataDir, { fsyncOff }) {
  const parent = path.dirname(dataDir);
  ensureDir(parent);
  if (isRoot) {
    const pgUser = lookupUser('postgres');
    if (!pgUser) {
      throw new Error('There is no `postgres` user. Install PostgreSQL with: apt-get install -y postgresql-15');
    }
    if (!canTraverse(pgUser, parent)) {
      throw new Error(
        `The postgres user cannot reach ${parent} (a parent folder is not traversable). ` +
          'Choose a data folder under /var/tmp, or set GILLWISE_DATA_ROOT.',
      );
    }
    mkdirSync(dataDir, { recursive: true, mode: 0o700 });
    chownSync(dataDir, pgUser.uid, pgUser.gid);
  } else {
    mkdirSync(dataDir, { recursive: true, mode: 0o700 });
  }
  const args = ['-D', dataDir, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8', '--no-instructions'];
  if (fsyncOff) args.push('--no-sync');
  const [cmd, cmdArgs] = asOwner('initdb', args);
  await runChecked(cmd, cmdArgs);
}

/**
 * Start (or reuse) a cluster in `dataDir` listening on 127.0.0.1:`port`.
 * `fsyncOff` is for throwaway test clusters only: it trades durability for speed.
 * Resolves { dataDir, port, pid, adminUrl, reused }. When a cluster is already running from this
 * data folder it is reused as is, on the port it already has.
 */
export async function startPostgres({ dataDir, port = DEFAULT_PG_PORT, fsyncOff = false, maxConnections } = {}) {
  if (!dataDir) throw new Error('startPostgres: dataDir is required');
  dataDir = path.resolve(dataDir);
  const running = runningCluster(dataDir);
  if (running) {
    return { dataDir, port: running.port, pid: running.pid, adminUrl: adminUrlFor(running.port), reused: true };
  }
  if (!existsSync(path.join(dataDir, 'PG_VERSION'))) {
    if (existsSync(dataDir) && readdirSync(dataDir).length > 0) {
      throw new Error(`${dataDir} exists and is not a PostgreSQL data folder; move it away or run npm run stack:reset`);
    }
    await initCluster(dataDir, { fsyncOff });
  }

  const opts = ['-c listen_addresses=127.0.0.1', `-p ${port}`];
  // A unix socket path longer than sun_path (108 bytes) makes the postmaster exit; use TCP only then.
  if (`${dataDir}/.s.PGSQL.${port}`.length < 100) opts.push(`-k ${shellQuote(dataDir)}`);
  else opts.push(`-c unix_socket_directories=''`);
  if (fsyncOff) opts.push('-c fsync=off', '-c synchronous_commit=off', '-c full_page_writes=off');
  if (maxConnections) opts.push(`-c max_connections=${Number(maxConnections)}`);

  const logFile = path.join(dataDir, 'server.log');
  const [cmd, args] = asOwner('pg_ctl', ['-D', dataDir, '-l', logFile, '-w', '-t', '60', '-o', opts.join(' '), 'start']);
  // detached: a Ctrl-C in the terminal must not reach the postmaster before its clients have stopped.
  const result = await run(cmd, args, { detached: true });
  const started = runningCluster(dataDir);
  if (result.code !== 0 || !started) {
    throw new Error(
      `PostgreSQL did not start on 127.0.0.1:${port} (data in ${dataDir}).\n${result.stdout}${result.stderr}\n` +
        `--- ${logFile} ---\n${logTail(logFile)}`,
    );
  }
  return { dataDir, port: started.port, pid: started.pid, adminUrl: adminUrlFor(started.port), reused: false };
}

/**
 * Stop the cluster in `dataDir` if it runs (fast shutdown: clients are disconnected, data is
 * consistent). `mode: 'immediate'` skips the checkpoint (throwaway clusters). Resolves true if it stopped one.
 */
export async function stopPostgres({ dataDir, mode = 'fast' } = {}) {
  if (!dataDir) throw new Error('stopPostgres: dataDir is required');
  dataDir = path.resolve(dataDir);
  const running = runningCluster(dataDir);
  if (!running) return false;
  const [cmd, args] = asOwner('pg_ctl', ['-D', dataDir, '-m', mode, '-w', '-t', '60', 'stop']);
  const result = await run(cmd, args);
  if (result.code !== 0 && runningCluster(dataDir)) {
    // pg_ctl failed (e.g. the binaries were removed): signal the postmaster directly.
    process.kill(running.pid, 'SIGQUIT');
    for (let i = 0; i < 100 && pidAlive(running.pid); i++) await sleep(100);
  }
  return true;
}

async function loadPg() {
  try {
    const mod = await import('pg');
    return mod.default ?? mod;
  } catch (err) {
    throw new Error(`The "pg" package is not installed (run npm ci): ${err.message}`);
  }
}

const DB_NAME = /^[a-z_][a-z0-9_]{0,62}$/;

/**
 * Create database `name` unless it exists. `url` points at any database on the server (usually
 * the maintenance database `postgres`). With `template`, the new database is a copy of it;
 * PostgreSQL refuses the copy while anyone is connected to the template (error 55006), so that
 * is retried for a while. Resolves true when it created the database.
 */
export async function createDatabase(url, name, { template, retryMs = 15_000 } = {}) {
  if (!DB_NAME.test(name)) throw new Error(`createDatabase: invalid database name ${JSON.stringify(name)}`);
  if (template !== undefined && !DB_NAME.test(template)) {
    throw new Error(`createDatabase: invalid template name ${JSON.stringify(template)}`);
  }
  const pg = await loadPg();
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    const exists = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [name]);
    if (exists.rowCount > 0) return false;
    const sql = `CREATE DATABASE "${name}"${template ? ` TEMPLATE "${template}"` : ''}`;
    const deadline = Date.now() + retryMs;
    for (let attempt = 0; ; attempt++) {
      try {
        await client.query(sql);
        return true;
      } catch (err) {
        if (err.code === '42P04') return false; // created concurrently by someone else
        if (err.code !== '55006' || Date.now() > deadline) throw err;
        await sleep(Math.min(50 * 2 ** attempt, 500) + Math.random() * 50);
      }
    }
  } finally {
    await client.end();
  }
}

/** Drop database `name` if it exists, disconnecting its sessions first. */
export async function dropDatabase(url, name) {
  if (!DB_NAME.test(name)) throw new Error(`dropDatabase: invalid database name ${JSON.stringify(name)}`);
  const pg = await loadPg();
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    await client.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
  } finally {
    await client.end();
  }
}

/** Whether `dataDir` holds an initialised cluster. */
export function isCluster(dataDir) {
  try {
    return statSync(path.join(dataDir, 'PG_VERSION')).isFile();
  } catch {
    return false;
  }
}
