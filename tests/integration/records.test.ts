import { randomUUID } from 'node:crypto';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { recordsResponseSchema } from '../../shared/schemas/records.schema';
import { FeedingRecord, StockEvent, Treatment } from '../../server/db/entities';
import type { SeedResult } from '../../server/db/seed/seed';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { signedIn } from '../factories/session';
import { startTestApp, type TestApp } from '../setup/test-app';

let t: TestApp;
let seed: SeedResult;
let farmId: string;

beforeAll(async () => {
  t = await startTestApp({ worker: true });
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
}, 120_000);
afterAll(() => t.close());

const at = (iso: string) => new Date(iso);

describe('inspection records', () => {
  it('gathers the water-quality log with computed NH3 and provenance, treatments with withdrawal ends, mortalities and feed given or withheld', async () => {
    const unitId = seed.units['harrow-bend:P2']!;
    const hand = await signedIn(t.app, demoEmail('hand'));
    const kit = await hand.post(`/api/farms/${farmId}/units/${unitId}/tests`).send({
      clientId: randomUUID(),
      analyte: 'total_ammonia',
      method: 'salicylate',
      basis: 'tan-n',
      value: 1.0,
      sampledAt: '2026-07-02T13:00:00Z',
      handheldPh: 8.2,
      handheldTemperatureC: 24,
    });
    expect(kit.status).toBe(201);
    const nitrite = await hand
      .post(`/api/farms/${farmId}/units/${unitId}/tests`)
      .send({ clientId: randomUUID(), analyte: 'nitrite', method: 'colorimetric', basis: 'no2-n', value: 0.2, sampledAt: '2026-07-03T13:00:00Z' });
    expect(nitrite.status).toBe(201);
    await t.drain({ queues: ['results'] });

    const treatments = t.ds.getRepository(Treatment);
    // Started before the period, its withdrawal runs into it: listed. Finished well before: not listed.
    await treatments.save(treatments.create({ farmId, unitId, product: 'formalin', dose: 25, doseUnit: 'mg/L', startsAt: at('2026-06-29T14:00:00Z'), withdrawalDays: 4, withdrawalEndsAt: at('2026-07-03T14:00:00Z'), note: 'gill flukes' }));
    await treatments.save(treatments.create({ farmId, unitId, product: 'salt', startsAt: at('2026-06-01T14:00:00Z'), endsAt: at('2026-06-02T14:00:00Z'), withdrawalEndsAt: at('2026-06-05T14:00:00Z') }));
    const stock = t.ds.getRepository(StockEvent);
    await stock.save(stock.create({ farmId, unitId, kind: 'mortality', at: at('2026-07-04T12:30:00Z'), count: 14, note: 'after low DO at dawn' }));
    const feeding = t.ds.getRepository(FeedingRecord);
    await feeding.save(feeding.create({ farmId, unitId, day: '2026-07-02', fedKg: 120.5, withheld: false, reason: null, response: 'normal', fedAt: at('2026-07-02T14:00:00Z') }));
    await feeding.save(
      feeding.create({ farmId, unitId, day: '2026-07-05', fedKg: 0, withheld: true, reason: '-100 % ration: free ammonia above 0.05 mg/L', response: null, fedAt: at('2026-07-05T14:00:00Z') }),
    );

    const planner = await signedIn(t.app, demoEmail('planner'));
    const res = await planner.get(`/api/farms/${farmId}/records`).query({ from: '2026-07-01', to: '2026-07-07', unitId });
    expect(res.status).toBe(200);
    const body = recordsResponseSchema.parse(res.body);
    expect(body.period).toEqual({ from: '2026-07-01T05:00:00.000Z', to: '2026-07-08T05:00:00.000Z', fromLocal: '2026-07-01', toLocal: '2026-07-07' });
    const [p2] = body.waterQuality;
    expect(p2!.unit.code).toBe('P2');
    expect(p2!.tests.map((x) => x.analyte)).toEqual(['total_ammonia', 'nitrite']);
    const ammonia = p2!.tests[0]!;
    expect(ammonia.sampledAtLocal).toBe('2026-07-02 08:00');
    expect(ammonia.enteredBy).toBe('Marisol Ortega');
    expect(ammonia.freeAmmonia).toMatchObject({ status: 'ok', ph: { value: 8.2, source: 'handheld' }, temperatureC: { value: 24, source: 'handheld' }, salinityPpt: { source: 'unit_default' } });
    // Emerson et al. 1975 via UF/IFAS FA16 table: 24 °C, pH 8.2 → 0.0772 of TAN (published)
    expect(ammonia.freeAmmonia!.nh3NMgL).toBeCloseTo(0.0772, 4);
    expect(p2!.maxNh3MgL).toBe(ammonia.freeAmmonia!.nh3MgL);
    expect(p2!.provenance).toMatchObject({ computed: 1, notComputed: 0, ph: { handheld: 1, probe: 0 }, temperature: { handheld: 1 }, salinity: { unit_default: 1 } });
    expect(p2!.tests[1]!.freeAmmonia).toBeNull();

    expect(body.treatments).toHaveLength(1);
    expect(body.treatments[0]).toMatchObject({ product: 'formalin', withdrawalDays: 4, withdrawalEndsAt: '2026-07-03T14:00:00.000Z', withdrawalEndsAtLocal: '2026-07-03 09:00', note: 'gill flukes' });
    expect(body.mortalities).toEqual([expect.objectContaining({ count: 14, atLocal: '2026-07-04 07:30', note: 'after low DO at dawn' })]);
    expect(body.feeding.map((f) => [f.day, f.fedKg, f.withheld, f.reason])).toEqual([
      ['2026-07-02', 120.5, false, null],
      ['2026-07-05', 0, true, '-100 % ration: free ammonia above 0.05 mg/L'],
    ]);
    expect(body.totals).toEqual({ tests: 2, treatments: 1, mortalityCount: 14, fedKg: 120.5, withheldRecords: 1 });

    const csv = await planner.get(`/api/farms/${farmId}/records.csv`).query({ section: 'feeding', from: '2026-07-01', to: '2026-07-07', unitId });
    expect(csv.status).toBe(200);
    expect(csv.headers['content-disposition']).toBe('attachment; filename="harrow-bend_records_feeding_2026-07-01_2026-07-07.csv"');
    const rows = parse(csv.text, { bom: true }) as string[][];
    const header = rows[0]!;
    expect(header).toContain('fed_at_local (America/Chicago)');
    expect(rows[2]![header.indexOf('reason')]).toBe("'-100 % ration: free ammonia above 0.05 mg/L");
    expect(rows[2]![header.indexOf('withheld')]).toBe('true');
    expect(rows[1]![header.indexOf('fed_kg')]).toBe('120.5');

    const wq = parse((await planner.get(`/api/farms/${farmId}/records.csv`).query({ section: 'water_quality', from: '2026-07-01', to: '2026-07-07', unitId })).text, { bom: true }) as string[][];
    expect(wq[1]![wq[0]!.indexOf('ph_source')]).toBe('handheld');
    expect(wq[1]![wq[0]!.indexOf('nh3_status')]).toBe('ok');
  });

  it('refuses a period longer than a year and an unknown section', async () => {
    const manager = await signedIn(t.app, demoEmail('manager'));
    const long = await manager.get(`/api/farms/${farmId}/records`).query({ from: '2025-01-01', to: '2026-06-30' });
    expect(long.status).toBe(400);
    expect(long.body.error.code).toBe('validation_failed');
    const section = await manager.get(`/api/farms/${farmId}/records.csv`).query({ section: 'everything' });
    expect(section.status).toBe(400);
  });
});
