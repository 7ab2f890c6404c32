// Malformed and hostile readings payloads for the MQTT fuzz test, each with the reject reason the
// ingest handler must count for it (server/ingest/reading-handler.ts) and how many rejects it makes.
// Generated with fast-check from a fixed seed, so a failure names a payload that can be replayed.
import fc from 'fast-check';
import { MAX_READINGS_PAYLOAD_BYTES, probeReadingsPayloadSchema, quantities } from '../../../shared/schemas/mqtt.schema';

export type RejectReason = 'too_large' | 'malformed_json' | 'invalid_payload' | 'future_timestamp' | 'stale_timestamp' | 'out_of_range';
export type FuzzCase = { kind: string; payload: Buffer; reason: RejectReason; rejects: number };

const MINUTE = 60_000;
const DAY = 24 * 60 * MINUTE;

const isJson = (text: string): boolean => {
  try {
    JSON.parse(text);
    return true;
  } catch {
    return false;
  }
};

/** What the handler must answer for an arbitrary buffer: the same order of checks, schema as the oracle. */
function classify(buf: Buffer): RejectReason | null {
  if (buf.length > MAX_READINGS_PAYLOAD_BYTES) return 'too_large';
  let json: unknown;
  try {
    json = JSON.parse(buf.toString('utf8'));
  } catch {
    return 'malformed_json';
  }
  return probeReadingsPayloadSchema.safeParse(json).success ? null : 'invalid_payload';
}

const iso = (ms: number) => new Date(ms).toISOString();

function validMessage(nowMs: number): Record<string, unknown> {
  return {
    v: 1,
    sentAt: iso(nowMs),
    batteryPct: 80,
    rssiDbm: -70,
    samples: [{ at: iso(nowMs - MINUTE), values: [{ quantity: 'ph', value: 7.6, unit: 'pH' }] }],
  };
}

const text = (s: string, kind: string, reason: RejectReason, rejects = 1): FuzzCase => ({ kind, payload: Buffer.from(s, 'utf8'), reason, rejects });

/** Strings from every corner of Unicode, lone surrogates included. */
const junkString = fc.oneof(
  fc.string({ unit: 'binary', maxLength: 40 }),
  fc.string({ unit: fc.nat(0xffff).map((c) => String.fromCharCode(c)), maxLength: 40 }),
  fc.constantFrom('\u0000', '\uFEFF', '\u202Eph', 'ph\u200B', 'рh' /* Cyrillic er */, 'PH', 'pH ', '💧', '\uD800', '\uDFFF\uD800', 'NaN', 'Infinity', '-Infinity', '1e999'),
);

function malformedJson(nowMs: number): fc.Arbitrary<FuzzCase> {
  const valid = JSON.stringify(validMessage(nowMs));
  return fc.oneof(
    // A message cut short anywhere (a proper prefix of an object is never JSON).
    fc.nat(valid.length - 1).map((n) => text(valid.slice(0, n), 'truncated', 'malformed_json')),
    // JavaScript that is not JSON.
    fc.constantFrom(
      '{v:1,samples:[]}',
      "{'v':1}",
      '{"v":1,}',
      '{"v":1,"samples":[{"at":"x","values":[{"quantity":"ph","value":NaN,"unit":"pH"}]}]}',
      '{"v":1,"samples":[{"at":"x","values":[{"quantity":"ph","value":Infinity,"unit":"pH"}]}]}',
      '{"v":1} // comment',
      '/* */{"v":1}',
      'undefined',
      `\uFEFF${valid}`,
      `${valid}}`,
      `${valid}${valid}`,
      '{"v":1,"samples":[',
      '['.repeat(50_000),
      '{"a":'.repeat(20_000),
      '"unterminated',
      '{"v":0x1}',
      '{"v":01}',
      '{"v":1.}',
      '{"v":+1}',
    ).map((s) => text(s, 'not-json', 'malformed_json')),
    // Unicode junk and random text that happens not to be JSON.
    junkString.filter((s) => !isJson(s)).map((s) => text(s, 'junk-text', 'malformed_json')),
  );
}

/** Raw bytes (invalid UTF-8 and all), whatever they turn out to be. */
function randomBytes(): fc.Arbitrary<FuzzCase> {
  return fc
    .uint8Array({ maxLength: 600 })
    .map((bytes): FuzzCase | null => {
      const payload = Buffer.from(bytes);
      const reason = classify(payload);
      return reason ? { kind: 'random-bytes', payload, reason, rejects: 1 } : null;
    })
    .filter((c): c is FuzzCase => c !== null);
}

type Mutation = (m: Record<string, unknown>) => void;
const sample0 = (m: Record<string, unknown>) => (m.samples as Array<Record<string, unknown>>)[0]!;
const value0 = (m: Record<string, unknown>) => (sample0(m).values as Array<Record<string, unknown>>)[0]!;

/** Wrong types, missing and extra fields, unknown quantities and units, bad timestamps, pollution keys. */
function invalidPayload(nowMs: number): fc.Arbitrary<FuzzCase> {
  const wrong = fc.oneof(
    fc.jsonValue({ maxDepth: 3 }),
    junkString,
    fc.constantFrom('NaN', 'Infinity', '-Infinity', '1e999', '7.5', '', null, true, false, [], {}, [7.5], { value: 7.5 }),
  );
  const badTimes = fc.constantFrom(
    'yesterday',
    '2026-02-30T00:00:00Z',
    '2026-12-01T10:00:00',
    '2026-12-01T24:00:00Z',
    '2026-12-01T10:00:60Z',
    '2026-13-01T00:00:00Z',
    '+275760-09-13T00:00:00.000Z',
    '-000001-01-01T00:00:00Z',
    '2026-12-01 10:00:00Z',
    '1796119200000',
    '',
  );
  const mutations: Array<fc.Arbitrary<Mutation>> = [
    wrong.filter((x) => x !== 1).map((x) => (m) => void (m.v = x)),
    fc.constant((m) => void delete m.v),
    fc.constant((m) => void delete m.samples),
    wrong.map((x) => (m) => void (m.samples = x)),
    fc.constant((m) => void (m.samples = [])),
    wrong.map((x) => (m) => void (sample0(m).at = x)),
    badTimes.map((x) => (m) => void (sample0(m).at = x)),
    badTimes.map((x) => (m) => void (m.sentAt = x)),
    fc.constant((m) => void delete sample0(m).at),
    wrong.map((x) => (m) => void (sample0(m).values = x)),
    fc.constant((m) => void (sample0(m).values = [])),
    fc.integer({ min: 33, max: 60 }).map((n) => (m) => void (sample0(m).values = Array.from({ length: n }, () => ({ quantity: 'ph', value: 7, unit: 'pH' })))),
    fc.constant((m) => void (m.samples = Array.from({ length: 1001 }, (_, i) => ({ at: iso(nowMs - (i + 1) * MINUTE), values: [{ quantity: 'ph', value: 7, unit: 'pH' }] })))),
    wrong.map((x) => (m) => void (value0(m).value = x)),
    fc.constant((m) => void delete value0(m).value),
    junkString.filter((s) => !(quantities as string[]).includes(s)).map((s) => (m) => void (value0(m).quantity = s)),
    fc.constantFrom('ammonia', 'free_ammonia', 'PH', 'Ph', 'temperature', 'do', '__proto__', 'constructor', 'toString', 'hasOwnProperty').map((s) => (m) => void (value0(m).quantity = s)),
    fc.constantFrom('C', 'mg/L', 'ppm', 'PH', 'ph', '', 'x'.repeat(17), '__proto__', 'toString').map((u) => (m) => void (value0(m).unit = u)),
    junkString.map((u) => (m) => void (value0(m).unit = u)),
    wrong.map((x) => (m) => void (m.batteryPct = x)),
    fc.constantFrom(-1, 100.5, 1e308, -1e308).map((x) => (m) => void (m.batteryPct = x)),
    fc.constantFrom(1, 0.5, -151, 1e308).map((x) => (m) => void (m.rssiDbm = x)),
    // Extra keys, unknown to a strict schema, at every level.
    fc.constantFrom('extra', 'x', 'V', 'samples ', 'probeId', 'farmId').map((k) => (m) => void (m[k] = 1)),
    fc.constantFrom('extra', 'quality', 'probeId').map((k) => (m) => void (value0(m)[k] = 'good')),
    fc.constantFrom('extra', 'unit').map((k) => (m) => void (sample0(m)[k] = 1)),
  ];
  const mutated = fc
    .tuple(fc.oneof(...mutations), fc.oneof(...mutations), fc.boolean())
    .map(([a, b, twice]) => {
      const m = validMessage(nowMs);
      a(m);
      try {
        if (twice) b(m);
      } catch {
        // the first mutation removed what the second one changes
      }
      return Buffer.from(JSON.stringify(m), 'utf8');
    })
    .filter((payload) => classify(payload) === 'invalid_payload')
    .map((payload): FuzzCase => ({ kind: 'mutated', payload, reason: 'invalid_payload', rejects: 1 }));

  const valid = validMessage(nowMs);
  const body = JSON.stringify(valid).slice(1);
  const at = iso(nowMs - MINUTE);
  // Written as text: keys JSON.parse makes own properties, and numbers JSON.stringify cannot write.
  const raw = fc.constantFrom(
    `{"__proto__":{"polluted":"yes"},${body}`,
    `{"constructor":{"prototype":{"polluted":"yes"}},${body}`,
    `{"v":1,"samples":[{"at":"${at}","__proto__":{"polluted":"yes"},"values":[{"quantity":"ph","value":7,"unit":"pH"}]}]}`,
    `{"v":1,"samples":[{"at":"${at}","values":[{"quantity":"ph","value":7,"unit":"pH","__proto__":{"polluted":"yes"}}]}]}`,
    `{"v":1,"samples":[{"at":"${at}","values":[{"__proto__":{"quantity":"ph","value":7,"unit":"pH"}}]}]}`,
    `{"v":1,"samples":[{"at":"${at}","values":[{"quantity":"ph","value":1e400,"unit":"pH"}]}]}`,
    `{"v":1,"samples":[{"at":"${at}","values":[{"quantity":"ph","value":-1e400,"unit":"pH"}]}]}`,
    `{"v":1,"samples":[{"at":"${at}","values":[{"quantity":"ph","value":"NaN","unit":"pH"}]}]}`,
    `{"v":1,"samples":[{"at":"${at}","values":[{"quantity":"ph","value":${'['.repeat(5000)}7${']'.repeat(5000)},"unit":"pH"}]}]}`,
    `${'['.repeat(10_000)}${']'.repeat(10_000)}`,
    `${'{"a":'.repeat(5000)}1${'}'.repeat(5000)}`,
    // A NUL character in a key ends up in the reject detail, which is stored in probe_rejects.
    `{"v":1,"\\u0000":1,"samples":[{"at":"${at}","values":[{"quantity":"ph","value":7,"unit":"pH"}]}]}`,
    `{"v":1,"samples":[{"at":"${at}","values":[{"quantity":"ph","value":7,"unit":"pH","\\u0000\\u0000":true}]}]}`,
    `{"v":1,"v":2,"samples":[{"at":"${at}","values":[{"quantity":"ph","value":7,"unit":"pH"}]}]}`,
    'null',
    'true',
    '0',
    '""',
    '[]',
    '{}',
    `[${JSON.stringify(valid)}]`,
    JSON.stringify(JSON.stringify(valid)),
  );
  return fc.oneof({ arbitrary: mutated, weight: 9 }, { arbitrary: raw.map((s) => text(s, 'hostile-json', 'invalid_payload')), weight: 1 });
}

const reading = (quantity: string, value: number, unit: string) => ({ quantity, value, unit });
const goodValues = fc.constantFrom(reading('ph', 7.8, 'pH'), reading('dissolved_oxygen', 6.1, 'mg/L'), reading('water_temperature', 77, 'F'));

/** Well-formed samples measured more than 5 minutes ahead: refused as future. */
function futureTimestamps(nowMs: number): fc.Arbitrary<FuzzCase> {
  return fc
    .tuple(fc.oneof(fc.integer({ min: 6 * MINUTE, max: DAY }), fc.integer({ min: DAY, max: 2_000 * 365 * DAY })), goodValues, fc.integer({ min: 1, max: 3 }))
    .filter(([ahead]) => nowMs + ahead < Date.parse('9999-12-31T23:59:59Z'))
    .map(([ahead, value, n]) =>
      text(
        JSON.stringify({ v: 1, samples: Array.from({ length: n }, (_, i) => ({ at: iso(nowMs + ahead + i * 1000), values: [value] })) }),
        'future',
        'future_timestamp',
        n,
      ),
    );
}

/** Well-formed samples older than 30 days (down to year 1000): refused as stale. */
function staleTimestamps(nowMs: number): fc.Arbitrary<FuzzCase> {
  const floor = Date.parse('1000-01-01T00:00:00Z');
  return fc
    .tuple(fc.oneof(fc.integer({ min: 31 * DAY, max: 400 * DAY }), fc.integer({ min: 400 * DAY, max: nowMs - floor })), goodValues)
    .map(([ago, value]) => text(JSON.stringify({ v: 1, samples: [{ at: iso(nowMs - ago), values: [value] }] }), 'stale', 'stale_timestamp'));
}

/** Well-formed values no probe in fish-farm water can read (shared/units.ts physicalLimits), huge numbers included. */
function outOfRange(nowMs: number): fc.Arbitrary<FuzzCase> {
  const impossible = fc.oneof(
    fc.constantFrom(14.01, 15, -0.01, 1e308, -1e308, Number.MAX_SAFE_INTEGER).map((v) => reading('ph', v, 'pH')),
    fc.constantFrom(40.01, 1e300, -0.1).map((v) => reading('dissolved_oxygen', v, 'mg/L')),
    fc.constantFrom(50.1, -5.1, 1e308).map((v) => reading('water_temperature', v, 'C')),
    fc.constantFrom(123, -1e308, 1e308).map((v) => reading('water_temperature', v, 'F')),
    fc.constantFrom(70.1, -1).map((v) => reading('salinity', v, 'psu')),
    fc.constantFrom(31, -0.5).map((v) => reading('water_level', v, 'm')),
    fc.constantFrom(3001, 1e308).map((v) => reading('water_level', v, 'cm')),
    fc.constantFrom(-1, 1e6, 1e308).map((v) => reading('flow', v, 'L/min')),
    fc.constantFrom(1e308, 60_001).map((v) => reading('flow', v, 'm3/h')),
    fc.constantFrom(0.5, 2, -1).map((v) => reading('aerator_running', v, 'bool')),
    fc.constantFrom(101, -1).map((v) => reading('specific_conductance', v, 'mS/cm')),
  );
  return impossible.map((value) =>
    text(JSON.stringify({ v: 1, samples: [{ at: iso(nowMs - 2 * MINUTE), values: [value] }] }), 'out-of-range', 'out_of_range'),
  );
}

/** The generated corpus: `count` small hostile payloads plus `large` messages of about 300 KB. */
export function fuzzCorpus({ nowMs, count, large, seed }: { nowMs: number; count: number; large: number; seed: number }): FuzzCase[] {
  const arb = fc.oneof(
    { arbitrary: malformedJson(nowMs), weight: 20 },
    { arbitrary: randomBytes(), weight: 5 },
    { arbitrary: invalidPayload(nowMs), weight: 45 },
    { arbitrary: futureTimestamps(nowMs), weight: 10 },
    { arbitrary: staleTimestamps(nowMs), weight: 10 },
    { arbitrary: outOfRange(nowMs), weight: 10 },
  );
  const cases = fc.sample(arb, { seed, numRuns: count });
  const valid = JSON.stringify(validMessage(nowMs));
  for (let i = 0; i < large; i++) {
    const size = 300 * 1024 + i;
    // Valid JSON padded with spaces, junk, and a real-looking buffer of samples: all over the limit.
    const payload =
      i % 3 === 0
        ? Buffer.from(valid + ' '.repeat(size - valid.length))
        : i % 3 === 1
          ? Buffer.alloc(size, i % 256)
          : Buffer.from(
              JSON.stringify({
                v: 1,
                samples: Array.from({ length: 1000 }, (_, k) => ({
                  at: iso(nowMs - (k + 1) * MINUTE),
                  values: Array.from({ length: 5 }, () => reading('dissolved_oxygen', 6.5, 'mg/L')),
                })),
              }),
            );
    cases.push({ kind: 'large', payload, reason: 'too_large', rejects: 1 });
  }
  return cases;
}
