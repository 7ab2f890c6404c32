import { celsiusToFahrenheit, fahrenheitToCelsius } from '@shared/chemistry';
import type { DisplayPrefs } from '@shared/schemas/auth.schema';

/** Free ammonia needs more decimals the smaller it is: 0.0042, 0.031, 0.262, 1.43. */
export function formatConcentration(value: number, locale: string): string {
  const abs = Math.abs(value);
  const digits = abs === 0 ? 0 : abs < 0.01 ? 4 : abs < 1 ? 3 : abs < 10 ? 2 : 1;
  return new Intl.NumberFormat(locale, { minimumFractionDigits: Math.min(digits, 2), maximumFractionDigits: digits }).format(value);
}

export function formatNumber(value: number, locale: string, maximumFractionDigits = 2): string {
  return new Intl.NumberFormat(locale, { maximumFractionDigits }).format(value);
}

/** A wall-clock time in the farm's time zone, e.g. 06:58. */
export function farmClock(at: string | Date, timeZone: string, locale: string): string {
  try {
    return new Intl.DateTimeFormat(locale, { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(new Date(at));
  } catch {
    return '';
  }
}

/** Day and time in the farm's time zone, e.g. "Tue 1 Dec, 06:58". */
export function farmDateTime(at: string | Date, timeZone: string, locale: string): string {
  try {
    return new Intl.DateTimeFormat(locale, {
      timeZone,
      weekday: 'short',
      day: 'numeric',
      month: 'short',
      hour: '2-digit',
      minute: '2-digit',
      hourCycle: 'h23',
    }).format(new Date(at));
  } catch {
    return '';
  }
}

export type TemperatureUnit = DisplayPrefs['temperatureUnit'];

export const temperatureSymbol = (unit: TemperatureUnit) => (unit === 'F' ? '°F' : '°C');

/** °C → the user's unit. */
export function toDisplayTemperature(temperatureC: number, unit: TemperatureUnit): number {
  return unit === 'F' ? celsiusToFahrenheit({ temperatureC }) : temperatureC;
}

/** The user's unit → °C (what the API stores). */
export function fromDisplayTemperature(value: number, unit: TemperatureUnit): number {
  return unit === 'F' ? fahrenheitToCelsius({ temperatureF: value }) : value;
}

export function formatTemperature(temperatureC: number, unit: TemperatureUnit, locale: string): string {
  return `${formatNumber(toDisplayTemperature(temperatureC, unit), locale, 1)}\u00a0${temperatureSymbol(unit)}`;
}
