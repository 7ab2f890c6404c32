import type { UnitEvaluationDto } from '@shared/schemas/alerts.schema';
import { useTranslation } from 'react-i18next';
import { useDisplay } from '../hooks/use-display';
import { formatConcentration, formatNumber, formatQuantity } from '../lib/format';

export type EpaReferenceData = Pick<
  UnitEvaluationDto['reference']['epa2013'],
  'applicable' | 'note' | 'pH' | 'temperatureC' | 'cmcMgL' | 'cccMgL' | 'oncorhynchusPresent' | 'latestTanMgL'
>;

/** US EPA 2013 freshwater ammonia criteria at the unit's pH and temperature: ambient criteria for natural waters, shown for reference. */
export function EpaReference({ epa }: { epa: EpaReferenceData }) {
  const { t } = useTranslation();
  const { locale, prefs } = useDisplay();
  return (
    <section aria-labelledby="epa-title" className="gw-card px-5 py-4" data-testid="epa-reference">
      <h2 id="epa-title" className="text-xl font-bold">
        {t('units.epa.title')}
      </h2>
      <p className="mt-1 text-base text-muted">{t('units.epa.explain')}</p>
      {epa.applicable && epa.cmcMgL !== null && epa.cccMgL !== null && epa.pH !== null && epa.temperatureC !== null ? (
        <>
          <dl className="mt-3 grid gap-3 sm:grid-cols-3">
            <div>
              <dt className="text-sm font-bold text-muted">{t('units.epa.cmc')}</dt>
              <dd className="text-xl font-bold tabular-nums">
                {formatConcentration(epa.cmcMgL, locale)} {t('units.unit.tan')}
              </dd>
            </div>
            <div>
              <dt className="text-sm font-bold text-muted">{t('units.epa.ccc')}</dt>
              <dd className="text-xl font-bold tabular-nums">
                {formatConcentration(epa.cccMgL, locale)} {t('units.unit.tan')}
              </dd>
            </div>
            <div>
              <dt className="text-sm font-bold text-muted">{t('units.epa.latestTan')}</dt>
              <dd className="text-xl font-bold tabular-nums">
                {epa.latestTanMgL === null ? '—' : `${formatConcentration(epa.latestTanMgL, locale)} ${t('units.unit.tan')}`}
              </dd>
            </div>
          </dl>
          <p className="mt-2 text-sm text-muted">
            {t('units.epa.at', {
              ph: formatNumber(epa.pH, 2, locale),
              temperature: formatQuantity('water_temperature', epa.temperatureC, locale, prefs),
            })}{' '}
            {epa.oncorhynchusPresent ? t('units.epa.trout') : t('units.epa.noTrout')}
          </p>
        </>
      ) : (
        <p className="mt-3 text-base">{t('units.epa.notApplicable')}</p>
      )}
    </section>
  );
}
