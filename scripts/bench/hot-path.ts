// Per-message CPU of the ingest hot path, in-process and without I/O, so that changes can be compared on
// a machine shared with other work (best of several rounds). Run by scripts/bench/run.mjs, or alone:
//   node_modules/.bin/tsx scripts/bench/hot-path.ts [out.json]
import { writeFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { probeReadingsPayloadSchema } from '../../shared/schemas/mqtt.schema';
import { fastPayload } from '../../server/ingest/fast-payload';
import { ReadingHandler, type ReadingRow } from '../../server/ingest/reading-handler';

const probe = { probeId: '6f1c2a4e-8d2b-4c1e-9a55-0b7f3e2d1c00', probeKey: 'bench-00000', farmId: 'f', unitId: 'u' };
const base = Date.now() - 3600_000;
const messages = Array.from({ length: 20_000 }, (_, i) =>
  Buffer.from(
    `{"v":1,"samples":[{"at":"${new Date(base + i).toISOString()}","values":[{"quantity":"ph","value":7.8,"unit":"pH"},` +
      `{"quantity":"water_temperature","value":26.4,"unit":"C"},{"quantity":"dissolved_oxygen","value":6.8,"unit":"mg/L"},` +
      `{"quantity":"salinity","value":0.4,"unit":"ppt"}]}]}`,
  ),
);

function best(label: string, rounds: number, per: number, fn: () => void): [string, number] {
  let min = Infinity;
  for (let r = 0; r < rounds; r++) {
    const t = performance.now();
    fn();
    min = Math.min(min, performance.now() - t);
  }
  return [label, Math.round((min / per) * 1000 * 100) / 100]; // µs per item
}

// Warm up every path once, so that the first measured one does not pay for the JIT.
for (const m of messages.slice(0, 2000)) probeReadingsPayloadSchema.safeParse(JSON.parse(m.toString('utf8')));
for (const m of messages.slice(0, 2000)) fastPayload(JSON.parse(m.toString('utf8')));
const out: Record<string, number> = {};
const add = ([k, v]: [string, number]) => (out[k] = v);
add(best('JSON.parse, µs/message', 7, messages.length, () => messages.forEach((m) => JSON.parse(m.toString('utf8')))));
add(best('JSON.parse + zod safeParse, µs/message', 7, messages.length, () => messages.forEach((m) => probeReadingsPayloadSchema.safeParse(JSON.parse(m.toString('utf8'))))));
add(best('JSON.parse + fast check, µs/message', 7, messages.length, () => messages.forEach((m) => fastPayload(JSON.parse(m.toString('utf8'))))));
const handler = new ReadingHandler();
const now = Date.now();
add(best('ReadingHandler.handle (whole), µs/message', 7, messages.length, () => messages.forEach((m) => handler.handle(probe, m, now))));

const rows: ReadingRow[] = messages.slice(0, 1250).flatMap((m) => handler.handle(probe, m, now).rows);
// What pg does to each array parameter before sending it (lib/utils.js prepareValue → arrayString).
const utilsModule = 'pg/lib/utils.js';
const prepare = ((await import(utilsModule)) as { default: { prepareValue: (v: unknown) => unknown } }).default.prepareValue;
add(
  best('5 column arrays via pg prepareValue, µs/row', 7, rows.length, () => {
    for (let k = 0; k < 4; k++) {
      const cols = [rows.map((r) => r.probeId), rows.map((r) => r.quantity), rows.map((r) => r.at.toISOString()), rows.map((r) => r.value), rows.map((r) => r.quality)];
      cols.forEach((c) => prepare(c));
    }
  }),
);
out['5 column arrays via pg prepareValue, µs/row'] = out['5 column arrays via pg prepareValue, µs/row']! / 4;
add(
  best('5 column array literals built in one pass, µs/row', 7, rows.length, () => {
    for (let k = 0; k < 4; k++) {
      let a = '{', b = '{', c = '{', d = '{', e = '{';
      for (let i = 0; i < rows.length; i++) {
        const r = rows[i]!;
        const s = i ? ',' : '';
        a += s + r.probeId; b += s + r.quantity; c += s + r.at.toISOString(); d += s + String(r.value); e += s + r.quality;
      }
      if (!a.length || !b.length || !c.length || !d.length || !e.length) throw new Error('empty');
    }
  }),
);
out['5 column array literals built in one pass, µs/row'] = out['5 column array literals built in one pass, µs/row']! / 4;
for (const k of Object.keys(out)) out[k] = Math.round(out[k]! * 100) / 100;
if (process.argv[2]) writeFileSync(process.argv[2], JSON.stringify(out));
else console.log(out);
