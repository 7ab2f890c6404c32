import type { UnitStatusDto } from '@shared/schemas/farms.schema';
import { useQuery } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { buttonClasses } from '@/components/ui/button';
import { Sheet } from '@/components/ui/dialog';
import { Icon } from '@/components/ui/icon';
import { StatusBadge } from '@/components/ui/status-badge';
import { unitQueries } from '../api/unit-queries';
import { useMediaQuery } from '../hooks/use-media-query';
import { FreeAmmoniaPanel } from './free-ammonia-panel';
import { LatestValues } from './latest-values';

export interface UnitSheetProps {
  farmId: string;
  timeZone: string;
  unit: UnitStatusDto | null;
  onClose: () => void;
  unitHref: string;
  /** The unit's open alerts, composed in by the route (the alerts feature owns them). */
  alerts?: ReactNode;
}

/** What a manager needs about one unit, without leaving the map: a side sheet (a bottom sheet on phones). */
export function UnitSheet({ farmId, timeZone, unit, onClose, unitHref, alerts }: UnitSheetProps) {
  const { t } = useTranslation();
  const wide = useMediaQuery('(min-width: 768px)');
  return (
    <Sheet
      open={unit !== null}
      onClose={onClose}
      side={wide ? 'right' : 'bottom'}
      className={wide ? 'w-[min(28rem,100vw)]' : undefined}
      title={unit ? `${unit.code} · ${unit.name}` : ''}
      description={
        unit
          ? [
              t(`units.kind.${unit.kind}`),
              t(`units.water.${unit.waterType}`),
              unit.state !== 'active' ? t(`units.stateShort.${unit.state}`) : null,
            ]
              .filter(Boolean)
              .join(' · ')
          : undefined
      }
      footer={
        unit ? (
          <Link to={unitHref} className={buttonClasses({ variant: 'primary', fullWidth: true })} data-testid="unit-page-link">
            {t('units.sheet.openPage')}
            <Icon name="arrowRight" />
          </Link>
        ) : null
      }
    >
      {unit ? <UnitSummary farmId={farmId} timeZone={timeZone} unit={unit} alerts={alerts} /> : null}
    </Sheet>
  );
}

export function UnitSummary({
  farmId,
  timeZone,
  unit,
  alerts,
}: {
  farmId: string;
  timeZone: string;
  unit: UnitStatusDto;
  alerts?: ReactNode;
}) {
  const { t } = useTranslation();
  const latest = useQuery(unitQueries.latestResult(farmId, unit.id));
  return (
    <div className="flex flex-col gap-5" data-testid="unit-summary" data-unit={unit.code}>
      <div className="flex flex-wrap items-center gap-3">
        {unit.status ? (
          <>
            <StatusBadge status={unit.status} size="lg" />
            <p className="text-base">{t(`status.describe.${unit.status}`)}</p>
          </>
        ) : (
          <p className="text-base text-muted">{t('units.sheet.unrated')}</p>
        )}
      </div>

      <section aria-labelledby="sheet-values">
        <h3 id="sheet-values" className="mb-2 text-lg font-bold">
          {t('units.sheet.latest')}
        </h3>
        <LatestValues unit={unit} timeZone={timeZone} />
      </section>

      <section aria-labelledby="sheet-nh3">
        <h3 id="sheet-nh3" className="mb-2 text-lg font-bold">
          {t('units.sheet.nh3')}
        </h3>
        {latest.isPending ? (
          <p className="text-muted">{t('common.loading')}</p>
        ) : latest.isError ? (
          <p className="text-act-ink">{t('units.loadFailed')}</p>
        ) : (
          <FreeAmmoniaPanel result={latest.data} timeZone={timeZone} />
        )}
      </section>

      {alerts ? (
        <section aria-labelledby="sheet-alerts">
          <h3 id="sheet-alerts" className="mb-2 text-lg font-bold">
            {t('units.sheet.alerts')}
          </h3>
          {alerts}
        </section>
      ) : null}
    </div>
  );
}
