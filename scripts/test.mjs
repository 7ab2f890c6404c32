// npm test: make sure the machine has what the tests need (PostgreSQL, Redis, Chromium, the
// mosquitto clients, node_modules), then `vitest run` with any extra arguments; exits with its code.
// The tests start their own throwaway PostgreSQL and Redis on free ports (tests/setup), so this
// runs fine next to `npm start`.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { repoRoot } from './stack/common.mjs';
import { ensureSystem } from './stack/ensure-system.mjs';

try {
  await ensureSystem({ chromium: true, mosquitto: true });
} catch (err) {
  console.error(`[system] ${err.message}`);
  process.exit(err.exitCode ?? 1);
}

// Static checks first: a type error or a broken import boundary fails the run like a failing test.
// GILLWISE_SKIP_STATIC=1 skips them (for quick local runs of a single file).
import { spawnSync } from 'node:child_process';
if (process.env.GILLWISE_SKIP_STATIC !== '1') {
  const bin = (name) => path.join(repoRoot, 'node_modules', '.bin', name);
  for (const [label, cmd, args] of [
    ['typecheck (server, worker, shared, simulator, tests)', bin('tsc'), ['-p', 'tsconfig.json']],
    ['typecheck (client)', bin('tsc'), ['-p', 'tsconfig.app.json']],
    ['typecheck (browser tests)', bin('tsc'), ['-p', 'tsconfig.e2e.json']],
    ['lint', bin('eslint'), ['.']],
  ]) {
    console.log(`[test] ${label}`);
    const r = spawnSync(cmd, args, { cwd: repoRoot, stdio: 'inherit' });
    if (r.status !== 0) {
      console.error(`[test] ${label} failed`);
      process.exit(r.status ?? 1);
    }
  }
}

const vitest = spawn(process.execPath, [path.join(repoRoot, 'node_modules', 'vitest', 'vitest.mjs'), 'run', ...process.argv.slice(2)], {
  cwd: repoRoot,
  stdio: 'inherit',
});
// Ctrl-C reaches vitest directly (same process group); just do not die before it has cleaned up.
for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) {
  process.on(signal, () => {
    if (signal !== 'SIGINT') vitest.kill(signal);
  });
}
vitest.on('error', (err) => {
  console.error(`could not run vitest: ${err.message}`);
  process.exit(1);
});
vitest.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
