// Installs what the local stack needs and this machine lacks. Plain Node with no npm
// dependencies, because it runs before `npm ci`.
//
//   node scripts/stack/ensure-system.mjs [--chromium] [--mosquitto] [--no-npm] [--check]
//
// Debian packages: postgresql-15 (or the distribution's `postgresql`), redis-server, and with
// flags chromium and mosquitto(-clients); installed with apt-get when running as root, otherwise
// it names the command to run and exits non-zero. Then `npm ci` when node_modules is missing or
// older than package-lock.json.
import { existsSync, lstatSync, statSync } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { isRoot, lookupUser, parseFlags, repoRoot, run, which } from './common.mjs';
import { pgBinDir } from './postgres.mjs';

export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';

const log = (msg) => console.log(`[system] ${msg}`);

function hasPostgres() {
  const dir = pgBinDir();
  const binaries = dir && ['initdb', 'pg_ctl', 'postgres'].every((b) => existsSync(path.join(dir, b)));
  return Boolean(binaries) && (!isRoot || Boolean(lookupUser('postgres')));
}

/** What is missing: [{ what, pkg }] where pkg is a Debian package name (or a function choosing one). */
export function missingSystemPackages({ chromium = false, mosquitto = false } = {}) {
  const missing = [];
  if (!hasPostgres()) missing.push({ what: 'PostgreSQL server', pkg: 'postgresql-15' });
  if (!which('redis-server')) missing.push({ what: 'redis-server', pkg: 'redis-server' });
  if (chromium && !existsSync(CHROMIUM_PATH)) missing.push({ what: `Chromium (${CHROMIUM_PATH})`, pkg: 'chromium' });
  if (mosquitto && !which('mosquitto_pub')) missing.push({ what: 'mosquitto_pub', pkg: 'mosquitto-clients' });
  if (mosquitto && !which('mosquitto')) missing.push({ what: 'mosquitto broker', pkg: 'mosquitto' });
  return missing;
}

async function aptHasCandidate(pkg) {
  const { stdout } = await run('apt-cache', ['policy', pkg]);
  const m = /Candidate:\s*(\S+)/.exec(stdout);
  return Boolean(m && m[1] !== '(none)');
}

async function aptInstall(packages) {
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  log('apt-get update');
  const update = await run('apt-get', ['update'], { inherit: true, env });
  if (update.code !== 0) throw new Error(`apt-get update failed with exit code ${update.code}`);
  // Debian bookworm ships postgresql-15; another release names a different major version.
  const resolved = [];
  for (const pkg of packages) {
    if (pkg === 'postgresql-15' && !(await aptHasCandidate(pkg))) resolved.push('postgresql');
    else resolved.push(pkg);
  }
  log(`apt-get install -y ${resolved.join(' ')}`);
  const install = await run('apt-get', ['install', '-y', ...resolved], { inherit: true, env });
  if (install.code !== 0) throw new Error(`apt-get install ${resolved.join(' ')} failed with exit code ${install.code}`);
}

function mtime(p) {
  try {
    return statSync(p).mtimeMs;
  } catch {
    return undefined;
  }
}

/** Whether `npm ci` is due: node_modules missing, or installed from an older package-lock.json. */
export function npmInstallNeeded(root = repoRoot) {
  const lock = mtime(path.join(root, 'package-lock.json'));
  const installed = mtime(path.join(root, 'node_modules', '.package-lock.json')) ?? mtime(path.join(root, 'node_modules'));
  if (installed === undefined) return 'node_modules is missing';
  if (lock !== undefined && installed < lock) return 'node_modules is older than package-lock.json';
  return undefined;
}

/**
 * Install what is missing. Rejects with a clear message when packages are missing and this is
 * not root (the error has `exitCode`).
 */
export async function ensureSystem({ chromium = false, mosquitto = false, npm = true, check = false } = {}) {
  const missing = missingSystemPackages({ chromium, mosquitto });
  if (missing.length > 0) {
    const pkgs = [...new Set(missing.map((m) => m.pkg))];
    const what = missing.map((m) => m.what).join(', ');
    if (check || !isRoot) {
      const err = new Error(
        `Missing: ${what}.\nInstall with:  sudo apt-get update && sudo apt-get install -y ${pkgs.join(' ')}` +
          (check ? '' : '\n(this script installs them itself when run as root)'),
      );
      err.exitCode = 2;
      throw err;
    }
    log(`missing: ${what}`);
    await aptInstall(pkgs);
    const still = missingSystemPackages({ chromium, mosquitto });
    if (still.length > 0) throw new Error(`still missing after apt-get install: ${still.map((m) => m.what).join(', ')}`);
  }
  if (npm) {
    const why = npmInstallNeeded();
    let linked = false;
    try {
      linked = lstatSync(path.join(repoRoot, 'node_modules')).isSymbolicLink();
    } catch {
      // missing: npm ci below
    }
    if (why && linked) {
      // npm ci empties the folder a symlinked node_modules points to: never do that to another checkout.
      log(`${why}, but node_modules is a symlink; not running npm ci (run it where it points, if needed)`);
    } else if (why) {
      if (check) {
        const err = new Error(`${why}: run npm ci`);
        err.exitCode = 2;
        throw err;
      }
      log(`${why}: npm ci`);
      const result = await run('npm', ['ci', '--no-audit', '--no-fund'], { inherit: true, cwd: repoRoot });
      if (result.code !== 0) throw new Error(`npm ci failed with exit code ${result.code}`);
    }
  }
}

const isMain = process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href;
if (isMain) {
  const { flags } = parseFlags(process.argv.slice(2));
  if (flags.help) {
    console.log('usage: node scripts/stack/ensure-system.mjs [--chromium] [--mosquitto] [--no-npm] [--check]');
    process.exit(0);
  }
  try {
    await ensureSystem({
      chromium: flags.chromium === true,
      mosquitto: flags.mosquitto === true,
      npm: flags.npm !== false,
      check: flags.check === true,
    });
    log('system ready');
  } catch (err) {
    console.error(`[system] ${err.message}`);
    process.exit(err.exitCode ?? 1);
  }
}
