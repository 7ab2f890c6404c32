// A private redis-server on loopback, daemonized with a pidfile in its own folder.
// The demo keeps append-only on (fsync every second) so queued jobs survive a restart.
import { existsSync, rmSync } from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { ensureDir, pidAlive, processCmdline, readPidFile, run, sleep, waitForExit, which } from './common.mjs';

export const DEFAULT_REDIS_PORT = 63799;

/** Send one inline command and resolve the first reply line (e.g. "+PONG"). No dependencies. */
export function redisCommand(port, command, { host = '127.0.0.1', timeoutMs = 1000 } = {}) {
  return new Promise((resolve, reject) => {
    const socket = net.connect({ port, host });
    let data = '';
    const timer = setTimeout(() => {
      socket.destroy();
      reject(new Error(`redis ${host}:${port} did not answer ${command}`));
    }, timeoutMs);
    socket.once('connect', () => socket.write(`${command}\r\n`));
    socket.on('data', (chunk) => {
      data += chunk;
      const end = data.indexOf('\r\n');
      if (end >= 0) {
        clearTimeout(timer);
        socket.destroy();
        resolve(data.slice(0, end));
      }
    });
    socket.once('error', (err) => {
      clearTimeout(timer);
      reject(err);
    });
    socket.once('close', () => {
      clearTimeout(timer);
      if (!data.includes('\r\n')) reject(new Error(`redis ${host}:${port} closed the connection`));
    });
  });
}

async function pings(port) {
  try {
    return (await redisCommand(port, 'PING')) === '+PONG';
  } catch {
    return false;
  }
}

/** { pid, port } of the redis-server recorded in dir/redis.pid when it is still alive. */
export function runningRedis(dir) {
  const pid = readPidFile(path.join(dir, 'redis.pid'));
  if (!pid || !pidAlive(pid)) return undefined;
  const cmdline = processCmdline(pid);
  if (!cmdline.includes('redis-server')) return undefined;
  // redis sets its process title to "redis-server 127.0.0.1:<port>"
  const match = /:(\d+)/.exec(cmdline);
  return { pid, port: match ? Number(match[1]) : undefined };
}

/**
 * Start (or reuse) redis-server with its files in `dir`, on 127.0.0.1:`port`.
 * Resolves { dir, port, pid, url, reused }.
 */
export async function startRedis({ dir, port = DEFAULT_REDIS_PORT, appendOnly = true } = {}) {
  if (!dir) throw new Error('startRedis: dir is required');
  dir = path.resolve(dir);
  ensureDir(dir, 0o750);
  const running = runningRedis(dir);
  if (running?.port && (await pings(running.port))) {
    return { dir, port: running.port, pid: running.pid, url: `redis://127.0.0.1:${running.port}`, reused: true };
  }
  const server = which('redis-server');
  if (!server) {
    throw new Error('redis-server not found. Install it with: apt-get install -y redis-server   (or run node scripts/stack/ensure-system.mjs)');
  }
  const pidFile = path.join(dir, 'redis.pid');
  const logFile = path.join(dir, 'redis.log');
  rmSync(pidFile, { force: true });
  const args = [
    '--bind', '127.0.0.1',
    '--port', String(port),
    '--protected-mode', 'yes',
    '--save', '',
    '--dir', dir,
    '--daemonize', 'yes',
    '--pidfile', pidFile,
    '--logfile', logFile,
  ];
  if (appendOnly) args.push('--appendonly', 'yes', '--appendfsync', 'everysec');
  else args.push('--appendonly', 'no');
  // redis daemonizes (fork + setsid), so this returns once the background server is forked.
  const result = await run(server, args);
  if (result.code !== 0) throw new Error(`redis-server failed to start: ${result.stdout}${result.stderr}`);
  const deadline = Date.now() + 15_000;
  while (!(await pings(port))) {
    if (Date.now() > deadline) {
      throw new Error(`redis-server did not answer on 127.0.0.1:${port}; see ${logFile}`);
    }
    await sleep(25);
  }
  const pid = readPidFile(pidFile);
  return { dir, port, pid, url: `redis://127.0.0.1:${port}`, reused: false };
}

/**
 * Stop the redis-server whose pidfile is in `dir`: SIGTERM (redis flushes the append-only file
 * and exits), SIGKILL after 10 s. Resolves true if one was running.
 */
export async function stopRedis({ dir } = {}) {
  if (!dir) throw new Error('stopRedis: dir is required');
  const running = runningRedis(path.resolve(dir));
  if (!running) return false;
  try {
    process.kill(running.pid, 'SIGTERM');
  } catch {
    return false;
  }
  await waitForExit(running.pid, 10_000);
  return true;
}

export function hasRedisData(dir) {
  return existsSync(path.join(dir, 'appendonlydir')) || existsSync(path.join(dir, 'dump.rdb'));
}
