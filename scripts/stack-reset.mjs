// npm run stack:reset -- --yes: stop everything the local stack runs from this checkout
// (app processes, SMTP fake, Redis, PostgreSQL) and delete its data root. Without --yes (or
// CI=true) it only says what it would delete.
import { existsSync, rmSync } from 'node:fs';
import { parseFlags, pidAlive, processCmdline, readPidFile, sleep } from './stack/common.mjs';
import { runningCluster, stopPostgres } from './stack/postgres.mjs';
import { runningRedis, stopRedis } from './stack/redis.mjs';
import { stackPaths } from './stack/stack.mjs';
import { stopRecordedChildren } from './stack/supervisor.mjs';

const { flags } = parseFlags(process.argv.slice(2));
const confirmed = flags.yes === true || process.env.CI === 'true';
const paths = stackPaths();
const log = (msg) => console.log(`[reset] ${msg}`);

if (!existsSync(paths.root)) {
  log(`nothing to reset: ${paths.root} does not exist`);
  process.exit(0);
}
if (!confirmed) {
  log(`this stops the local stack and deletes ${paths.root} (database, queues, caught mail, secrets).`);
  log('run again with --yes to do it:  npm run stack:reset -- --yes');
  process.exit(1);
}

// A running `npm start` / `npm run dev` shuts down in order by itself on SIGTERM.
const stackPid = readPidFile(paths.lock);
if (stackPid && pidAlive(stackPid) && /scripts\/(start|dev)\.mjs/.test(processCmdline(stackPid))) {
  log(`stopping the running stack (pid ${stackPid})`);
  process.kill(stackPid, 'SIGTERM');
  for (let i = 0; i < 300 && pidAlive(stackPid); i++) await sleep(100);
  if (pidAlive(stackPid)) process.kill(stackPid, 'SIGKILL');
}
const leftovers = await stopRecordedChildren(paths.run);
if (leftovers.length > 0) log(`stopped ${leftovers.join(', ')}`);
if (runningRedis(paths.redis)) {
  await stopRedis({ dir: paths.redis });
  log('stopped Redis');
}
if (runningCluster(paths.pg)) {
  await stopPostgres({ dataDir: paths.pg });
  log('stopped PostgreSQL');
}
rmSync(paths.root, { recursive: true, force: true });
log(`deleted ${paths.root}`);
