// EXPLAIN (ANALYZE, BUFFERS) of the queries behind GET …/units/:unitId/series, exactly as the readings
// repository runs them (seriesSql), for one unit's first probe and pH, over 24 h and 90 d.
//   tsx scripts/bench/explain.ts <databaseUrl> '{"farmId","unitId","now"}' <out.json>
import { writeFileSync } from 'node:fs';
import pg from 'pg';
import { seriesSql } from '../../server/modules/readings/readings.repository';
import { bucketSecondsFor } from '../../server/modules/readings/readings.service';

const [url, argsJson, outFile] = process.argv.slice(2);
if (!url || !argsJson || !outFile) throw new Error('usage: explain.ts <databaseUrl> <args> <out.json>');
const { unitId, now } = JSON.parse(argsJson) as { farmId: string; unitId: string; now: string };
const db = new pg.Client({ connectionString: url });
await db.connect();
const probeIds = (await db.query('SELECT id FROM probes WHERE unit_id = $1', [unitId])).rows.map((r: { id: string }) => r.id);
const to = new Date(now);
const out: Record<string, string> = {};
const explain = async (label: string, sql: string, params: unknown[], workMem?: string) => {
  await db.query('BEGIN');
  if (workMem) await db.query(`SET LOCAL work_mem = '${workMem}'`);
  const r = await db.query(`EXPLAIN (ANALYZE, BUFFERS) ${sql}`, params);
  await db.query('COMMIT');
  out[label] = r.rows.map((x: Record<string, string>) => x['QUERY PLAN']).join('\n');
};
for (const days of [1, 90]) {
  const from = new Date(to.getTime() - days * 86400_000);
  await explain(`countUpTo ${days} d`, seriesSql.countUpTo, [probeIds, 'ph', from, to, 2001]);
  const b = bucketSecondsFor(from, to, 2000);
  if (days === 1) await explain(`raw ${days} d`, seriesSql.raw, [probeIds, 'ph', from, to]);
  else await explain(`buckets ${days} d (${b} s)`, seriesSql.buckets, [probeIds, 'ph', from, to, b, '1970-01-01T00:00:00Z'], '16MB');
}
writeFileSync(outFile, JSON.stringify(out));
await db.end();
