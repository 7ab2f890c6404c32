import { useTranslation } from 'react-i18next';
import { useParams } from 'react-router';
import { Callout } from '@/components/ui/callout';
import { Spinner } from '@/components/ui/spinner';
import { farmPath } from '@/config/paths';
import { FarmUnitList, StatusSummary, useFarmEventStream, useFarmStatus } from '@/features/map';
import { useCurrentFarm } from '@/lib/current-farm';

/** Every unit of the farm, most urgent first, each a link to its page. */
export default function UnitsRoute() {
  const { t } = useTranslation();
  const { farmId = '' } = useParams();
  const current = useCurrentFarm();
  const status = useFarmStatus(farmId);
  useFarmEventStream(farmId);
  const units = status.data?.units ?? [];
  return (
    <div className="flex flex-col gap-5" data-testid="units-screen">
      <title>{`${t('nav.units')} · ${current?.farm.name ?? ''} · Gillwise`}</title>
      <header className="flex flex-col gap-3">
        <h1 className="text-3xl font-bold leading-tight">{t('units.list.title')}</h1>
        <p className="max-w-prose text-lg text-muted">{t('units.list.intro')}</p>
        {units.length ? <StatusSummary units={units} /> : null}
      </header>
      {status.isPending ? (
        <Spinner label={t('map.loading')} />
      ) : status.isError ? (
        <Callout tone="danger" title={t('map.loadFailed')} />
      ) : (
        <FarmUnitList
          title={t('units.list.listTitle')}
          units={units}
          timeZone={status.data.timeZone}
          unitHref={(unitId) => farmPath('unit', farmId, { unitId })}
        />
      )}
    </div>
  );
}
