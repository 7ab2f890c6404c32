// Feed recommendations from real inputs: probe readings, kit results worked out by the worker,
// flow, treatments and observations, against the documented rule (docs/feeding.md).
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../setup/test-app';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { insertReadings, probeOf } from '../factories/readings';
import { signedIn } from '../factories/session';
import type { SeedResult } from '../../server/db/seed/seed';
import { addDays, localDay } from '../../shared/farm-time';
import { isFeedingDay } from '../../shared/feed';
import { racewayTanRiseMgL, tanProductionKgPerDay, unionizedFraction } from '../../shared/chemistry';
import { unitRationSchema, type UnitRationDto } from '../../shared/schemas/feed.schema';

let t: TestApp;
let seed: SeedResult;
let farmId: string;
const TZ = 'America/Chicago';
const MIN = 60_000;
const today = () => localDay(new Date(), TZ);

beforeAll(async () => {
  t = await startTestApp({ worker: true });
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
});
afterAll(() => t.close());

const unitId = (code: string) => seed.units[`harrow-bend:${code}`]!;

/** Probe readings every 15 min for the last `hours`; values may depend on how long ago. */
async function readings(code: string, values: Record<string, number | ((minutesAgo: number) => number)>, hours = 26) {
  const probeId = await probeOf(t.ds, unitId(code));
  const rows = [];
  for (let m = hours * 60; m >= 5; m -= 15) {
    const at = new Date(Date.now() - m * MIN);
    for (const [quantity, v] of Object.entries(values)) rows.push({ probeId, quantity, at, value: typeof v === 'function' ? v(m) : v });
  }
  await insertReadings(t.ds, rows);
}

async function kitTan(code: string, tanMgL: number) {
  const hand = await signedIn(t.app, demoEmail('hand'));
  const res = await hand.post(`/api/farms/${farmId}/units/${unitId(code)}/tests`).send({ clientId: randomUUID(), analyte: 'total_ammonia', method: 'salicylate', basis: 'tan-n', value: tanMgL });
  expect(res.status).toBe(201);
  await t.drain({ queues: ['results', 'feed'] });
}

async function rationOf(code: string, day?: string): Promise<UnitRationDto> {
  const planner = await signedIn(t.app, demoEmail('planner'));
  const res = await planner.get(`/api/farms/${farmId}/units/${unitId(code)}/ration${day ? `?day=${day}` : ''}`);
  expect(res.status).toBe(200);
  return unitRationSchema.parse(res.body);
}

describe('the demo raceway R3 with its flow cut', () => {
  it('gets a cut with reasons naming the reduced flow and the free ammonia', async () => {
    // The flow-cut scenario: 2,600 L/min design flow, cut to 15 % (390 L/min) six hours ago; spring water 15 °C, pH 7.9.
    await readings('R3', { water_temperature: 15, ph: 7.9, dissolved_oxygen: 7.4, flow: (m) => (m > 6 * 60 ? 2600 : 390) });
    await kitTan('R3', 1.7);
    const ration = await rationOf('R3');
    const rec = ration.recommendation!;
    expect(rec.status).toBe('pending');
    expect(rec.action).toBe('cut');
    expect(rec.cutPct).toBe(50);
    expect(rec.recommendedKg).toBeCloseTo(rec.plannedKg / 2, 1);
    const codes = rec.reasons.map((r) => r.code);
    expect(codes).toEqual(expect.arrayContaining(['nh3_act', 'flow_reduced', 'ammonia_load']));
    // Emerson et al. 1975 at 15 °C, pH 7.9: f ≈ 0.0212 → 1.7 mg/L TAN ≈ 0.044 mg/L NH3 (computed); trout act level 0.025 (EIFAC, from memory).
    expect(rec.reasons.find((r) => r.code === 'nh3_act')!.text).toMatch(/^NH3 0\.04\d mg\/L measured at \d\d:\d\d; act level 0\.025; cut 50 %$/);
    expect(rec.reasons.find((r) => r.code === 'flow_reduced')!.text).toMatch(/^Flow 390 L\/min \(probe at \d\d:\d\d\), 15 % of the 2,600 L\/min design; cut 25 %$/);
    expect(rec.reasons.find((r) => r.code === 'nh3_act')!.source).toMatch(/^SRAC 4603 \(qualitative.*\); step sizes common practice$/);
    // Every input is stored with it.
    expect(rec.inputs).toMatchObject({ flow: { flowLpm: 390, source: 'probe', designFlowLpm: 2600, reduced: true }, ammonia: { latest: { tanMgL: 1.7 } } });
    expect(ration.ammoniaLoad.check).toBe('under');
    expect(ration.loading.flowLpm).toBe(390);
    expect(ration.loading.designCapacityKg).toBeGreaterThan(ration.loading.capacityKg!);
    expect(ration.plan.method).toBe('hatchery_constant');
  });

  it('is capped at the most feed that keeps NH3 under target when the flow falls further', async () => {
    // A near-stopped inflow (60 L/min): the planned ration alone would push outlet NH3 over 0.025 mg/L.
    await readings('R3', { flow: 60 }, 1);
    const planner = await signedIn(t.app, demoEmail('planner'));
    await planner.post(`/api/farms/${farmId}/rations/recompute`).send({});
    const ration = await rationOf('R3');
    expect(ration.ammoniaLoad.check).toBe('over');
    const rec = ration.recommendation!;
    const cap = rec.reasons.find((r) => r.code === 'ammonia_load')!;
    expect(cap.effect).toBe('cap');
    expect(cap.text).toMatch(/over the 0\.025 mg\/L target; at most \d+\.\d kg keeps it under; flow is reduced vs design/);
    expect(rec.recommendedKg).toBeCloseTo(Math.min(rec.plannedKg / 2, ration.ammoniaLoad.maxFeedKgPerDay!), 1);
  });
});

describe('the most feed a raceway can take', () => {
  it('matches the forward calculation: feed → TAN produced → TAN rise at the flow → outlet NH3 = target', async () => {
    await readings('R2', { water_temperature: 16, ph: 8.0, dissolved_oxygen: 8.1, flow: 600 });
    const r = await rationOf('R2');
    const load = r.ammoniaLoad;
    expect(load.flow).toMatchObject({ flowLpm: 600, source: 'probe' });
    expect(load.targetNh3MgL).toBe(0.025);
    const feed = load.maxFeedKgPerDay!;
    expect(feed).toBeGreaterThan(0);
    const tan = tanProductionKgPerDay({ feedKgPerDay: feed, proteinFraction: 0.42 });
    const rise = racewayTanRiseMgL({ tanProductionKgPerDay: tan, flowLpm: 600 });
    const { fraction } = unionizedFraction({ pH: 8.0, temperatureC: 16, salinityPpt: 0 });
    // Outlet NH3 (as NH3, × 1.21588 from NH3-N) at the most feed equals the 0.025 mg/L target (rounding of the kg to 0.01).
    expect(fraction * (0 + rise) * 1.21588).toBeCloseTo(0.025, 4);
    // And the planned ration's own load is the same forward calculation.
    const plannedRise = racewayTanRiseMgL({ tanProductionKgPerDay: tanProductionKgPerDay({ feedKgPerDay: r.plan.plannedKg, proteinFraction: 0.42 }), flowLpm: 600 });
    expect(load.plannedTanRiseMgL).toBeCloseTo(plannedRise, 3);
  });

  it('uses the Losordo & DeLong set-up the same way (computed)', () => {
    // Losordo & DeLong (flow-rate estimation for RAS): 4,000 kg fish at 1.5 % BW = 60 kg feed at 40 % protein
    // → 2.208 kg TAN/day; at 1,000 L/min the rise is 1.533 mg/L (water-chemistry.md §6, computed).
    const tan = tanProductionKgPerDay({ feedKgPerDay: 4000 * 0.015, proteinFraction: 0.4 });
    expect(tan).toBeCloseTo(2.208, 3);
    expect(racewayTanRiseMgL({ tanProductionKgPerDay: tan, flowLpm: 1000 })).toBeCloseTo(1.533, 3);
  });
});

describe('dissolved oxygen at dawn', () => {
  it('withholds feed while DO is below the catfish critical level, and feeds again once it recovers', async () => {
    // Channel catfish critical DO 2.0 mg/L (Cole & Boyd, husbandry §1): a night crash to 1.4–1.6 mg/L.
    await readings('P1', { water_temperature: 27, ph: 7.8, dissolved_oxygen: (m) => (m > 90 ? 1.6 : 1.4) });
    const planner = await signedIn(t.app, demoEmail('planner'));
    await planner.post(`/api/farms/${farmId}/rations/recompute`).send({});
    const low = (await rationOf('P1')).recommendation!;
    expect(low).toMatchObject({ action: 'withhold', recommendedKg: 0, cutPct: 100 });
    expect(low.reasons[0]!.text).toMatch(/^DO 1\.4 mg\/L at \d\d:\d\d, below the 2\.0 mg\/L critical level for channel catfish; withhold until it recovers$/);
    // Aerators on: DO back at 4.6 mg/L.
    await insertReadings(t.ds, [{ probeId: await probeOf(t.ds, unitId('P1')), quantity: 'dissolved_oxygen', at: new Date(Date.now() - MIN), value: 4.6 }]);
    await planner.post(`/api/farms/${farmId}/rations/recompute`).send({});
    const back = (await rationOf('P1')).recommendation!;
    expect(back.action).not.toBe('withhold');
    expect(back.reasons.map((r) => r.code)).not.toContain('do_low');
    expect(back.recommendedKg).toBeGreaterThan(0);
  });

  it('withholds on an open act-level DO alert for the unit', async () => {
    await readings('S2', { water_temperature: 28, ph: 7.9, dissolved_oxygen: 5.2, salinity: 15 });
    await t.ds.query(
      `INSERT INTO alerts (farm_id, unit_id, kind, level, state, condition_key, title, message, opened_at, last_seen_at)
       VALUES ($1, $2, 'do_projected_low', 'act', 'open', $3, 'DO projected below 3.0 mg/L before dawn', 'test', now(), now())`,
      [farmId, unitId('S2'), `test:${randomUUID()}`],
    );
    const r = await rationOf('S2');
    expect(r.proposal.action).toBe('withhold');
    expect(r.proposal.reasons.find((x) => x.code === 'do_alert')!.text).toBe('Open alert: DO projected below 3.0 mg/L before dawn; withhold until it is resolved');
  });
});

describe('the planned ration from the catfish temperature bands (extension sources, published)', () => {
  it('plans 3 % of body weight at 21 °C and above, capped at 134.5 kg/ha/day × pond area', async () => {
    await readings('P3', { water_temperature: 24, ph: 7.8, dissolved_oxygen: 6.5 });
    const r = await rationOf('P3');
    expect(r.plan.status).toBe('ok');
    expect(r.plan.pctBodyWeightPerDay).toBe(3);
    expect(r.plan.temperature).toMatchObject({ temperatureC: 24, basis: 'probe_mean' });
    expect(r.plan.uncappedKg).toBeCloseTo(r.biomass.biomassKg! * 0.03, 1);
    // P3 is 140 m × 110 m = 1.54 ha → cap 134.5 × 1.54 = 207.13 kg/day (computed).
    expect(r.plan.capKg).toBeCloseTo(207.13, 2);
    expect(r.plan.plannedKg).toBeCloseTo(Math.min(207.13, r.biomass.biomassKg! * 0.03), 1);
  });

  it('plans 1 % every other day between 12.8 and 18.3 °C', async () => {
    await readings('P2', { water_temperature: 15, ph: 7.6, dissolved_oxygen: 8 });
    const d0 = today();
    const d1 = addDays(d0, 1);
    const [a, b] = [await rationOf('P2', d0), await rationOf('P2', d1)];
    const [fed, rest] = isFeedingDay({ day: d0, daysPerWeek: 3.5 }) ? [a, b] : [b, a];
    expect(fed.plan).toMatchObject({ status: 'ok', pctBodyWeightPerDay: 1, daysPerWeek: 3.5, feedingDay: true });
    expect(fed.plan.plannedKg).toBeCloseTo(fed.biomass.biomassKg! * 0.01, 1);
    expect(rest.plan).toMatchObject({ status: 'not_feeding_day', plannedKg: 0, feedingDay: false });
    expect(rest.proposal.action).toBe('withhold');
    expect(rest.proposal.reasons[0]!.code).toBe('not_feeding_day');
  });
});

describe('treatments and die-off', () => {
  it('skips feeding within 24 h of a treatment and cuts 25 % within 48 h', async () => {
    await readings('P4', { water_temperature: 30, ph: 7.7, dissolved_oxygen: 6 });
    const manager = await signedIn(t.app, demoEmail('manager'));
    const startsAt = new Date(Date.now() - 30 * 60 * MIN).toISOString();
    const endsAt = new Date(Date.now() - 28 * 60 * MIN).toISOString();
    const res = await manager.post(`/api/farms/${farmId}/units/${unitId('P4')}/treatments`).send({ product: 'salt', productName: 'Salt bath (demo)', startsAt, endsAt });
    expect(res.status).toBe(201);
    const cut = await rationOf('P4');
    expect(cut.proposal).toMatchObject({ action: 'cut', cutPct: 25 });
    expect(cut.proposal.reasons.find((r) => r.code === 'treatment_recent')!.text).toBe('Salt bath (demo) treatment ended 28 h ago; cut 25 % (within 48 h of a treatment)');
    await manager.post(`/api/farms/${farmId}/units/${unitId('P4')}/treatments`).send({ product: 'salt', productName: 'Salt bath (demo)', startsAt: new Date(Date.now() - 5 * 60 * MIN).toISOString(), endsAt: new Date(Date.now() - 4 * 60 * MIN).toISOString() });
    expect((await rationOf('P4')).proposal.action).toBe('withhold');
  });

  it('withholds for a suspected die-off seen today', async () => {
    await readings('P6', { water_temperature: 30, ph: 7.7, dissolved_oxygen: 6 });
    const hand = await signedIn(t.app, demoEmail('hand'));
    const res = await hand.post(`/api/farms/${farmId}/units/${unitId('P6')}/observations`).send({ kind: 'dead_fish', count: 12, detail: 'north bank' });
    expect(res.status).toBe(201);
    await t.drain({ queues: ['feed'] });
    const r = await rationOf('P6');
    expect(r.recommendation).toMatchObject({ action: 'withhold', recommendedKg: 0 });
    expect(r.recommendation!.reasons.find((x) => x.code === 'die_off')!.text).toMatch(/^Dead fish seen at \d\d:\d\d today \(12\): suspected die-off; withhold until the cause is known$/);
  });
});

describe('the feed rule is configurable per farm', () => {
  it('applies a farm’s override of a step size and records the change in the audit', async () => {
    const manager = await signedIn(t.app, demoEmail('manager'));
    const put = await manager.put(`/api/farms/${farmId}/feed-rule`).send({ overrides: { ammonia: { actCutPct: 60 } }, reason: 'trial of a deeper cut' });
    expect(put.status).toBe(200);
    expect(put.body.rule.ammonia).toMatchObject({ actCutPct: 60, watchCutPct: 25 });
    const r = await rationOf('R3');
    expect(r.proposal.reasons.find((x) => x.code === 'nh3_act')!.text).toMatch(/cut 60 %$/);
    const audit = (await t.ds.query(`SELECT after FROM audit_events WHERE action = 'feed_rule.updated' AND farm_id = $1`, [farmId])) as Array<{ after: Record<string, unknown> }>;
    expect(audit[0]!.after).toMatchObject({ feedRule: { ammonia: { actCutPct: 60 } }, reason: 'trial of a deeper cut' });
    await manager.put(`/api/farms/${farmId}/feed-rule`).send({ overrides: {} });
  });

  it('lets the planner change a feeding table row, audited, and refuses overlapping rows', async () => {
    const planner = await signedIn(t.app, demoEmail('planner'));
    const tables = (await planner.get(`/api/farms/${farmId}/feeding-tables`)).body.tables as Array<{ id: string; species: string; rows: Array<Record<string, unknown>> }>;
    const catfish = tables.find((x) => x.species === 'channel_catfish')!;
    const rows = catfish.rows.map((row, i) => (i === 3 ? { ...row, pctBodyWeightPerDay: 1.75 } : row));
    const ok = await planner.patch(`/api/farms/${farmId}/feeding-tables/${catfish.id}`).send({ rows, reason: 'warmer autumn' });
    expect(ok.status).toBe(200);
    expect(ok.body.rows[3].pctBodyWeightPerDay).toBe(1.75);
    const bad = await planner.patch(`/api/farms/${farmId}/feeding-tables/${catfish.id}`).send({ rows: [...rows, { ...rows[4]!, minTemperatureC: 25 }] });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/overlap/);
    const audit = (await t.ds.query(`SELECT before, after FROM audit_events WHERE action = 'feeding_table.updated' AND entity_id = $1`, [catfish.id])) as Array<{ before: { rows: Array<{ pctBodyWeightPerDay: number }> }; after: { rows: Array<{ pctBodyWeightPerDay: number }>; reason: string } }>;
    expect(audit).toHaveLength(1);
    expect(audit[0]!.before.rows[3]!.pctBodyWeightPerDay).toBe(1.5);
    expect(audit[0]!.after.rows[3]!.pctBodyWeightPerDay).toBe(1.75);
    const hand = await signedIn(t.app, demoEmail('hand'));
    expect((await hand.patch(`/api/farms/${farmId}/feeding-tables/${catfish.id}`).send({ reason: 'x' })).status).toBe(403);
  });
});
