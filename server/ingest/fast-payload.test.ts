import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { probeReadingsPayloadSchema, quantityUnits, readingSampleSchema } from '../../shared/schemas/mqtt.schema';
import { fastPayload, ISO_OFFSET_DATETIME } from './fast-payload';

const quantityNames = Object.keys(quantityUnits) as Array<keyof typeof quantityUnits>;
const value = fc.oneof(
  fc.constantFrom(...quantityNames).chain((q) => fc.record({ quantity: fc.constant(q), value: fc.double({ noNaN: true, min: -1e6, max: 1e6 }), unit: fc.constantFrom(...quantityUnits[q]) })),
  // near misses: wrong unit, unknown quantity, strings for numbers, extra keys
  fc.record({ quantity: fc.constantFrom('ph', 'nitrate', '__proto__', 'toString'), value: fc.oneof(fc.double(), fc.string(), fc.constant(null)), unit: fc.constantFrom('pH', 'C', '', 'x'.repeat(17), 'mg/L') }),
  fc.record({ quantity: fc.constant('ph'), value: fc.constant(7), unit: fc.constant('pH'), extra: fc.anything() }),
);
const time = fc.oneof(
  fc.date({ min: new Date('2000-01-01'), max: new Date('2100-01-01'), noInvalidDate: true }).map((d) => d.toISOString()),
  fc.constantFrom('2026-02-29T00:00:00Z', '2024-02-29T10:00:00+05:30', '2026-12-01T10:00:00', '2026-12-01 10:00:00Z', 'yesterday', '2026-12-01T24:00:00Z', '2026-12-01T10:00:00.1234567-03:00'),
);
const sample = fc.oneof(
  fc.record({ at: time, values: fc.array(value, { minLength: 0, maxLength: 34 }) }),
  fc.record({ at: time, values: fc.array(value, { minLength: 1, maxLength: 3 }), note: fc.string() }),
  fc.anything(),
);
const payload = fc.record(
  {
    v: fc.oneof(fc.constant(1), fc.constantFrom(2, '1', 0)),
    sentAt: time,
    batteryPct: fc.double({ min: -10, max: 110, noNaN: true }),
    rssiDbm: fc.double({ min: -200, max: 10, noNaN: true }),
    samples: fc.array(sample, { minLength: 0, maxLength: 4 }),
    extra: fc.anything(),
  },
  { requiredKeys: [] },
);

describe('fast payload check', () => {
  it('uses the same date-time pattern as the payload schema', () => {
    const at = readingSampleSchema.shape.at as unknown as { _zod: { def: { pattern: RegExp } } };
    expect(String(ISO_OFFSET_DATETIME)).toBe(String(at._zod.def.pattern));
  });

  it('never accepts a payload the zod schema refuses, and returns what the schema returns', () => {
    fc.assert(
      fc.property(payload, (p) => {
        // Through JSON, as the broker sees it.
        const json: unknown = JSON.parse(JSON.stringify(p));
        const fast = fastPayload(json);
        const slow = probeReadingsPayloadSchema.safeParse(json);
        if (fast !== null) {
          expect(slow.success).toBe(true);
          expect(fast).toEqual(slow.data);
        }
      }),
      { numRuns: 3000 },
    );
  });

  it('takes the fast path for every well-formed probe message', () => {
    const good = fc.record({
      v: fc.constant(1 as const),
      samples: fc.array(
        fc.record({
          at: fc.date({ min: new Date('2020-01-01'), max: new Date('2030-01-01'), noInvalidDate: true }).map((d) => d.toISOString()),
          values: fc.array(
            fc.constantFrom(...quantityNames).chain((q) => fc.record({ quantity: fc.constant(q), value: fc.double({ noNaN: true, noDefaultInfinity: true }), unit: fc.constantFrom(...quantityUnits[q]) })),
            { minLength: 1, maxLength: 32 },
          ),
        }),
        { minLength: 1, maxLength: 5 },
      ),
    });
    fc.assert(
      fc.property(good, (p) => {
        const json: unknown = JSON.parse(JSON.stringify(p));
        expect(probeReadingsPayloadSchema.safeParse(json).success).toBe(true);
        expect(fastPayload(json)).not.toBeNull();
      }),
      { numRuns: 500 },
    );
  });
});
