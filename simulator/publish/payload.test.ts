import { describe, expect, it } from 'vitest';
import { probeReadingsPayloadSchema, type ProbeReadingsPayload, type Quantity } from '../../shared/schemas/mqtt.schema';
import { toCanonicalUnit, isPhysicallyPossible } from '../../shared/units';
import { DAY_MS, type ProbeSpec, farmWeatherFor, generateHistory, probeTelemetry } from '../models';
import { buildReadingsPayload } from './payload';
import { SampleQueue } from './sample-queue';

const ALL: Quantity[] = [
  'ph',
  'water_temperature',
  'salinity',
  'conductivity',
  'specific_conductance',
  'dissolved_oxygen',
  'flow',
  'water_level',
  'aerator_running',
  'pump_running',
];
const from = Date.parse('2025-07-01T05:00:00Z');
const weather = farmWeatherFor({ seed: 9, farmSlug: 'harrow-bend', site: { timeZone: 'America/Chicago' } });

const probes: ProbeSpec[] = [
  { probeKey: 'pond-1', unitKind: 'pond', waterType: 'fresh', salinityPpt: 0.2, quantities: ALL },
  {
    probeKey: 'pond-2',
    unitKind: 'pond',
    waterType: 'fresh',
    salinityPpt: 0.2,
    quantities: ALL,
    temperatureUnit: 'F',
    scenario: 'spike:probability=0.2',
  },
  { probeKey: 'pond-3', unitKind: 'pond', waterType: 'fresh', salinityPpt: 0.2, quantities: ALL, scenario: 'drift:phPerDay=0.5' },
  {
    probeKey: 'shrimp-1',
    unitKind: 'pond',
    waterType: 'brackish',
    salinityPpt: 18,
    quantities: ALL,
    scenario: 'flatline:quantity=salinity',
  },
  { probeKey: 'rw-1', unitKind: 'raceway', waterType: 'fresh', salinityPpt: 0.1, quantities: ALL, scenario: 'flow-cut' },
  { probeKey: 'rw-2', unitKind: 'raceway', waterType: 'fresh', salinityPpt: 0.1, quantities: ALL, scenario: 'spike:probability=0.3' },
  { probeKey: 'tank-1', unitKind: 'tank', waterType: 'marine', salinityPpt: 34, quantities: ALL, scenario: 'cycling' },
];

describe('generated payloads', () => {
  for (const probe of probes) {
    it(`every payload for ${probe.probeKey} (${probe.unitKind}, ${probe.scenario ?? 'steady'}) passes probeReadingsPayloadSchema`, async () => {
      const samples = generateHistory({ probe, from, to: from + 2 * DAY_MS, stepSeconds: 300, seed: 9, weather });
      expect(samples.length).toBe(576);
      const payloads: ProbeReadingsPayload[] = [];
      const queue = new SampleQueue({
        makePayload: (chunk) => buildReadingsPayload(chunk, probeTelemetry(9, probe.probeKey, from), from + 2 * DAY_MS),
        publish: async (payload) => {
          payloads.push(JSON.parse(JSON.stringify(payload)) as ProbeReadingsPayload);
        },
      });
      queue.push(...samples);
      await queue.flush();
      expect(payloads.length).toBe(3);
      for (const payload of payloads) {
        const parsed = probeReadingsPayloadSchema.safeParse(payload);
        expect(parsed.success, parsed.success ? '' : parsed.error.message).toBe(true);
        for (const s of payload.samples) {
          for (const v of s.values) {
            expect(isPhysicallyPossible({ quantity: v.quantity, value: toCanonicalUnit(v) }), `${v.quantity} ${v.value} ${v.unit}`).toBe(
              true,
            );
          }
        }
      }
    });
  }

  it('leaves out quantities a unit cannot have (flow in a pond, an aerator on a raceway)', () => {
    const [pondSample] = generateHistory({ probe: probes[0] as ProbeSpec, from, to: from + 1, stepSeconds: 60, seed: 1 });
    const [racewaySample] = generateHistory({ probe: probes[4] as ProbeSpec, from, to: from + 1, stepSeconds: 60, seed: 1 });
    expect(pondSample?.values.map((v) => v.quantity)).not.toContain('flow');
    expect(racewaySample?.values.map((v) => v.quantity)).not.toContain('aerator_running');
    expect(racewaySample?.values.map((v) => v.quantity)).toContain('flow');
  });

  it('battery drains slowly and RSSI stays in a radio-like range', () => {
    const a = probeTelemetry(1, 'pond-1', from);
    const b = probeTelemetry(1, 'pond-1', from + DAY_MS);
    expect(a.batteryPct).toBeGreaterThanOrEqual(15);
    expect(a.batteryPct).toBeLessThanOrEqual(100);
    const drain = a.batteryPct - b.batteryPct;
    expect((drain > 0.25 && drain < 0.45) || drain < -50).toBe(true); // 0.35 %/day, or a fresh pack
    for (let i = 0; i < 100; i += 1) {
      const { rssiDbm } = probeTelemetry(1, 'pond-1', from + i * 60_000);
      expect(rssiDbm).toBeGreaterThanOrEqual(-95);
      expect(rssiDbm).toBeLessThanOrEqual(-50);
    }
  });
});
