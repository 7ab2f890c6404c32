// Child processes for the fault tests: the real server entry (server/index.ts) and worker entry
// (worker/index.ts) run under tsx, so a test can SIGTERM or SIGKILL them like an operator or the
// kernel would, and start them again on the same ports.
//
// tsx runs the script in a node child of its own and relays SIGTERM to it, so a graceful stop is
// sent to the tsx process alone (sending it to both would deliver it twice). A hard kill cannot be
// relayed: each child is started in a process group of its own and SIGKILL goes to that group.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { freePort, waitForPort } from '../../../scripts/stack/ports.mjs';

const root = path.resolve(import.meta.dirname, '../../..');
const TSX = path.join(root, 'node_modules/.bin/tsx');
const LOG_LINES = 400;

export type Exit = { code: number | null; signal: NodeJS.Signals | null };

export type ChildHandle = {
  name: string;
  pid: number;
  /** The last lines the process wrote (pino JSON), for failure messages. */
  logs(): string[];
  /** Resolves when the process has exited. */
  exited: Promise<Exit>;
  alive(): boolean;
  /** Resolves once a log line matching `pattern` has been written (from the start of the process). */
  waitForLog(pattern: RegExp, timeoutMs?: number): Promise<string>;
  /** SIGTERM (graceful; relayed by tsx) and wait for the exit. */
  stop(timeoutMs?: number): Promise<Exit>;
  /** SIGKILL the whole process group (tsx and the node process running the entry). */
  kill(): Promise<Exit>;
};

const started = new Set<ChildHandle>();
let exitHookInstalled = false;

function killGroup(pid: number, signal: NodeJS.Signals): void {
  try {
    process.kill(-pid, signal);
  } catch {
    // already gone
  }
}

/** Last resort, should a test file die before its afterAll: no orphan keeps a port or a database. */
function installExitHook(): void {
  if (exitHookInstalled) return;
  exitHookInstalled = true;
  process.once('exit', () => {
    for (const child of started) if (child.alive()) killGroup(child.pid, 'SIGKILL');
  });
}

export function spawnEntry(name: string, entry: string, env: Record<string, string | undefined>): ChildHandle {
  installExitHook();
  const child: ChildProcess = spawn(TSX, [entry], {
    cwd: root,
    env: { PATH: process.env.PATH, HOME: process.env.HOME, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
    detached: true,
  });
  if (!child.pid) throw new Error(`${name}: could not start ${entry}`);
  const pid = child.pid;
  const lines: string[] = [];
  const waiters: Array<{ pattern: RegExp; resolve: (line: string) => void }> = [];
  let running = true;
  const onLine = (line: string) => {
    lines.push(line);
    if (lines.length > LOG_LINES) lines.shift();
    for (const w of [...waiters]) {
      if (w.pattern.test(line)) {
        waiters.splice(waiters.indexOf(w), 1);
        w.resolve(line);
      }
    }
  };
  const all: string[] = [];
  for (const stream of [child.stdout, child.stderr]) {
    let rest = '';
    stream?.setEncoding('utf8');
    stream?.on('data', (chunk: string) => {
      rest += chunk;
      let nl: number;
      while ((nl = rest.indexOf('\n')) >= 0) {
        const line = rest.slice(0, nl);
        rest = rest.slice(nl + 1);
        all.push(line);
        if (all.length > 5000) all.shift();
        onLine(line);
      }
    });
  }
  const exited = new Promise<Exit>((resolve) => {
    child.once('exit', (code, signal) => {
      running = false;
      resolve({ code, signal });
    });
  });
  const handle: ChildHandle = {
    name,
    pid,
    logs: () => [...lines],
    exited,
    alive: () => running,
    waitForLog(pattern, timeoutMs = 60_000) {
      const seen = all.find((l) => pattern.test(l));
      if (seen) return Promise.resolve(seen);
      return new Promise<string>((resolve, reject) => {
        const timer = setTimeout(() => {
          reject(new Error(`${name}: no log line matching ${pattern} after ${timeoutMs} ms\n${lines.slice(-30).join('\n')}`));
        }, timeoutMs);
        const waiter = {
          pattern,
          resolve: (line: string) => {
            clearTimeout(timer);
            resolve(line);
          },
        };
        waiters.push(waiter);
        void exited.then((exit) => {
          if (!waiters.includes(waiter)) return;
          clearTimeout(timer);
          reject(new Error(`${name} exited (${JSON.stringify(exit)}) before logging ${pattern}\n${lines.slice(-30).join('\n')}`));
        });
      });
    },
    async stop(timeoutMs = 20_000) {
      if (!running) return exited;
      try {
        process.kill(pid, 'SIGTERM');
      } catch {
        // gone already
      }
      const timer = setTimeout(() => killGroup(pid, 'SIGKILL'), timeoutMs);
      const exit = await exited;
      clearTimeout(timer);
      // tsx exits once its child has; make sure nothing of the group lingers.
      killGroup(pid, 'SIGKILL');
      started.delete(handle);
      return exit;
    },
    async kill() {
      killGroup(pid, 'SIGKILL');
      const exit = await exited;
      started.delete(handle);
      return exit;
    },
  };
  started.add(handle);
  return handle;
}

export type ServerPorts = { httpPort: number; mqttPort: number };

export async function allocatePorts(): Promise<ServerPorts> {
  const httpPort = await freePort();
  let mqttPort = await freePort();
  while (mqttPort === httpPort) mqttPort = await freePort();
  return { httpPort, mqttPort };
}

/** Starts server/index.ts and resolves once it serves HTTP and accepts MQTT connections. */
export async function startServerProcess(env: Record<string, string | undefined>, ports: ServerPorts, label = 'server'): Promise<ChildHandle> {
  const child = spawnEntry(label, 'server/index.ts', {
    ...env,
    HTTP_PORT: String(ports.httpPort),
    MQTT_PORT: String(ports.mqttPort),
    PUBLIC_URL: `http://127.0.0.1:${ports.httpPort}`,
  });
  try {
    await child.waitForLog(/Gillwise server listening/, 60_000);
    await waitForPort(ports.mqttPort, { timeoutMs: 10_000 });
  } catch (err) {
    await child.kill();
    throw err;
  }
  return child;
}

/** Starts worker/index.ts and resolves once its Workers are running. */
export async function startWorkerProcess(env: Record<string, string | undefined>, label = 'worker'): Promise<ChildHandle> {
  const child = spawnEntry(label, 'worker/index.ts', { ...env });
  try {
    await child.waitForLog(/Gillwise worker ready/, 60_000);
  } catch (err) {
    await child.kill();
    throw err;
  }
  return child;
}

/** Pino lines at level ≥ 50 (error, fatal), for "did anything blow up" checks. */
export function errorLines(child: ChildHandle): string[] {
  return child.logs().filter((l) => /"level":(5|6)0/.test(l));
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Polls `check` until it returns a truthy value; rejects with `what` after timeoutMs. */
export async function waitFor<T>(what: string, check: () => Promise<T> | T, timeoutMs = 60_000, everyMs = 100): Promise<NonNullable<T>> {
  const deadline = Date.now() + timeoutMs;
  let last: unknown;
  for (;;) {
    try {
      const v = await check();
      if (v) return v as NonNullable<T>;
    } catch (err) {
      last = err;
    }
    if (Date.now() > deadline) throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}${last ? `: ${String(last)}` : ''}`);
    await sleep(everyMs);
  }
}
