// Child-process supervision for scripts/start.mjs and scripts/dev.mjs: prefixed output, a record
// of pids in the data root (so stack:reset can find them after a crash), and an orderly stop.
import { fork, spawn } from 'node:child_process';
import { readFileSync, realpathSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import readline from 'node:readline';
import { pidAlive, processCmdline, repoRoot, sleep } from './common.mjs';

const checkoutReal = realpathSync(repoRoot);
const COLORS = [36, 35, 33, 32, 34, 91, 96, 95];
const useColor = process.stdout.isTTY && !process.env.NO_COLOR;
let colorIndex = 0;

/** "name    | " in a stable colour per name. */
export function makePrefix(name, width = 10) {
  const label = `${name.padEnd(width)}|`;
  if (!useColor) return `${label} `;
  const color = COLORS[colorIndex++ % COLORS.length];
  return `\x1b[${color}m${label}\x1b[0m `;
}

export function pipeWithPrefix(stream, prefix, out = process.stdout) {
  if (!stream) return;
  const rl = readline.createInterface({ input: stream, crlfDelay: Infinity });
  rl.on('line', (line) => out.write(`${prefix}${line}\n`));
}

const stackPrefix = makePrefix('stack');
export const say = (msg) => process.stdout.write(`${stackPrefix}${msg}\n`);

function killGroup(pid, signal) {
  try {
    process.kill(-pid, signal);
    return true;
  } catch {
    return false;
  }
}

/**
 * Tracks the processes the stack started. Children run detached (their own process group): a
 * Ctrl-C in the terminal reaches only the supervisor, which then stops them in order, and a
 * SIGKILL of the group also catches grandchildren (tsx runs the program in a child node).
 */
export class Supervisor {
  constructor({ runDir, onUnexpectedExit }) {
    this.runDir = runDir;
    this.children = new Map();
    this.onUnexpectedExit = onUnexpectedExit;
    this.stopping = false;
  }

  #record() {
    const entries = {};
    for (const [name, c] of this.children) {
      if (c.exited) continue;
      entries[name] = { pid: c.child.pid, match: c.match, cwd: checkoutReal };
    }
    writeFileSync(path.join(this.runDir, 'children.json'), `${JSON.stringify(entries, null, 2)}\n`);
  }

  #track(name, child, { match, critical }) {
    const entry = { child, match, critical, exited: false };
    entry.done = new Promise((resolve) => {
      child.once('exit', (code, signal) => {
        entry.exited = true;
        entry.code = code;
        entry.signal = signal;
        killGroup(child.pid, 'SIGKILL'); // leftovers of the group, if any
        this.#record();
        resolve({ code, signal });
        if (!this.stopping && critical) this.onUnexpectedExit?.(name, code, signal);
      });
    });
    child.once('error', (err) => {
      say(`${name} could not be started: ${err.message}`);
    });
    this.children.set(name, entry);
    this.#record();
    return entry;
  }

  /** A long-running child whose output is prefixed with its name. */
  spawn(name, cmd, args, { env, critical = true } = {}) {
    const child = spawn(cmd, args, { cwd: repoRoot, env, detached: true, stdio: ['ignore', 'pipe', 'pipe'] });
    const prefix = makePrefix(name);
    pipeWithPrefix(child.stdout, prefix);
    pipeWithPrefix(child.stderr, prefix, process.stderr);
    return this.#track(name, child, { match: args.find((a) => a.endsWith('.ts') || a.endsWith('.js') || a.endsWith('.mjs')) ?? cmd, critical });
  }

  /** A Node child with an IPC channel; resolves once it sends { ready: true }. */
  async fork(name, modulePath, args, { env, critical = true, timeoutMs = 15_000 } = {}) {
    const child = fork(modulePath, args, { cwd: repoRoot, env, detached: true, silent: true });
    const prefix = makePrefix(name);
    pipeWithPrefix(child.stdout, prefix);
    pipeWithPrefix(child.stderr, prefix, process.stderr);
    const entry = this.#track(name, child, { match: path.basename(modulePath), critical });
    const ready = await new Promise((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error(`${name} did not report ready within ${timeoutMs} ms`)), timeoutMs);
      child.on('message', (msg) => {
        if (msg && typeof msg === 'object' && 'ready' in msg) {
          clearTimeout(timer);
          if (msg.ready) resolve(msg);
          else reject(new Error(`${name} failed: ${msg.error}`));
        }
      });
      entry.done.then(({ code }) => {
        clearTimeout(timer);
        reject(new Error(`${name} exited with code ${code} before it was ready`));
      });
    });
    return { ...entry, ready };
  }

  /** A one-off step (migrate, seed, build): prefixed output, resolves its exit code. */
  async step(name, cmd, args, { env } = {}) {
    const entry = this.spawn(name, cmd, args, { env, critical: false });
    const { code, signal } = await entry.done;
    this.children.delete(name);
    this.#record();
    return signal ? 128 : code;
  }

  exitedChildren() {
    return [...this.children.entries()].filter(([, c]) => c.exited);
  }

  /** SIGTERM each named child (all at once), SIGKILL its group after `graceMs`. */
  async stop(names, graceMs = 10_000) {
    await Promise.all(
      names.map(async (name) => {
        const entry = this.children.get(name);
        if (!entry || entry.exited) return;
        try {
          entry.child.kill('SIGTERM');
        } catch {
          // gone already
        }
        const timedOut = await Promise.race([entry.done.then(() => false), sleep(graceMs).then(() => true)]);
        if (timedOut) {
          say(`${name} did not stop within ${graceMs / 1000} s; killing it`);
          killGroup(entry.child.pid, 'SIGKILL');
          await entry.done;
        }
      }),
    );
  }

  async stopAll(graceMs) {
    this.stopping = true;
    await this.stop([...this.children.keys()].reverse(), graceMs);
    rmSync(path.join(this.runDir, 'children.json'), { force: true });
  }
}

/**
 * Stop processes recorded by an earlier supervisor that died without cleaning up (e.g. SIGKILL).
 * Only pids whose command line still matches what was recorded and whose cwd is this checkout
 * are touched. Resolves the names it stopped.
 */
export async function stopRecordedChildren(runDir) {
  let entries;
  try {
    entries = JSON.parse(readFileSync(path.join(runDir, 'children.json'), 'utf8'));
  } catch {
    return [];
  }
  const stopped = [];
  for (const [name, { pid, match, cwd }] of Object.entries(entries)) {
    if (!pidAlive(pid) || !processCmdline(pid).includes(match)) continue;
    let procCwd = '';
    try {
      procCwd = realpathSync(`/proc/${pid}/cwd`);
    } catch {
      // cannot tell: leave it alone
    }
    if (procCwd !== cwd) continue;
    killGroup(pid, 'SIGTERM');
    for (let i = 0; i < 100 && pidAlive(pid); i++) await sleep(100);
    killGroup(pid, 'SIGKILL');
    stopped.push(name);
  }
  rmSync(path.join(runDir, 'children.json'), { force: true });
  return stopped;
}
