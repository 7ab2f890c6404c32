// The Gillwise server (server/index.ts, unchanged) with an event-loop delay monitor around it: every
// second the histogram since the last report goes to BENCH_LOOP_FILE as one JSON line, so a benchmark
// can tell a busy event loop from a slow database.
import { appendFileSync } from 'node:fs';
import { monitorEventLoopDelay } from 'node:perf_hooks';

const file = process.env.BENCH_LOOP_FILE;
if (file) {
  const h = monitorEventLoopDelay({ resolution: 5 });
  h.enable();
  setInterval(() => {
    appendFileSync(file, `${JSON.stringify({ t: Date.now(), p50: h.percentile(50) / 1e6, p99: h.percentile(99) / 1e6, max: h.max / 1e6 })}\n`);
    h.reset();
  }, 1000).unref();
}
await import('../../server/index');
