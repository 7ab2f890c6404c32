import type { UnitStatusDto } from '@shared/schemas/farms.schema';
import { useTranslation } from 'react-i18next';
import { cx } from '@/components/ui/cx';
import { useDisplay } from '../hooks/use-display';
import { formatFarmTime, formatQuantity } from '../lib/format';

type Quantity = keyof UnitStatusDto['latest'];

/** Which probe values a unit shows: pH, temperature, salinity (or conductance), DO, and flow where water flows through. */
export function shownQuantities(unit: Pick<UnitStatusDto, 'kind' | 'latest' | 'waterType'>): Quantity[] {
  const list: Quantity[] = ['ph', 'water_temperature'];
  if (unit.latest.salinity || unit.waterType !== 'fresh') list.push('salinity');
  if (unit.latest.specific_conductance && !unit.latest.salinity) list.push('specific_conductance');
  list.push('dissolved_oxygen');
  if (unit.kind !== 'pond' || unit.latest.flow) list.push('flow');
  return list;
}

/** The newest probe value of each quantity, with its farm-local time and a word when ingest flagged it. */
export function LatestValues({ unit, timeZone, className }: { unit: UnitStatusDto; timeZone: string; className?: string }) {
  const { t } = useTranslation();
  const { locale, prefs } = useDisplay();
  return (
    <dl className={cx('grid grid-cols-2 gap-2', className)} data-testid="latest-values">
      {shownQuantities(unit).map((q) => {
        const v = unit.latest[q];
        return (
          <div key={q} className="rounded-xl border-2 border-line bg-paper px-3 py-2" data-quantity={q}>
            <dt className="text-sm font-bold text-muted">{t(`units.quantity.${q}`)}</dt>
            <dd>
              {v ? (
                <>
                  <span className="block whitespace-nowrap text-xl font-bold tabular-nums">
                    {formatQuantity(q, v.value, locale, prefs)}
                  </span>
                  <span className="block text-sm text-muted">
                    {t('units.values.at', { time: formatFarmTime(v.at, timeZone, locale) })}
                    {v.quality !== 'good' ? (
                      <span className="ml-1 font-bold text-watch-ink">
                        <span aria-hidden="true">▲ </span>
                        {t(`units.values.quality.${v.quality}`)}
                      </span>
                    ) : null}
                  </span>
                </>
              ) : (
                <span className="block text-base text-muted">{t('units.values.none')}</span>
              )}
            </dd>
          </div>
        );
      })}
    </dl>
  );
}
