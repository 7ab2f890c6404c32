// Vitest global setup for browser tests: builds the client once so the tests load the real bundle.
import { execFile } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';

const root = path.resolve(import.meta.dirname, '../..');

function newest(dir: string): number {
  let latest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, entry.name);
    latest = Math.max(latest, entry.isDirectory() ? newest(p) : statSync(p).mtimeMs);
  }
  return latest;
}

export default async function buildClient(): Promise<void> {
  const index = path.join(root, 'dist/client/index.html');
  const sources = Math.max(newest(path.join(root, 'src')), newest(path.join(root, 'shared')), statSync(path.join(root, 'index.html')).mtimeMs);
  if (existsSync(index) && statSync(index).mtimeMs > sources) return;
  await promisify(execFile)(process.execPath, [path.join(root, 'node_modules/vite/bin/vite.js'), 'build', '--logLevel', 'warn'], { cwd: root });
}
