import { salinityFromConductivity, salinityFromSpecificConductance } from '../../shared/chemistry';
import {
  MAX_READINGS_PAYLOAD_BYTES,
  probeReadingsPayloadSchema,
  type ProbeReadingsPayload,
  type Quantity,
} from '../../shared/schemas/mqtt.schema';
import { isPhysicallyPossible, isPlausibleStep, toCanonicalUnit } from '../../shared/units';
import type { ReadingQuality } from '../db/entities';
import { fastPayload } from './fast-payload';

export type ProbeIdentity = { probeId: string; probeKey: string; farmId: string; unitId: string | null };
export type ReadingRow = { probeId: string; quantity: Quantity; at: Date; value: number; quality: ReadingQuality };
export type RejectReason =
  | 'too_large'
  | 'malformed_json'
  | 'invalid_payload'
  | 'future_timestamp'
  | 'stale_timestamp'
  | 'out_of_range'
  | 'missing_temperature';
export type Reject = { reason: RejectReason; detail: string };
export type HandleResult = { rows: ReadingRow[]; rejects: Reject[]; payload: ProbeReadingsPayload | null };

const FUTURE_TOLERANCE_MS = 5 * 60_000;
const MAX_AGE_MS = 30 * 24 * 3600_000;

/**
 * A zod message quotes the probe's own keys ('Unrecognized key: "…"'), and the detail is stored in
 * probe_rejects.last_detail: PostgreSQL text cannot hold U+0000 (the whole flush of reject counters
 * would fail, again every time), and other control characters only garble logs and screens.
 */
const storableDetail = (detail: string) => detail.replace(/[\u0000-\u001f\u007f]/g, '\ufffd').slice(0, 300);

/**
 * Turns one MQTT payload into reading rows in canonical units: validates with the shared zod schema,
 * converts units, derives salinity from conductivity (PSS-78), rejects impossible values and flags
 * implausible steps. Never throws: every problem becomes a counted reject.
 */
export class ReadingHandler {
  /** Last accepted value per probe and quantity, for the implausible-step check. */
  private readonly last = new Map<string, Map<Quantity, { at: number; value: number }>>();

  handle(probe: ProbeIdentity, raw: Buffer | string, now = Date.now()): HandleResult {
    const size = typeof raw === 'string' ? Buffer.byteLength(raw) : raw.length;
    if (size > MAX_READINGS_PAYLOAD_BYTES) {
      return { rows: [], rejects: [{ reason: 'too_large', detail: `${size} bytes > ${MAX_READINGS_PAYLOAD_BYTES}` }], payload: null };
    }
    let json: unknown;
    try {
      json = JSON.parse(typeof raw === 'string' ? raw : raw.toString('utf8'));
    } catch {
      return { rows: [], rejects: [{ reason: 'malformed_json', detail: 'payload is not JSON' }], payload: null };
    }
    // A well-formed message passes a hand-written check of the schema; anything else goes through zod,
    // which decides and words the reject (see fast-payload.ts).
    let data = fastPayload(json);
    if (!data) {
      const parsed = probeReadingsPayloadSchema.safeParse(json);
      if (!parsed.success) {
        const issue = parsed.error.issues[0];
        const detail = issue ? `${issue.path.join('.') || '(root)'}: ${issue.message}` : 'invalid payload';
        return { rows: [], rejects: [{ reason: 'invalid_payload', detail: storableDetail(detail) }], payload: null };
      }
      data = parsed.data;
    }
    const rows: ReadingRow[] = [];
    const rejects: Reject[] = [];
    // Oldest first, so the step check compares neighbours in time even when a buffer is replayed.
    const samples = data.samples.length === 1 ? data.samples : [...data.samples].sort((a, b) => Date.parse(a.at) - Date.parse(b.at));
    for (const sample of samples) {
      const atMs = Date.parse(sample.at);
      if (atMs > now + FUTURE_TOLERANCE_MS) {
        rejects.push({ reason: 'future_timestamp', detail: sample.at });
        continue;
      }
      if (atMs < now - MAX_AGE_MS) {
        rejects.push({ reason: 'stale_timestamp', detail: sample.at });
        continue;
      }
      const at = new Date(atMs);
      const canonical = new Map<Quantity, number>();
      for (const v of sample.values) {
        const value = toCanonicalUnit({ quantity: v.quantity, value: v.value, unit: v.unit });
        if (!isPhysicallyPossible({ quantity: v.quantity, value })) {
          rejects.push({ reason: 'out_of_range', detail: `${v.quantity}=${v.value} ${v.unit}` });
          continue;
        }
        canonical.set(v.quantity, value);
      }
      // Probes that report conductivity get a derived salinity (PSS-78), unless they also report salinity.
      if (!canonical.has('salinity')) {
        const derived = this.deriveSalinity(canonical);
        if (derived === 'missing_temperature') rejects.push({ reason: 'missing_temperature', detail: 'conductivity without water_temperature' });
        else if (derived !== null) canonical.set('salinity', derived);
      }
      for (const [quantity, value] of canonical) {
        rows.push({ probeId: probe.probeId, quantity, at, value, quality: this.quality(probe.probeId, quantity, atMs, value) });
      }
    }
    return { rows, rejects, payload: data };
  }

  private deriveSalinity(values: Map<Quantity, number>): number | null | 'missing_temperature' {
    try {
      const sc = values.get('specific_conductance');
      if (sc !== undefined) return round(salinityFromSpecificConductance({ specificConductanceMsCm: sc }), 3);
      const c = values.get('conductivity');
      if (c === undefined) return null;
      const t = values.get('water_temperature');
      if (t === undefined) return 'missing_temperature';
      return round(salinityFromConductivity({ conductivityMsCm: c, temperatureC: t }), 3);
    } catch {
      return null;
    }
  }

  private quality(probeId: string, quantity: Quantity, atMs: number, value: number): ReadingQuality {
    let perProbe = this.last.get(probeId);
    if (!perProbe) this.last.set(probeId, (perProbe = new Map()));
    const prev = perProbe.get(quantity);
    if (!prev) {
      perProbe.set(quantity, { at: atMs, value });
      return 'good';
    }
    const elapsedMinutes = Math.abs(atMs - prev.at) / 60_000;
    const good = isPlausibleStep({ quantity, previousValue: prev.value, value, elapsedMinutes });
    if (atMs >= prev.at) {
      prev.at = atMs;
      prev.value = value;
    }
    return good ? 'good' : 'suspect';
  }
}

const round = (v: number, digits: number) => Math.round(v * 10 ** digits) / 10 ** digits;
