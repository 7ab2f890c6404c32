import type { DisplayPrefs } from '@shared/schemas/auth.schema';

export function formatNumber(value: number, decimals: number, locale: string): string {
  return new Intl.NumberFormat(locale, { minimumFractionDigits: decimals, maximumFractionDigits: decimals }).format(value);
}

/** Concentrations span 0.001–100 mg/L: three decimals below 0.1 (free ammonia), two below 10, one above. */
export function formatConcentration(value: number, locale: string): string {
  const abs = Math.abs(value);
  const decimals = abs === 0 ? 2 : abs < 0.1 ? 3 : abs < 10 ? 2 : 1;
  return formatNumber(value, decimals, locale);
}

function dayKey(d: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(d);
}

/** Farm-local HH:MM. */
export function formatClock(iso: string | Date, timeZone: string, locale: string): string {
  return new Intl.DateTimeFormat(locale, { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(new Date(iso));
}

/** Farm-local time, with the date when it is not the farm's today. */
export function formatFarmTime(iso: string | Date, timeZone: string, locale: string, now: Date = new Date()): string {
  const d = new Date(iso);
  if (dayKey(d, timeZone) === dayKey(now, timeZone)) return formatClock(d, timeZone, locale);
  return new Intl.DateTimeFormat(locale, {
    timeZone,
    day: 'numeric',
    month: 'short',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
  }).format(d);
}

export function formatFarmDate(iso: string | Date, timeZone: string, locale: string): string {
  return new Intl.DateTimeFormat(locale, { timeZone, day: 'numeric', month: 'short' }).format(new Date(iso));
}

export function temperatureIn(valueC: number, unit: DisplayPrefs['temperatureUnit']): number {
  return unit === 'F' ? (valueC * 9) / 5 + 32 : valueC;
}

/** Probe quantities the unit page draws, in order, with their decimals and threshold metrics. */
export const chartQuantities = ['ph', 'water_temperature', 'salinity', 'specific_conductance', 'dissolved_oxygen', 'flow'] as const;
export type ChartQuantity = (typeof chartQuantities)[number];

export const quantityMeta: Record<ChartQuantity, { decimals: number; unit: string; metrics: readonly string[] }> = {
  ph: { decimals: 2, unit: '', metrics: ['ph_min', 'ph_max'] },
  water_temperature: { decimals: 1, unit: '°C', metrics: ['temperature_min', 'temperature_max'] },
  salinity: { decimals: 1, unit: '‰', metrics: ['salinity_max'] },
  specific_conductance: { decimals: 2, unit: 'mS/cm', metrics: [] },
  dissolved_oxygen: { decimals: 1, unit: 'mg/L', metrics: ['do_min'] },
  flow: { decimals: 0, unit: 'L/min', metrics: ['flow_min'] },
};

/** "8.12", "24.3 °C", "5.2 mg/L": a probe value in the reader's units. */
export function formatQuantity(quantity: string, value: number, locale: string, prefs: Pick<DisplayPrefs, 'temperatureUnit'>): string {
  if (quantity === 'water_temperature' || quantity === 'temperature') {
    return `${formatNumber(temperatureIn(value, prefs.temperatureUnit), 1, locale)} °${prefs.temperatureUnit}`;
  }
  const meta = quantityMeta[quantity as ChartQuantity];
  if (!meta) return formatNumber(value, 2, locale);
  const n = formatNumber(value, meta.decimals, locale);
  return meta.unit ? `${n} ${meta.unit}` : n;
}
