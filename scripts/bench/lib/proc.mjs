// Child processes of the benchmark runner: started with a known pid, logged to a file, stopped by pid.
import { spawn } from 'node:child_process';
import { createWriteStream } from 'node:fs';
import { repoRoot } from '../../stack/common.mjs';

const children = new Set();

/** Starts `cmd args` in the checkout with its output in logFile. Resolves the handle at once. */
export function startChild(name, cmd, args, { env = {}, logFile, onLine } = {}) {
  const child = spawn(cmd, args, { cwd: repoRoot, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  const log = logFile ? createWriteStream(logFile, { flags: 'a' }) : null;
  let tail = '';
  const onData = (d) => {
    log?.write(d);
    tail = (tail + d).slice(-4000);
    if (onLine) for (const line of String(d).split('\n')) if (line) onLine(line);
  };
  child.stdout.on('data', onData);
  child.stderr.on('data', onData);
  const exited = new Promise((resolve) => child.on('close', (code, signal) => resolve({ code, signal })));
  const handle = { name, child, pid: child.pid, exited, tail: () => tail };
  children.add(handle);
  exited.then(() => {
    children.delete(handle);
    log?.end();
  });
  return handle;
}

/** Runs to completion; rejects with the output tail when it fails. */
export async function runChild(name, cmd, args, opts = {}) {
  const h = startChild(name, cmd, args, opts);
  const { code, signal } = await h.exited;
  if (code !== 0) throw new Error(`${name} exited with ${code ?? signal}:\n${h.tail()}`);
  return h;
}

/** SIGTERM, then SIGKILL after graceMs, for one child by its pid. */
export async function stopChild(h, graceMs = 15_000) {
  if (!children.has(h)) return h.exited;
  try {
    process.kill(h.pid, 'SIGTERM');
  } catch {
    return h.exited;
  }
  const timer = setTimeout(() => {
    try {
      process.kill(h.pid, 'SIGKILL');
    } catch {
      // gone
    }
  }, graceMs);
  const r = await h.exited;
  clearTimeout(timer);
  return r;
}

export async function stopAllChildren() {
  await Promise.all([...children].map((h) => stopChild(h, 5000)));
}

export const tsx = 'node_modules/.bin/tsx';
