// Parameter parsing for scenario strings such as `dropout:minutes=20,every=6h`.
import { DAY_MS, HOUR_MS, createLocalClock } from '../models/clock';
import type { ScenarioContext } from './types';

export class ScenarioParamError extends Error {
  override readonly name = 'ScenarioParamError';
}

export function numberParam(params: Readonly<Record<string, string>>, key: string, fallback: number, min: number, max: number): number {
  const raw = params[key];
  if (raw === undefined) return fallback;
  const value = Number(raw);
  if (!Number.isFinite(value) || value < min || value > max) {
    throw new ScenarioParamError(`${key} must be a number from ${min} to ${max}; got ${JSON.stringify(raw)}`);
  }
  return value;
}

const DURATION = /^(\d+(?:\.\d+)?)(ms|s|m|h|d)?$/;
const UNIT_MS: Record<string, number> = { ms: 1, s: 1000, m: 60_000, h: HOUR_MS, d: DAY_MS };

/** A duration such as `90s`, `15m`, `6h`, `2d`; a bare number is read in `defaultUnit`. */
export function durationParam(
  params: Readonly<Record<string, string>>,
  key: string,
  fallbackMs: number,
  defaultUnit: 's' | 'm' | 'h' | 'd' = 'm',
): number {
  const raw = params[key];
  if (raw === undefined) return fallbackMs;
  return parseDurationMs(raw, defaultUnit, key);
}

export function parseDurationMs(raw: string, defaultUnit: 's' | 'm' | 'h' | 'd', key = 'duration'): number {
  const match = DURATION.exec(raw.trim());
  if (!match) throw new ScenarioParamError(`${key} must be a duration such as 90s, 15m, 6h or 2d; got ${JSON.stringify(raw)}`);
  return Number(match[1]) * (UNIT_MS[match[2] ?? defaultUnit] ?? 60_000);
}

const CLOCK_TIME = /^(\d{1,2}):(\d{2})$/;

/**
 * A point in time: an ISO timestamp, `+15m` / `-2h` relative to the start (or `end-6h` relative to
 * the end of generated history), or `HH:MM` farm-local time (the first such time after the start).
 */
export function timeParam(params: Readonly<Record<string, string>>, key: string, fallbackMs: number, context: ScenarioContext): number {
  const raw = params[key];
  if (raw === undefined) return fallbackMs;
  return parseTimeMs(raw, context, key);
}

export function parseTimeMs(raw: string, context: ScenarioContext, key = 'time'): number {
  const text = raw.trim();
  if (text.startsWith('+') || text.startsWith('-')) {
    const offset = parseDurationMs(text.slice(1), 'm', key);
    return context.startMs + (text.startsWith('+') ? offset : -offset);
  }
  if (text.startsWith('end-')) {
    if (context.endMs === undefined) throw new ScenarioParamError(`${key}=${text} needs an end time (history only)`);
    return context.endMs - parseDurationMs(text.slice(4), 'h', key);
  }
  const clock = CLOCK_TIME.exec(text);
  if (clock) {
    const hour = Number(clock[1]) + Number(clock[2]) / 60;
    if (hour >= 24) throw new ScenarioParamError(`${key} must be a time of day before 24:00; got ${text}`);
    const local = createLocalClock(context.timeZone ?? 'UTC')(context.startMs);
    const aheadHours = (hour - local.hour + 24) % 24;
    return context.startMs + Math.round(aheadHours * HOUR_MS);
  }
  const ms = Date.parse(text);
  if (!/^\d{4}-\d{2}-\d{2}T/.test(text) || Number.isNaN(ms)) {
    throw new ScenarioParamError(`${key} must be an ISO time, +15m, end-6h or HH:MM; got ${JSON.stringify(raw)}`);
  }
  return ms;
}

export const iso = (ms: number): string => new Date(ms).toISOString();
