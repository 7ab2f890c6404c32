import { randomUUID } from 'node:crypto';
import type { DataSource } from 'typeorm';
import type { RouteFixture } from '../../server/http/route-registry';
import { seedDemoFarms } from './demo';

type Row = { id: string };
/** The photo file the fixture's observation points at; the route × role test writes it into the data folder. */
export const FIXTURE_PHOTO = '00000000-0000-4000-8000-000000000001.png';
const first = async (ds: DataSource, sql: string, params: unknown[] = []) => ((await ds.query(sql, params)) as Row[])[0]?.id ?? '';

/**
 * Ids the route × role test fills into every route's example: the demo farm (Harrow Bend) and, under
 * `other*`, the same kinds of rows on the second demo farm (Cedar Flats), for farm-isolation checks.
 * A module that adds a route whose example needs another id adds its lookup here.
 */
export async function buildRouteFixture(ds: DataSource): Promise<RouteFixture> {
  const seed = await seedDemoFarms(ds);
  const farmId = seed.farms['harrow-bend']!;
  const otherFarmId = seed.farms['cedar-flats']!;
  const unitId = seed.units['harrow-bend:P1']!;
  const otherFarmUnitId = seed.units['cedar-flats:T1']!;
  const testId = await first(ds, `SELECT id FROM water_tests WHERE unit_id = $1 ORDER BY sampled_at DESC LIMIT 1`, [unitId]);
  const probeId = await first(ds, `SELECT id FROM probes WHERE unit_id = $1`, [unitId]);
  const otherFarmProbeId = await first(ds, `SELECT id FROM probes WHERE unit_id = $1`, [otherFarmUnitId]);
  const qrLabelId = ((await ds.query(`SELECT qr_label_id AS id FROM culture_units WHERE id = $1`, [unitId])) as Row[])[0]?.id ?? '';
  const thresholdProfileId = await first(ds, `SELECT id FROM threshold_profiles WHERE farm_id = $1 ORDER BY name LIMIT 1`, [farmId]);
  const feedingTableId = await first(ds, `SELECT id FROM feeding_tables WHERE farm_id = $1 ORDER BY name LIMIT 1`, [farmId]);
  const managerId = await first(ds, `SELECT id FROM users WHERE email = 'manager@harrowbend.example'`);
  const handId = await first(ds, `SELECT id FROM users WHERE email = 'hand@harrowbend.example'`);
  // An alert and a recommendation to act on, made directly so the fixture does not depend on the worker.
  const alertId = randomUUID();
  await ds.query(
    `INSERT INTO alerts (id, farm_id, unit_id, kind, level, state, condition_key, title, message, opened_at, last_seen_at)
     VALUES ($1, $2, $3, 'nh3_high', 'act', 'open', $4, 'Free ammonia high (fixture)', 'fixture', now(), now())`,
    [alertId, farmId, unitId, `fixture:${alertId}`],
  );
  const recommendationId = randomUUID();
  await ds.query(
    `INSERT INTO feed_recommendations (id, farm_id, unit_id, day, biomass_kg, planned_kg, planned_pct_bw, action, cut_pct, recommended_kg, reasons, inputs, rule_version, status, computed_at)
     VALUES ($1, $2, $3, CURRENT_DATE - 400, 9000, 270, 3, 'feed', 0, 270, '[]', '{}', 'fixture', 'pending', now())`,
    [recommendationId, farmId, unitId],
  );
  // Outbox rows for the outbox routes: one of the farm, one that belongs to no farm (a password reset).
  const outboxMessageId = await first(ds, `INSERT INTO outbox_messages (farm_id, kind, to_address, subject, body, status) VALUES ($1, 'alert', 'manager@harrowbend.example', 'Fixture alert', 'fixture', 'failed') RETURNING id`, [farmId]);
  const farmlessOutboxMessageId = await first(ds, `INSERT INTO outbox_messages (kind, to_address, subject, body, status) VALUES ('password_reset', 'hand@harrowbend.example', 'Fixture reset', 'fixture', 'failed') RETURNING id`);
  // An observation with a stored photo, for the photo routes.
  await ds.query(`INSERT INTO observations (farm_id, unit_id, kind, observed_at, photo_path) VALUES ($1, $2, 'water_colour', now(), $3)`, [farmId, unitId, FIXTURE_PHOTO]);
  // A second one for the upload examples, so an upload does not take the stored photo's place.
  const observationId = await first(ds, `INSERT INTO observations (farm_id, unit_id, kind, observed_at) VALUES ($1, $2, 'odour', now()) RETURNING id`, [farmId, unitId]);
  return {
    observationId,
    photoName: FIXTURE_PHOTO,
    farmId,
    otherFarmId,
    unitId,
    otherFarmUnitId,
    testId,
    probeId,
    otherFarmProbeId,
    qrLabelId,
    thresholdProfileId,
    feedingTableId,
    managerId,
    handId,
    alertId,
    recommendationId,
    outboxMessageId,
    farmlessOutboxMessageId,
    day: new Date().toISOString().slice(0, 10),
  };
}
