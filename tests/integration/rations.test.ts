// The ration sheet: the seeded demo's recommendations, planner decisions (accept, override, bulk),
// what the hands fed, and a decision that survives a later result.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../setup/test-app';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { insertReadings, probeOf } from '../factories/readings';
import { signedIn } from '../factories/session';
import type { SeedResult } from '../../server/db/seed/seed';
import { addDays, localDay } from '../../shared/farm-time';
import { rationSheetSchema, recommendationSchema, type RationSheetDto } from '../../shared/schemas/feed.schema';

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

/** Steady probe readings on a unit for the last `hours` (every 15 min). */
async function steadyReadings(code: string, values: Record<string, number>, hours = 26) {
  const probeId = await probeOf(t.ds, seed.units[`harrow-bend:${code}`]!);
  const rows = [];
  for (let m = hours * 60; m >= 5; m -= 15) {
    const at = new Date(Date.now() - m * MIN);
    for (const [quantity, value] of Object.entries(values)) rows.push({ probeId, quantity, at, value });
  }
  await insertReadings(t.ds, rows);
}

async function sheetOf(agent: Awaited<ReturnType<typeof signedIn>>, day?: string): Promise<RationSheetDto> {
  const res = await agent.get(`/api/farms/${farmId}/rations${day ? `?day=${day}` : ''}`);
  expect(res.status).toBe(200);
  return rationSheetSchema.parse(res.body);
}
const rowOf = (sheet: RationSheetDto, code: string) => sheet.rows.find((r) => r.unit.code === code)!;

describe('the seeded demo', () => {
  it('has a recommendation for every stocked unit today once the seeded kit results are computed', async () => {
    // As `npm run db:seed` does: every seeded kit result goes to the worker; each result queues the feed job.
    for (const id of seed.waterTestIds) await t.queues.add('computeWaterTest', { farmId, waterTestId: id, version: 1 }, { jobId: `wt:${id}:1` });
    await t.drain({ queues: ['results', 'feed'], timeoutMs: 60_000 });
    const planner = await signedIn(t.app, demoEmail('planner'));
    const sheet = await sheetOf(planner);
    const stocked = await t.services.stock.stockedUnits(farmId);
    expect(stocked).toHaveLength(12);
    expect(sheet.rows.map((r) => r.unit.code).sort()).toEqual(stocked.map((u) => u.code).sort());
    for (const row of sheet.rows) {
      expect(row.status).toBe('pending');
      expect(row.recommendation?.day).toBe(today());
      expect(row.recommendation?.ruleVersion).toBe('gillwise-feed-rule/1');
    }
    expect(sheet.caution).toMatch(/never automatic/);
  });
});

describe('planner decisions on the ration sheet', () => {
  it('reflects an accepted and an overridden recommendation, each audited with before and after', async () => {
    await steadyReadings('P4', { water_temperature: 29.5, dissolved_oxygen: 6.5, ph: 7.6 });
    await steadyReadings('P6', { water_temperature: 29.5, dissolved_oxygen: 6.2, ph: 7.6 });
    const planner = await signedIn(t.app, demoEmail('planner'));
    const recompute = await planner.post(`/api/farms/${farmId}/rations/recompute`).send({});
    expect(recompute.status).toBe(200);
    expect(recompute.body.failed).toEqual([]);
    const before = await sheetOf(planner);
    const p4 = rowOf(before, 'P4').recommendation!;
    const p6 = rowOf(before, 'P6').recommendation!;
    // Tilapia > 100 g at ≥ 29 °C: the full table ration, 2.25 % BW (husbandry §2, from memory).
    expect(p4.plannedPctBw).toBeCloseTo(2.25, 6);
    expect(p4.plannedKg).toBeCloseTo(p4.biomassKg * 0.0225, 0);

    const accepted = await planner.post(`/api/farms/${farmId}/recommendations/${p4.id}/accept`).send({});
    expect(accepted.status).toBe(200);
    recommendationSchema.parse(accepted.body);
    expect(accepted.body).toMatchObject({ status: 'accepted', approvedKg: p4.recommendedKg });

    const noNote = await planner.post(`/api/farms/${farmId}/recommendations/${p6.id}/override`).send({ approvedKg: 120 });
    expect(noNote.status).toBe(400);
    expect(noNote.body.error.details.fieldErrors.note).toBeTruthy();
    const overridden = await planner.post(`/api/farms/${farmId}/recommendations/${p6.id}/override`).send({ approvedKg: 120, note: 'fish slow at the evening feed; holding back' });
    expect(overridden.status).toBe(200);
    expect(overridden.body).toMatchObject({ status: 'overridden', approvedKg: 120, overrideNote: 'fish slow at the evening feed; holding back' });

    const after = await sheetOf(planner);
    expect(rowOf(after, 'P4')).toMatchObject({ status: 'accepted', approvedKg: p4.recommendedKg, toFeedKg: p4.recommendedKg });
    expect(rowOf(after, 'P6')).toMatchObject({ status: 'overridden', approvedKg: 120, toFeedKg: 120 });
    expect(rowOf(after, 'P1').toFeedKg).toBeNull();

    const audit = (await t.ds.query(`SELECT action, actor_id, before, after FROM audit_events WHERE entity = 'feed_recommendation' AND entity_id = $1`, [p6.id])) as Array<{
      action: string;
      actor_id: string;
      before: Record<string, unknown>;
      after: Record<string, unknown>;
    }>;
    expect(audit).toHaveLength(1);
    expect(audit[0]!.action).toBe('feed_recommendation.overridden');
    expect(audit[0]!.before).toMatchObject({ status: 'pending', approvedKg: null });
    expect(audit[0]!.after).toMatchObject({ status: 'overridden', approvedKg: 120, overrideNote: 'fish slow at the evening feed; holding back' });
    const planner_id = (await t.ds.query(`SELECT id FROM users WHERE email = $1`, [demoEmail('planner')])) as Array<{ id: string }>;
    expect(audit[0]!.actor_id).toBe(planner_id[0]!.id);
  });

  it('accepts every pending recommendation of a day at once and leaves decided ones alone', async () => {
    const manager = await signedIn(t.app, demoEmail('manager'));
    const day = today();
    const before = await sheetOf(manager, day);
    const pending = before.rows.filter((r) => r.status === 'pending').length;
    const res = await manager.post(`/api/farms/${farmId}/rations/accept`).send({ day });
    expect(res.status).toBe(200);
    expect(res.body.accepted).toHaveLength(pending);
    expect(res.body.skipped.map((s: { status: string }) => s.status)).not.toContain('pending');
    const after = await sheetOf(manager, day);
    expect(after.totals.pending).toBe(0);
    expect(rowOf(after, 'P6')).toMatchObject({ status: 'overridden', approvedKg: 120 });
  });

  it('does not let a hand decide', async () => {
    const hand = await signedIn(t.app, demoEmail('hand'));
    const sheet = await sheetOf(hand);
    const res = await hand.post(`/api/farms/${farmId}/recommendations/${rowOf(sheet, 'P1').recommendation!.id}/accept`).send({});
    expect(res.status).toBe(403);
  });
});

describe('what the hands fed', () => {
  it('shows the feeding on the sheet, and asks for a reason when it is more than 10 % off the approved ration', async () => {
    const hand = await signedIn(t.app, demoEmail('hand'));
    const unitId = seed.units['harrow-bend:P6']!;
    const day = today();
    const off = await hand.post(`/api/farms/${farmId}/units/${unitId}/feedings`).send({ day, fedKg: 90, withheld: false });
    expect(off.status).toBe(400);
    expect(off.body.error.message).toMatch(/approved 120 kg by more than 10 %/);
    const close = await hand.post(`/api/farms/${farmId}/units/${unitId}/feedings`).send({ day, fedKg: 115, withheld: false, response: 'slow' });
    expect(close.status).toBe(201);
    const corrected = await hand.post(`/api/farms/${farmId}/units/${unitId}/feedings`).send({ day, fedKg: 90, withheld: false, response: 'slow', reason: 'stopped when they quit taking it' });
    expect(corrected.status).toBe(200);
    expect(corrected.body.replaced).toBe(true);
    const sheet = await sheetOf(hand, day);
    expect(rowOf(sheet, 'P6')).toMatchObject({ fedKg: 90, withheld: false, feeding: { reason: 'stopped when they quit taking it', response: 'slow' } });
    const audit = (await t.ds.query(`SELECT action FROM audit_events WHERE entity = 'feeding_record' AND entity_id = $1 ORDER BY at`, [corrected.body.feeding.id])) as Array<{ action: string }>;
    expect(audit.map((a) => a.action)).toEqual(['feeding.recorded', 'feeding.corrected']);
  });

  it('requires a reason and 0 kg when feed was withheld, and refuses a day that has not come', async () => {
    const hand = await signedIn(t.app, demoEmail('hand'));
    const unitId = seed.units['harrow-bend:P1']!;
    const noReason = await hand.post(`/api/farms/${farmId}/units/${unitId}/feedings`).send({ day: today(), fedKg: 0, withheld: true });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.details.fieldErrors.reason).toBeTruthy();
    const withFeed = await hand.post(`/api/farms/${farmId}/units/${unitId}/feedings`).send({ day: today(), fedKg: 5, withheld: true, reason: 'DO low' });
    expect(withFeed.body.error.details.fieldErrors.fedKg).toBeTruthy();
    const future = await hand.post(`/api/farms/${farmId}/units/${unitId}/feedings`).send({ day: addDays(today(), 2), fedKg: 0, withheld: true, reason: 'x' });
    expect(future.status).toBe(400);
  });
});

describe('a decision and a later result', () => {
  it('keeps an accepted decision when a new result comes in, and keeps the new proposal beside it', async () => {
    await steadyReadings('R4', { water_temperature: 14, dissolved_oxygen: 8.5, ph: 8.2, flow: 2200 });
    const planner = await signedIn(t.app, demoEmail('planner'));
    await planner.post(`/api/farms/${farmId}/rations/recompute`).send({});
    const r4 = rowOf(await sheetOf(planner), 'R4').recommendation!;
    // R4 was accepted with the whole day above; accepting again is allowed and audited.
    const accepted = await planner.post(`/api/farms/${farmId}/recommendations/${r4.id}/accept`).send({});
    expect(accepted.body.status).toBe('accepted');
    const approved = accepted.body.approvedKg as number;
    // A high TAN result on R4: NH3 far over the trout act level (EIFAC 0.025 mg/L NH3, from memory).
    const hand = await signedIn(t.app, demoEmail('hand'));
    const res = await hand.post(`/api/farms/${farmId}/units/${seed.units['harrow-bend:R4']!}/tests`).send({ clientId: randomUUID(), analyte: 'total_ammonia', method: 'salicylate', basis: 'tan-n', value: 2.5 });
    expect(res.status).toBe(201);
    await t.drain({ queues: ['results', 'feed'] });
    const rec = await planner.get(`/api/farms/${farmId}/recommendations/${r4.id}`);
    expect(rec.body).toMatchObject({ status: 'accepted', approvedKg: approved });
    expect(rec.body.laterProposal).toMatchObject({ action: 'cut', cutPct: 50 });
    expect(rec.body.laterProposal.reasons.map((r: { code: string }) => r.code)).toContain('nh3_act');
    // Accepting now takes the newer proposal.
    const again = await planner.post(`/api/farms/${farmId}/recommendations/${r4.id}/accept`).send({});
    expect(again.body).toMatchObject({ status: 'accepted', action: 'cut', cutPct: 50, laterProposal: null });
    expect(again.body.approvedKg).toBeCloseTo(approved / 2, 0);
  });
});
