// Farm-local time and the sun. Uses only ECMAScript Intl, so it runs anywhere shared/ code runs.

export const HOUR_MS = 3_600_000;
export const DAY_MS = 86_400_000;

export interface FarmSite {
  /** IANA time zone of the farm; "today", dawn and the afternoon peak are in this zone. */
  timeZone: string;
  /** Optional position: when both are given, sunrise, sunset and noon sun height follow the date. */
  latitude?: number;
  longitude?: number;
  /** Local clock hours used when no position is given. Defaults 06:30 and 18:30. */
  sunriseHour?: number;
  sunsetHour?: number;
}

export interface LocalTime {
  /** Local clock hour of day, fractional, 0 ≤ hour < 24. */
  hour: number;
  /** Days since 1970-01-01 in the local calendar. */
  localDay: number;
  /** Day of year, 1–366, in the local calendar. */
  dayOfYear: number;
  /** Local offset from UTC in hours at this instant (DST included). */
  utcOffsetHours: number;
}

export interface SunTimes {
  sunriseHour: number;
  sunsetHour: number;
  /** Sine of the sun's elevation at solar noon; 1 when no position is given. */
  noonSineElevation: number;
}

const OFFSET_BUCKET_MS = 15 * 60_000;

/** Throws a RangeError for a time zone the runtime does not know. */
export function assertTimeZone(timeZone: string): void {
  new Intl.DateTimeFormat('en-US', { timeZone }).format(0);
}

/** Returns a function giving local time in `timeZone`; UTC offsets are cached per 15 minutes. */
export function createLocalClock(timeZone: string): (ms: number) => LocalTime {
  const format = new Intl.DateTimeFormat('en-US', {
    timeZone,
    hourCycle: 'h23',
    year: 'numeric',
    month: 'numeric',
    day: 'numeric',
    hour: 'numeric',
    minute: 'numeric',
    second: 'numeric',
  });
  const cache = new Map<number, number>();

  function offsetMs(ms: number): number {
    const bucket = Math.floor(ms / OFFSET_BUCKET_MS);
    const cached = cache.get(bucket);
    if (cached !== undefined) return cached;
    const probe = bucket * OFFSET_BUCKET_MS;
    const parts: Record<string, number> = {};
    for (const part of format.formatToParts(probe)) {
      if (part.type !== 'literal') parts[part.type] = Number(part.value);
    }
    const wall = Date.UTC(
      parts.year ?? 1970,
      (parts.month ?? 1) - 1,
      parts.day ?? 1,
      parts.hour ?? 0,
      parts.minute ?? 0,
      parts.second ?? 0,
    );
    const offset = Math.round((wall - probe) / 60_000) * 60_000;
    if (cache.size > 20_000) cache.clear();
    cache.set(bucket, offset);
    return offset;
  }

  return (ms: number): LocalTime => {
    const offset = offsetMs(ms);
    const wall = ms + offset;
    const localDay = Math.floor(wall / DAY_MS);
    const hour = (wall - localDay * DAY_MS) / HOUR_MS;
    const date = new Date(localDay * DAY_MS);
    const yearStart = Date.UTC(date.getUTCFullYear(), 0, 1);
    const dayOfYear = Math.floor((localDay * DAY_MS - yearStart) / DAY_MS) + 1;
    return { hour, localDay, dayOfYear, utcOffsetHours: offset / HOUR_MS };
  };
}

const DEG = Math.PI / 180;

/**
 * Sunrise, sunset and noon sun height for one local day. With a position it uses the standard
 * declination/equation-of-time approximations (Cooper 1969 declination; Spencer-type EoT, from
 * memory), accurate to a few minutes, which is all a pond needs.
 */
export function sunTimes(site: FarmSite, local: LocalTime): SunTimes {
  const { latitude, longitude } = site;
  if (latitude === undefined || longitude === undefined) {
    return { sunriseHour: site.sunriseHour ?? 6.5, sunsetHour: site.sunsetHour ?? 18.5, noonSineElevation: 1 };
  }
  const n = local.dayOfYear;
  const declination = 23.44 * DEG * Math.sin((2 * Math.PI * (284 + n)) / 365);
  const b = (2 * Math.PI * (n - 81)) / 364;
  const eotMinutes = 9.87 * Math.sin(2 * b) - 7.53 * Math.cos(b) - 1.5 * Math.sin(b);
  const solarNoonLocal = 12 - longitude / 15 - eotMinutes / 60 + local.utcOffsetHours;
  const phi = latitude * DEG;
  const cosOmega = -Math.tan(phi) * Math.tan(declination);
  const halfDayHours = cosOmega <= -1 ? 12 : cosOmega >= 1 ? 0 : Math.acos(cosOmega) / DEG / 15;
  return {
    sunriseHour: solarNoonLocal - halfDayHours,
    sunsetHour: solarNoonLocal + halfDayHours,
    noonSineElevation: Math.max(0, Math.cos(phi - declination)),
  };
}

/** Clear-sky light, 0–1 (1 = sun overhead): a half-sine between sunrise and sunset. */
export function clearSkyLight(sun: SunTimes, hour: number): number {
  const dayLength = sun.sunsetHour - sun.sunriseHour;
  if (dayLength <= 0) return 0;
  const x = (hour - sun.sunriseHour) / dayLength;
  if (x <= 0 || x >= 1) return 0;
  return sun.noonSineElevation * Math.sin(Math.PI * x);
}
