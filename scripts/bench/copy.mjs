// The storage ceiling: COPY of the same rows (probe, 4 quantities, one instant per message) into a table
// of the same shape as readings (LIKE readings INCLUDING ALL: the primary key and the BRIN index), one
// COPY statement (one commit) per 20,000 rows, first on one connection, then on two side by side.
//   node scripts/bench/copy.mjs <databaseUrl> <rows> <out.json> <probeIdsJson>
import { writeFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { pipeline } from 'node:stream/promises';
import { Readable } from 'node:stream';
import pg from 'pg';
import copyStreams from 'pg-copy-streams';

const [url, rowsArg, outFile, idsJson] = process.argv.slice(2);
const total = Number(rowsArg);
const probeIds = JSON.parse(idsJson);
const CHUNK = 20_000;
const quantities = ['ph', 'water_temperature', 'dissolved_oxygen', 'salinity'];
const values = ['7.85', '26.4', '6.8', '0.4'];

function* chunks(rows, epochMs) {
  // Messages round-robin over probes, 4 rows each, as the load generator sends them.
  let made = 0;
  let seq = 0;
  while (made < rows) {
    const lines = [];
    const n = Math.min(CHUNK, rows - made);
    while (lines.length < n) {
      const probe = probeIds[seq % probeIds.length];
      const at = new Date(epochMs + Math.floor(seq / probeIds.length)).toISOString();
      for (let q = 0; q < 4 && lines.length < n; q++) lines.push(`${probe}\t${quantities[q]}\t${at}\t${values[q]}\tgood\n`);
      seq++;
    }
    made += n;
    yield lines.join('');
  }
}

async function stream(client, rows, epochMs) {
  for (const text of chunks(rows, epochMs)) {
    const copy = client.query(copyStreams.from('COPY readings_copy (probe_id, quantity, at, value, quality) FROM STDIN'));
    await pipeline(Readable.from([text]), copy);
  }
}

const a = new pg.Client({ connectionString: url });
const b = new pg.Client({ connectionString: url });
await a.connect();
await b.connect();
await a.query('DROP TABLE IF EXISTS readings_copy');
await a.query('CREATE TABLE readings_copy (LIKE readings INCLUDING ALL)');
const base = Date.now() - 40 * 24 * 3600_000;

let t = performance.now();
await stream(a, total, base);
const one = (performance.now() - t) / 1000;

t = performance.now();
const half = Math.floor(total / 2);
await Promise.all([stream(a, half, base + 10 * 24 * 3600_000), stream(b, total - half, base + 20 * 24 * 3600_000)]);
const two = (performance.now() - t) / 1000;
const { rows } = await a.query('SELECT count(*)::bigint AS n FROM readings_copy');
await a.query('DROP TABLE readings_copy');
await a.end();
await b.end();
writeFileSync(outFile, JSON.stringify({ rows: total, seconds: one, rowsPerSec: total / one, seconds2: two, rowsPerSec2: total / two, counted: Number(rows[0].n) }));
