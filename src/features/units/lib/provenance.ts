import type { DisplayPrefs } from '@shared/schemas/auth.schema';
import type { FreeAmmoniaResultDto } from '@shared/schemas/water-tests.schema';
import type { TFunction } from 'i18next';
import { formatClock, formatQuantity } from './format';

type ProvenanceValue = FreeAmmoniaResultDto['provenance']['values'][number];

export interface ProvenanceContext {
  t: TFunction;
  locale: string;
  timeZone: string;
  prefs: Pick<DisplayPrefs, 'temperatureUnit'>;
  sampledAt: string;
}

/**
 * Where a value used for free ammonia came from, in words:
 *   "pH 8.12 from probe P1 sonde at 06:58, interpolated between readings at 06:55 and 07:00".
 */
export function describeProvenance(v: ProvenanceValue, ctx: ProvenanceContext): string {
  const { t, locale, timeZone, prefs } = ctx;
  const quantity = t(`units.quantity.${v.quantity}`, { defaultValue: v.quantity });
  const value = formatQuantity(v.quantity, v.value, locale, prefs);
  const probe = v.probeLabel ?? t('units.provenance.unnamedProbe');
  const clock = (iso: string) => formatClock(iso, timeZone, locale);
  switch (v.source) {
    case 'probe':
      return t('units.provenance.probe', { quantity, value, probe, time: clock(v.readings[0]?.at ?? ctx.sampledAt) });
    case 'probe_interpolated': {
      const [a, b] = v.readings;
      return a && b
        ? t('units.provenance.interpolated', { quantity, value, probe, time: clock(ctx.sampledAt), from: clock(a.at), to: clock(b.at) })
        : t('units.provenance.interpolatedShort', { quantity, value, probe, time: clock(ctx.sampledAt) });
    }
    case 'handheld':
      return t('units.provenance.handheld', { quantity, value });
    case 'unit_default':
      return t('units.provenance.unitDefault', { quantity, value });
  }
}

/** Known flag codes get our own words (with the treatment and hours when the server names them); others show the server's message. */
export function describeFlag(flag: { code: string; message: string }, t: TFunction): string {
  if (flag.code === 'nessler_interference') {
    const m = /A ([a-z ]+?) treatment (\d+) h before/i.exec(flag.message);
    const product = m?.[1];
    return product
      ? t('units.flag.nesslerAfter', {
          product: t(`units.product.${product.replace(' ', '_')}`, { defaultValue: product }),
          hours: Number(m[2]),
        })
      : t('units.flag.nessler');
  }
  if (flag.code === 'out_of_range') return t('units.flag.outOfRange', { message: flag.message });
  return flag.message;
}
