// The demo as `npm run db:seed` builds it, with simulated probe history (three days here, to keep the
// test short): after the seeded kit results are worked out, the worker has a recommendation for every
// stocked unit, and raceway R3 — its flow cut six hours ago — is cut or withheld, naming flow and free ammonia.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../setup/test-app';
import { demoEmail } from '../factories/demo';
import { signedIn } from '../factories/session';
import { seedDemo, type SeedResult } from '../../server/db/seed/seed';
import { storeSimulatedHistory } from '../../server/db/seed/history';
import { rationSheetSchema } from '../../shared/schemas/feed.schema';

let t: TestApp;
let seed: SeedResult;
let farmId: string;

beforeAll(async () => {
  t = await startTestApp({ worker: true });
  seed = await seedDemo(t.ds, { brokerUrl: 'mqtt://127.0.0.1:0', history: (args) => storeSimulatedHistory({ ...args, days: 3 }) });
  farmId = seed.farms['harrow-bend']!;
  for (const id of seed.waterTestIds) await t.queues.add('computeWaterTest', { farmId, waterTestId: id, version: 1 }, { jobId: `wt:${id}:1` });
  await t.drain({ queues: ['results', 'feed'], timeoutMs: 90_000 });
}, 180_000);
afterAll(() => t.close());

describe('the seeded demo with its probe history', () => {
  it('has a planned ration and a recommendation for every stocked unit of Harrow Bend today', async () => {
    const planner = await signedIn(t.app, demoEmail('planner'));
    const sheet = rationSheetSchema.parse((await planner.get(`/api/farms/${farmId}/rations`)).body);
    expect(sheet.rows).toHaveLength(12);
    for (const row of sheet.rows) {
      expect(row.recommendation, row.unit.code).not.toBeNull();
      expect(row.recommendation!.reasons.map((r) => r.code), row.unit.code).not.toContain('no_plan');
    }
  });

  it('cuts or withholds raceway R3 with reasons naming the reduced flow and the free ammonia', async () => {
    const planner = await signedIn(t.app, demoEmail('planner'));
    const sheet = rationSheetSchema.parse((await planner.get(`/api/farms/${farmId}/rations`)).body);
    const r3 = sheet.rows.find((r) => r.unit.code === 'R3')!;
    // The simulated cut also starves the raceway of oxygen: below the trout critical DO the rule withholds.
    expect(['cut', 'withhold']).toContain(r3.action);
    expect(r3.recommendedKg!).toBeLessThan(r3.plannedKg!);
    const codes = r3.reasons.map((r) => r.code);
    expect(codes).toContain('flow_reduced');
    expect(codes.some((c) => c.startsWith('nh3_'))).toBe(true);
    if (r3.action === 'withhold') expect(codes.some((c) => c.startsWith('do_'))).toBe(true);
    expect(r3.reasons.find((r) => r.code === 'flow_reduced')!.text).toMatch(/of the 2,600 L\/min design/);
    // The neighbouring raceway on full flow has no flow reason.
    expect(sheet.rows.find((r) => r.unit.code === 'R1')!.reasons.map((r) => r.code)).not.toContain('flow_reduced');
  });

  it('cuts P2 on its Nessler result and says the result may read high after the formalin bath', async () => {
    const planner = await signedIn(t.app, demoEmail('planner'));
    const sheet = rationSheetSchema.parse((await planner.get(`/api/farms/${farmId}/rations`)).body);
    const p2 = sheet.rows.find((r) => r.unit.code === 'P2')!;
    expect(p2.reasons.find((r) => r.code === 'nh3_result_flagged')?.text).toMatch(/^About the latest result: May read high — re-test with a salicylate kit/);
  });
});
