// Probe housekeeping values sent with each message: battery and radio signal.
import { DAY_MS, HOUR_MS } from './clock';
import { deriveSeed, signedHash, smoothNoise, unitHash } from './random';

export interface ProbeTelemetry {
  batteryPct: number;
  rssiDbm: number;
}

const DRAIN_PCT_PER_DAY = 0.35;
const SWAP_AT_PCT = 15; // the crew swaps the pack at 15 %

/** Battery drains slowly and is swapped when low; RSSI sits at a per-probe level with jitter. Pure in (seed, probeKey, ms). */
export function probeTelemetry(seed: number | string, probeKey: string, ms: number): ProbeTelemetry {
  const s = deriveSeed(seed, 'telemetry', probeKey);
  const cycleDays = (100 - SWAP_AT_PCT) / DRAIN_PCT_PER_DAY;
  const phaseDays = unitHash(s, 1) * cycleDays;
  const daysIntoCycle = (((ms / DAY_MS + phaseDays) % cycleDays) + cycleDays) % cycleDays;
  const batteryPct = Math.round((100 - daysIntoCycle * DRAIN_PCT_PER_DAY) * 10) / 10;
  const baseRssi = -85 + 25 * unitHash(s, 2);
  const rssi =
    baseRssi +
    4 * smoothNoise(deriveSeed(s, 'rssi-slow'), ms / HOUR_MS, 0.5) +
    2 * signedHash(deriveSeed(s, 'rssi'), Math.floor(ms / 1000));
  return { batteryPct: Math.min(100, Math.max(0, batteryPct)), rssiDbm: Math.round(Math.min(-30, Math.max(-120, rssi))) };
}
