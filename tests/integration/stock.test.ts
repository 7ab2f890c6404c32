// Stock events, biomass with its uncertainty, FCR between weighings, and the withdrawal refusal.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../setup/test-app';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { signedIn } from '../factories/session';
import type { SeedResult } from '../../server/db/seed/seed';
import { CultureUnit } from '../../server/db/entities';
import { localDay } from '../../shared/farm-time';
import { createStockEventResponseSchema, unitStockSchema } from '../../shared/schemas/stock.schema';

let t: TestApp;
let seed: SeedResult;
let farmId: string;
const DAY = 86_400_000;
const TZ = 'America/Chicago';

beforeAll(async () => {
  t = await startTestApp();
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
});
afterAll(() => t.close());

const unitId = (code: string) => seed.units[`harrow-bend:${code}`]!;

/** An empty invented tank of this farm for a test that needs a stock history of its own. */
async function emptyTank(code: string): Promise<string> {
  const repo = t.ds.getRepository(CultureUnit);
  const unit = await repo.save(
    repo.create({ farmId, code, name: `Test tank ${code}`, kind: 'tank', areaM2: 20, volumeM3: 25, waterType: 'fresh', defaultSalinityPpt: 0, species: 'channel_catfish', lifeStage: 'fingerling', state: 'active', qrLabelId: `test-${code}-${Date.now()}`, walkOrder: 99, feedProteinFraction: 0.32 }),
  );
  return unit.id;
}

describe('stock events', () => {
  it('records a transfer out together with the matching transfer in on the receiving unit', async () => {
    const planner = await signedIn(t.app, demoEmail('planner'));
    const before = await planner.get(`/api/farms/${farmId}/units/${unitId('P6')}/stock`);
    const res = await planner.post(`/api/farms/${farmId}/units/${unitId('P4')}/stock-events`).send({ kind: 'transfer_out', count: 500, relatedUnitId: unitId('P6'), note: 'thinning P4' });
    expect(res.status).toBe(201);
    const body = createStockEventResponseSchema.parse(res.body);
    expect(body.event).toMatchObject({ kind: 'transfer_out', count: 500, unitId: unitId('P4'), relatedUnitId: unitId('P6') });
    expect(body.related).toMatchObject({ kind: 'transfer_in', count: 500, unitId: unitId('P6'), relatedUnitId: unitId('P4'), meanWeightG: body.event.meanWeightG });
    expect(body.event.meanWeightG).toBeGreaterThan(0);
    const after = await planner.get(`/api/farms/${farmId}/units/${unitId('P6')}/stock`);
    expect(after.body.current.count).toBe(before.body.current.count + 500);
  });

  it('refuses a transfer to a unit of another farm, beside the field', async () => {
    const planner = await signedIn(t.app, demoEmail('planner'));
    const res = await planner.post(`/api/farms/${farmId}/units/${unitId('P4')}/stock-events`).send({ kind: 'transfer_out', count: 10, relatedUnitId: seed.units['cedar-flats:T1'] });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fieldErrors.relatedUnitId).toBeTruthy();
  });

  it('refuses negative counts, a transfer in entered directly, and removing more fish than are on record', async () => {
    const planner = await signedIn(t.app, demoEmail('planner'));
    const negative = await planner.post(`/api/farms/${farmId}/units/${unitId('P1')}/stock-events`).send({ kind: 'mortality', count: -3 });
    expect(negative.status).toBe(400);
    expect(negative.body.error.details.fieldErrors.count).toEqual(['A count cannot be negative']);
    const direct = await planner.post(`/api/farms/${farmId}/units/${unitId('P1')}/stock-events`).send({ kind: 'transfer_in', count: 3 });
    expect(direct.status).toBe(400);
    expect(direct.body.error.details.fieldErrors.kind[0]).toMatch(/Record a transfer on the unit the fish leave/);
    const tooMany = await planner.post(`/api/farms/${farmId}/units/${unitId('P1')}/stock-events`).send({ kind: 'harvest', count: 10_000_000 });
    expect(tooMany.status).toBe(409);
    expect(tooMany.body.error.code).toBe('not_enough_fish');
  });

  it('lets a hand record a mortality and nothing else', async () => {
    const hand = await signedIn(t.app, demoEmail('hand'));
    const dead = await hand.post(`/api/farms/${farmId}/units/${unitId('P2')}/stock-events`).send({ kind: 'mortality', count: 7, note: 'morning pick-up' });
    expect(dead.status).toBe(201);
    const harvest = await hand.post(`/api/farms/${farmId}/units/${unitId('P2')}/stock-events`).send({ kind: 'harvest', count: 100 });
    expect(harvest.status).toBe(403);
    const audit = (await t.ds.query(`SELECT action, after FROM audit_events WHERE entity = 'stock_event' AND entity_id = $1`, [dead.body.event.id])) as Array<{ action: string; after: Record<string, unknown> }>;
    expect(audit[0]).toMatchObject({ action: 'stock_event.recorded', after: { kind: 'mortality', count: 7 } });
  });
});

describe('harvest during a withdrawal period', () => {
  it('refuses a harvest and a transfer out with a clear 409 while the unit is in withdrawal, and still takes a mortality', async () => {
    const manager = await signedIn(t.app, demoEmail('manager'));
    const treated = await manager
      .post(`/api/farms/${farmId}/units/${unitId('P3')}/treatments`)
      .send({ product: 'other', productName: 'Medicated feed (demo)', startsAt: new Date(Date.now() - 2 * DAY).toISOString(), withdrawalDays: 21 });
    expect(treated.status).toBe(201);
    const harvest = await manager.post(`/api/farms/${farmId}/units/${unitId('P3')}/stock-events`).send({ kind: 'harvest', count: 1000, totalWeightKg: 400 });
    expect(harvest.status).toBe(409);
    expect(harvest.body.error.code).toBe('in_withdrawal');
    const endDay = localDay(new Date(Date.now() + 19 * DAY), TZ);
    expect(harvest.body.error.message).toBe(`Harvest refused: P3 is in a withdrawal period until ${endDay}. Withdrawal after Medicated feed (demo) from ${new Date(Date.now() - 2 * DAY).toISOString().slice(0, 10)}: 21 days`);
    expect(harvest.body.error.details.withdrawal).toMatchObject({ inWithdrawal: true, treatmentId: treated.body.id ?? treated.body.treatment?.id });
    const transfer = await manager.post(`/api/farms/${farmId}/units/${unitId('P3')}/stock-events`).send({ kind: 'transfer_out', count: 10, relatedUnitId: unitId('P1') });
    expect(transfer.status).toBe(409);
    expect(transfer.body.error.message).toMatch(/^Transfer refused: P3 is in a withdrawal period/);
    const dead = await manager.post(`/api/farms/${farmId}/units/${unitId('P3')}/stock-events`).send({ kind: 'mortality', count: 2 });
    expect(dead.status).toBe(201);
  });
});

describe('biomass and FCR', () => {
  it('reports biomass from the latest weighing with its age, standard error, 95 % interval and density', async () => {
    const id = await emptyTank('TB1');
    const planner = await signedIn(t.app, demoEmail('planner'));
    const post = (body: Record<string, unknown>) => planner.post(`/api/farms/${farmId}/units/${id}/stock-events`).send(body);
    expect((await post({ kind: 'stocking', count: 2000, meanWeightG: 50, at: new Date(Date.now() - 30 * DAY).toISOString() })).status).toBe(201);
    expect((await post({ kind: 'sample_weighing', sampleSize: 40, totalWeightKg: 3.2, sampleSdG: 12, at: new Date(Date.now() - 10 * DAY).toISOString() })).status).toBe(201);
    expect((await post({ kind: 'mortality', count: 20, at: new Date(Date.now() - 5 * DAY).toISOString() })).status).toBe(201);
    const res = await planner.get(`/api/farms/${farmId}/units/${id}/stock`);
    expect(res.status).toBe(200);
    const stock = unitStockSchema.parse(res.body);
    // 3.2 kg / 40 fish = 80 g; 1,980 fish → 158.4 kg; SE 12/√40 = 1.897 g → 3.757 kg; t(39) ≈ 2.023 (computed).
    expect(stock.current).toMatchObject({ count: 1980, meanWeightG: 80, sampleSize: 40, stocked: true });
    expect(stock.current.biomassKg).toBeCloseTo(158.4, 2);
    expect(stock.current.biomassSeKg).toBeCloseTo((1980 * 12) / Math.sqrt(40) / 1000, 3);
    expect(stock.current.biomass95!.lowKg).toBeCloseTo(158.4 - 2.0227 * 3.7566, 1);
    expect(stock.current.estimateAgeDays).toBeCloseTo(10, 1);
    expect(stock.current.densityKgPerM3).toBeCloseTo(158.4 / 25, 3);
    expect(stock.current.weightFrom?.kind).toBe('sample_weighing');
    expect(stock.history.map((h) => [h.event.kind, h.after.count])).toEqual([['stocking', 2000], ['sample_weighing', 2000], ['mortality', 1980]]);
    expect(stock.notes.join(' ')).toMatch(/no growth is added between weighings/);
  });

  it('computes the FCR of a known history: known feed and weights give a known FCR and its uncertainty', async () => {
    const id = await emptyTank('TB2');
    const planner = await signedIn(t.app, demoEmail('planner'));
    const hand = await signedIn(t.app, demoEmail('hand'));
    const at = (daysAgo: number) => new Date(Date.now() - daysAgo * DAY).toISOString();
    const post = (body: Record<string, unknown>) => planner.post(`/api/farms/${farmId}/units/${id}/stock-events`).send(body);
    // Invented history, hand-computed: 1,000 fish; weighed 100 g (SD 10, n 50) 40 days ago; 50 die 30 days ago;
    // weighed 150 g (SD 15, n 50) 20 days ago; fed 4 kg a day on the 20 days between the weighings.
    expect((await post({ kind: 'stocking', count: 1000, meanWeightG: 100, at: at(41) })).status).toBe(201);
    expect((await post({ kind: 'sample_weighing', sampleSize: 50, meanWeightG: 100, sampleSdG: 10, at: at(40) })).status).toBe(201);
    expect((await post({ kind: 'mortality', count: 50, at: at(30) })).status).toBe(201);
    expect((await post({ kind: 'sample_weighing', sampleSize: 50, meanWeightG: 150, sampleSdG: 15, at: at(20) })).status).toBe(201);
    for (let d = 39; d >= 20; d--) {
      const fedAt = new Date(Date.now() - d * DAY - 6 * 3_600_000);
      const res = await hand.post(`/api/farms/${farmId}/units/${id}/feedings`).send({ day: localDay(fedAt, TZ), fedKg: 4, withheld: false, fedAt: fedAt.toISOString() });
      expect(res.status).toBe(201);
    }
    const stock = unitStockSchema.parse((await planner.get(`/api/farms/${farmId}/units/${id}/stock`)).body);
    expect(stock.fcr.periods).toHaveLength(1);
    const p = stock.fcr.periods[0]!;
    // Start 1,000 × 100 g = 100 kg; end 950 × 150 g = 142.5 kg; 50 dead at the interpolated 125 g = 6.25 kg;
    // gain 48.75 kg; FCR = 80 / 48.75 = 1.641; SE(gain) = √(1.4142² + 2.0153²) = 2.462 kg; SE(FCR) = 0.0829 (computed).
    expect(p.feedKg).toBe(80);
    expect(p.feedings).toBe(20);
    expect(p.startBiomassKg).toBeCloseTo(100, 2);
    expect(p.endBiomassKg).toBeCloseTo(142.5, 2);
    expect(p.removedKg).toBeCloseTo(6.25, 2);
    expect(p.gainKg).toBeCloseTo(48.75, 2);
    expect(p.fcr).toBeCloseTo(1.641, 3);
    expect(p.gainSeKg).toBeCloseTo(2.462, 3);
    expect(p.fcrSe).toBeCloseTo(0.0829, 4);
    expect(p.fcr95!.low).toBeCloseTo(80 / (48.75 + 1.96 * 2.462), 2);
    expect(p.fcr95!.high).toBeCloseTo(80 / (48.75 - 1.96 * 2.462), 2);
    expect(stock.fcr.method).toMatch(/delta method/);
    const farm = await planner.get(`/api/farms/${farmId}/stock`);
    const row = farm.body.units.find((u: { unit: { id: string } }) => u.unit.id === id);
    expect(row.latestFcr.fcr).toBeCloseTo(1.641, 3);
  });
});
