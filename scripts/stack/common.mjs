// Shared helpers for the stack scripts. Plain Node ESM with no npm dependencies: parts of the
// stack (ensure-system, data paths) run before `npm ci` has installed anything.
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, realpathSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/** Absolute path of the checkout (the folder holding package.json). */
export const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

export const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

/** uid, gid and supplementary gids of a local user, read from /etc/passwd and /etc/group. */
export function lookupUser(name) {
  let passwd;
  try {
    passwd = readFileSync('/etc/passwd', 'utf8');
  } catch {
    return undefined;
  }
  const line = passwd.split('\n').find((l) => l.split(':')[0] === name);
  if (!line) return undefined;
  const [, , uid, gid] = line.split(':');
  const gids = new Set([Number(gid)]);
  try {
    for (const g of readFileSync('/etc/group', 'utf8').split('\n')) {
      const parts = g.split(':');
      if (parts.length >= 4 && parts[3].split(',').includes(name)) gids.add(Number(parts[2]));
    }
  } catch {
    // no /etc/group: primary group only
  }
  return { uid: Number(uid), gid: Number(gid), gids };
}

/** Whether `user` may search (traverse) `dir` and every directory above it, from mode bits. */
export function canTraverse(user, dir) {
  if (user.uid === 0) return true;
  let current = path.resolve(dir);
  for (;;) {
    let st;
    try {
      st = statSync(current);
    } catch {
      return false;
    }
    const bit =
      st.uid === user.uid ? 0o100 : user.gids.has(st.gid) ? 0o010 : 0o001;
    if ((st.mode & bit) === 0) return false;
    const parent = path.dirname(current);
    if (parent === current) return true;
    current = parent;
  }
}

/** Short stable hash of the checkout path, used to name data folders outside it. */
export function checkoutHash(root = repoRoot) {
  let real = root;
  try {
    real = realpathSync(root);
  } catch {
    // not created yet: hash the path as given
  }
  return createHash('sha256').update(real).digest('hex').slice(0, 10);
}

/**
 * Where this checkout keeps its demo data: `.data/` inside the checkout when the `postgres` user
 * can reach it, else `/var/tmp/gillwise-<hash>` (a clone under a mode-700 folder such as a
 * `mktemp -d` directory or /root cannot hold a cluster owned by `postgres`).
 * GILLWISE_DATA_ROOT overrides both.
 */
export function dataRoot() {
  if (process.env.GILLWISE_DATA_ROOT) return path.resolve(process.env.GILLWISE_DATA_ROOT);
  const inCheckout = path.join(repoRoot, '.data');
  if (!isRoot) return inCheckout; // the cluster then runs as the current user
  const pgUser = lookupUser('postgres');
  if (!pgUser || canTraverse(pgUser, repoRoot)) return inCheckout;
  return path.join('/var/tmp', `gillwise-${checkoutHash()}`);
}

/** Create a folder (and parents) that other users, notably `postgres`, may traverse. */
export function ensureDir(dir, mode = 0o755) {
  mkdirSync(dir, { recursive: true, mode });
  return dir;
}

/** Whether a process with this pid exists. */
export function pidAlive(pid) {
  if (!Number.isInteger(pid) || pid <= 0) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return err.code === 'EPERM';
  }
}

/** The command line of a running process ('' when unknown or gone). */
export function processCmdline(pid) {
  try {
    return readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0').join(' ').trim();
  } catch {
    return '';
  }
}

export function readPidFile(file) {
  try {
    const pid = Number.parseInt(readFileSync(file, 'utf8').trim().split('\n')[0], 10);
    return Number.isInteger(pid) ? pid : undefined;
  } catch {
    return undefined;
  }
}

export const sleep = (ms) => new Promise((resolve) => setTimeout(resolve, ms));

/** Wait until a process is gone; SIGKILL it after `timeoutMs`. Resolves true if it exited on its own. */
export async function waitForExit(pid, timeoutMs = 10_000) {
  const deadline = Date.now() + timeoutMs;
  while (pidAlive(pid)) {
    if (Date.now() > deadline) {
      try {
        process.kill(pid, 'SIGKILL');
      } catch {
        // already gone
      }
      await sleep(100);
      return false;
    }
    await sleep(50);
  }
  return true;
}

/**
 * Run a command asynchronously (never spawnSync: some of these talk to servers that may live in
 * this very process). Resolves { code, stdout, stderr }; rejects only when it cannot be started.
 * `inherit: true` streams output to this terminal instead of capturing it.
 */
export function run(cmd, args, { inherit = false, env, cwd, detached = false, input } = {}) {
  return new Promise((resolve, reject) => {
    const child = spawn(cmd, args, {
      cwd,
      env: env ?? process.env,
      detached,
      stdio: inherit ? ['ignore', 'inherit', 'inherit'] : [input === undefined ? 'ignore' : 'pipe', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    child.stdout?.on('data', (d) => (stdout += d));
    child.stderr?.on('data', (d) => (stderr += d));
    if (input !== undefined) child.stdin.end(input);
    child.on('error', reject);
    child.on('close', (code, signal) => resolve({ code: code ?? (signal ? 128 : 1), signal, stdout, stderr }));
  });
}

/** Like run() but rejects with the command's output when it exits non-zero. */
export async function runChecked(cmd, args, opts) {
  const result = await run(cmd, args, opts);
  if (result.code !== 0) {
    const output = `${result.stdout}\n${result.stderr}`.trim();
    throw new Error(`${[cmd, ...args].join(' ')} exited with ${result.code}${output ? `:\n${output}` : ''}`);
  }
  return result;
}

/** Find an executable on PATH (plus the sbin folders, which a non-login root shell may lack). */
export function which(name) {
  const dirs = [...(process.env.PATH ?? '').split(':'), '/usr/local/sbin', '/usr/sbin', '/sbin'];
  for (const dir of dirs) {
    if (!dir) continue;
    const candidate = path.join(dir, name);
    try {
      if (statSync(candidate).isFile()) return candidate;
    } catch {
      // not here
    }
  }
  return undefined;
}

/** Minimal flag parser: --name value, --name=value, --flag, --no-flag. */
export function parseFlags(argv) {
  const flags = {};
  const rest = [];
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (!arg.startsWith('--')) {
      rest.push(arg);
      continue;
    }
    const eq = arg.indexOf('=');
    if (eq > 0) {
      flags[arg.slice(2, eq)] = arg.slice(eq + 1);
    } else if (arg.startsWith('--no-')) {
      flags[arg.slice(5)] = false;
    } else if (i + 1 < argv.length && !argv[i + 1].startsWith('--')) {
      flags[arg.slice(2)] = argv[++i];
    } else {
      flags[arg.slice(2)] = true;
    }
  }
  return { flags, rest };
}

export function fileExists(p) {
  return existsSync(p);
}
