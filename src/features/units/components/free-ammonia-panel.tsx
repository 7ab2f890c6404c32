import type { FreeAmmoniaResultDto } from '@shared/schemas/water-tests.schema';
import { useTranslation } from 'react-i18next';
import { Callout } from '@/components/ui/callout';
import { useDisplay } from '../hooks/use-display';
import { formatClock, formatConcentration, formatFarmTime, formatNumber } from '../lib/format';
import { describeFlag, describeProvenance } from '../lib/provenance';

export interface FreeAmmoniaPanelProps {
  result: FreeAmmoniaResultDto | null;
  timeZone: string;
  /** Show where each input came from (the unit page does; the map's sheet keeps it short). */
  detailed?: boolean;
  /** For tests: the moment that decides whether the peak is still ahead. */
  now?: number;
}

/** The latest computed free ammonia of a unit, the afternoon peak forecast and any kit flags. */
export function FreeAmmoniaPanel({ result, timeZone, detailed = false, now = Date.now() }: FreeAmmoniaPanelProps) {
  const { t } = useTranslation();
  const { locale, prefs } = useDisplay();
  if (!result) return <p className="text-base text-muted">{t('units.nh3.none')}</p>;

  const asN = prefs.ammoniaBasis === 'nh3-n';
  const unit = asN ? t('units.unit.nh3n') : t('units.unit.nh3');
  const nh3 = asN ? result.nh3NMgL : result.nh3MgL;
  const peak = result.forecastPeak;
  const peakValue = peak ? (asN ? peak.nh3NMgL : peak.nh3MgL) : null;
  const ctx = { t, locale, timeZone, prefs, sampledAt: result.sampledAt };

  return (
    <div className={detailed ? 'grid gap-4 md:grid-cols-2' : 'flex flex-col gap-3'} data-testid="free-ammonia">
      <div className="flex flex-col gap-3">
        {result.status === 'ok' && nh3 !== null ? (
          <div>
            <p className="flex flex-wrap items-baseline gap-x-2">
              <span className="text-3xl font-bold tabular-nums">{formatConcentration(nh3, locale)}</span>
              <span className="text-lg font-bold">{unit}</span>
            </p>
            <p className="text-base text-muted">
              {t('units.nh3.from', {
                tan: result.tanMgL === null ? '—' : formatConcentration(result.tanMgL, locale),
                time: formatFarmTime(result.sampledAt, timeZone, locale),
              })}
            </p>
          </div>
        ) : (
          <Callout tone="caution" title={t(`units.nh3.status.${result.status}`)}>
            {t('units.nh3.notComputed', { time: formatFarmTime(result.sampledAt, timeZone, locale) })}
          </Callout>
        )}

        {peak && peakValue !== null ? (
          <div className="rounded-xl border-2 border-ember-500 bg-ember-50 px-4 py-3" data-testid="forecast-peak">
            <p className="font-bold">{Date.parse(peak.at) < now ? t('units.nh3.peakPastTitle') : t('units.nh3.peakTitle')}</p>
            <p className="text-base">
              {t(Date.parse(peak.at) < now ? 'units.nh3.peakPast' : 'units.nh3.peak', {
                value: formatConcentration(peakValue, locale),
                unit,
                time: peak.localTime,
              })}
            </p>
            {peak.morningTestNote && nh3 ? (
              <p className="mt-1 text-sm text-muted">
                {t('units.nh3.morningNote', {
                  tested: formatClock(result.sampledAt, timeZone, locale),
                  ratio: formatNumber(peakValue / Math.max(nh3, 1e-9), 1, locale),
                  time: peak.localTime,
                })}
              </p>
            ) : (
              <p className="mt-1 text-sm text-muted">{t('units.nh3.peakBasis', { hours: peak.basedOnHours })}</p>
            )}
          </div>
        ) : null}

        {result.flags.length > 0 ? (
          <ul className="flex flex-col gap-2" data-testid="result-flags">
            {result.flags.map((f) => (
              <li key={f.code}>
                <Callout tone="caution">{describeFlag(f, t)}</Callout>
              </li>
            ))}
          </ul>
        ) : null}
      </div>
      {detailed ? (
        <ul className="list-disc space-y-1 self-start pl-5 text-base">
          {result.provenance.values.map((v) => (
            <li key={v.quantity}>{describeProvenance(v, ctx)}</li>
          ))}
          {result.provenance.missing.map((q) => (
            <li key={q}>
              {t('units.provenance.missing', { quantity: t(`units.quantity.${q}`), minutes: result.provenance.windowMinutes })}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
