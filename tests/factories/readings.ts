import type { DataSource } from 'typeorm';

export type ReadingSpec = { probeId: string; quantity: string; at: Date; value: number; quality?: 'good' | 'suspect' | 'bad' };

/** Stores probe readings directly (bypassing MQTT) for tests that start from a known history. */
export async function insertReadings(ds: DataSource, rows: ReadingSpec[]): Promise<void> {
  if (!rows.length) return;
  await ds.query(
    `INSERT INTO readings (probe_id, quantity, at, value, quality)
     SELECT * FROM unnest($1::uuid[], $2::text[], $3::timestamptz[], $4::float8[], $5::text[]) ON CONFLICT DO NOTHING`,
    [rows.map((r) => r.probeId), rows.map((r) => r.quantity), rows.map((r) => r.at.toISOString()), rows.map((r) => r.value), rows.map((r) => r.quality ?? 'good')],
  );
}

export async function probeOf(ds: DataSource, unitId: string): Promise<string> {
  const rows = (await ds.query('SELECT id FROM probes WHERE unit_id = $1 LIMIT 1', [unitId])) as Array<{ id: string }>;
  if (!rows[0]) throw new Error(`unit ${unitId} has no probe`);
  return rows[0].id;
}
