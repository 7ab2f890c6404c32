import type { AlertDto } from '@shared/schemas/alerts.schema';
import type { TFunction } from 'i18next';

function dayKey(d: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(d);
}

/** Farm-local time, with the date when it is not the farm's today. */
export function formatFarmTime(iso: string, timeZone: string, locale: string, now: Date = new Date()): string {
  const d = new Date(iso);
  const sameDay = dayKey(d, timeZone) === dayKey(now, timeZone);
  return new Intl.DateTimeFormat(locale, {
    timeZone,
    hour: '2-digit',
    hourCycle: 'h23',
    minute: '2-digit',
    ...(sameDay ? {} : { day: 'numeric', month: 'short' }),
  }).format(d);
}

function formatValue(value: number, locale: string): string {
  const abs = Math.abs(value);
  const decimals = abs === 0 ? 1 : abs < 0.1 ? 3 : abs < 10 ? 2 : abs < 100 ? 1 : 0;
  return new Intl.NumberFormat(locale, { maximumFractionDigits: decimals, minimumFractionDigits: Math.min(decimals, 1) }).format(value);
}

/** "0.052 mg/L NH3 — act limit 0.05 mg/L NH3", when the alert is about a measured value and a limit. */
export function measuredLine(alert: AlertDto, t: TFunction, locale: string): string | null {
  const value = alert.values.value;
  const { basis } = alert.rule;
  // The limit of the level the alert stands at (an alert raised from watch to act shows the act limit).
  const threshold = alert.rule[alert.level] ?? alert.rule.threshold;
  if (typeof value !== 'number' || threshold === null) return null;
  const unit = basis && basis !== 'pH' ? ` ${basis}` : '';
  return t('alerts.measured', {
    value: `${formatValue(value, locale)}${unit}`,
    limit: `${formatValue(threshold, locale)}${unit}`,
    level: t(`alerts.levelLimit.${alert.level}`),
  });
}
