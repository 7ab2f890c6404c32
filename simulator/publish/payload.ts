// Builds readings payloads (shared/schemas/mqtt.schema.ts) from buffered samples.
import type { ProbeReadingsPayload, ReadingSample } from '../../shared/schemas/mqtt.schema';
import type { ProbeTelemetry } from '../models';

export function buildReadingsPayload(samples: readonly ReadingSample[], telemetry: ProbeTelemetry, sentAtMs: number): ProbeReadingsPayload {
  return {
    v: 1,
    sentAt: new Date(sentAtMs).toISOString(),
    batteryPct: telemetry.batteryPct,
    rssiDbm: telemetry.rssiDbm,
    samples: [...samples],
  };
}

const encoder = new TextEncoder();

export function payloadBytes(payload: ProbeReadingsPayload): number {
  return encoder.encode(JSON.stringify(payload)).length;
}
