import { z } from 'zod';
import { quantityUnits, type ProbeReadingsPayload } from '../../shared/schemas/mqtt.schema';

/**
 * The same ISO date-time pattern `z.iso.datetime({ offset: true })` compiles for the payload schema
 * (fast-payload.test.ts checks that the two agree).
 */
export const ISO_OFFSET_DATETIME = z.regexes.datetime({ offset: true, local: false, precision: undefined });

const PAYLOAD_KEYS = new Set(['v', 'sentAt', 'batteryPct', 'rssiDbm', 'samples']);
const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
const isNumber = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
const isTime = (v: unknown): boolean => typeof v === 'string' && ISO_OFFSET_DATETIME.test(v);

function sampleOk(s: unknown): boolean {
  if (!isObject(s)) return false;
  let keys = 0;
  for (const k in s) {
    if (k !== 'at' && k !== 'values') return false;
    keys++;
  }
  if (keys !== 2 || !isTime(s.at)) return false;
  const values = s.values;
  if (!Array.isArray(values) || values.length < 1 || values.length > 32) return false;
  for (const v of values as unknown[]) {
    if (!isObject(v)) return false;
    let n = 0;
    for (const k in v) {
      if (k !== 'quantity' && k !== 'value' && k !== 'unit') return false;
      n++;
    }
    if (n !== 3) return false;
    const { quantity, value, unit } = v;
    if (typeof quantity !== 'string' || !Object.hasOwn(quantityUnits, quantity)) return false;
    if (!isNumber(value)) return false;
    if (typeof unit !== 'string' || unit.length < 1 || unit.length > 16) return false;
    if (!(quantityUnits[quantity as keyof typeof quantityUnits] as readonly string[]).includes(unit)) return false;
  }
  return true;
}

/**
 * A hand-written check of `probeReadingsPayloadSchema` for the hot path: returns the parsed JSON as the
 * payload when it certainly satisfies the schema, and null otherwise — then the caller runs the zod
 * schema, which decides and words the reject. It never accepts what the schema refuses (the property
 * test in fast-payload.test.ts compares the two); it may send a valid but unusual payload to zod.
 * Costs about a tenth of the zod parse, which allocates a copy of every object it checks.
 */
export function fastPayload(json: unknown): ProbeReadingsPayload | null {
  if (!isObject(json)) return null;
  for (const k in json) if (!PAYLOAD_KEYS.has(k)) return null;
  if (json.v !== 1) return null;
  if ('sentAt' in json && !isTime(json.sentAt)) return null;
  if ('batteryPct' in json && !(isNumber(json.batteryPct) && json.batteryPct >= 0 && json.batteryPct <= 100)) return null;
  if ('rssiDbm' in json && !(isNumber(json.rssiDbm) && json.rssiDbm >= -150 && json.rssiDbm <= 0)) return null;
  const samples = json.samples;
  if (!Array.isArray(samples) || samples.length < 1 || samples.length > 1000) return null;
  for (const s of samples as unknown[]) if (!sampleOk(s)) return null;
  return json as ProbeReadingsPayload;
}
