import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Link, useParams } from 'react-router';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { Spinner } from '@/components/ui/spinner';
import { farmPath } from '@/config/paths';
import { UnitAlerts } from '@/features/alerts';
import {
  FarmMapPanel,
  FarmUnitList,
  mapQueries,
  StatusSummary,
  useFarmEventStream,
  useFarmStatus,
  useStatusAnnouncements,
} from '@/features/map';
import { UnitSheet } from '@/features/units';
import { useCurrentFarm } from '@/lib/current-farm';

/** Farm map: every unit coloured and shaped by status, live; a unit opens in a side sheet. */
export default function FarmMapRoute() {
  const { t, i18n } = useTranslation();
  const { farmId = '' } = useParams();
  const current = useCurrentFarm();
  const status = useFarmStatus(farmId);
  useFarmEventStream(farmId);
  const probes = useQuery(mapQueries.probes(farmId));
  const [selectedId, setSelectedId] = useState<string | null>(null);
  const announcement = useStatusAnnouncements(status.data?.units);
  const farmName = current?.farm.name ?? '';

  const units = status.data?.units ?? [];
  const timeZone = status.data?.timeZone ?? current?.farm.timeZone ?? 'UTC';
  const selected = units.find((u) => u.id === selectedId) ?? null;
  const updated = status.dataUpdatedAt
    ? new Intl.DateTimeFormat(i18n.language, { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23', second: '2-digit' }).format(
        status.dataUpdatedAt,
      )
    : null;

  return (
    <div className="flex flex-col gap-5" data-testid="map-screen">
      <title>{`${t('nav.map')} · ${farmName} · Gillwise`}</title>
      <header className="flex flex-col gap-3">
        <div className="flex flex-wrap items-end justify-between gap-x-4 gap-y-1">
          <h1 className="text-3xl font-bold leading-tight">{t('map.title')}</h1>
          {updated ? (
            <p className="flex items-center gap-2 text-base text-muted" data-testid="map-updated">
              <span aria-hidden="true" className="inline-block size-2.5 rounded-full bg-clear" />
              {t('map.updated', { time: updated })}
            </p>
          ) : null}
        </div>
        {units.length > 0 ? <StatusSummary units={units} /> : null}
      </header>
      <p className="sr-only" role="status" aria-live="polite" data-testid="map-announcer">
        {announcement}
      </p>

      {status.isPending ? (
        <Spinner label={t('map.loading')} />
      ) : status.isError ? (
        <Callout tone="danger" title={t('map.loadFailed')}>
          <Button variant="secondary" className="mt-2" onClick={() => void status.refetch()}>
            {t('common.retry')}
          </Button>
        </Callout>
      ) : (
        <>
          <FarmMapPanel units={units} probes={probes.data ?? []} selectedId={selectedId} onSelect={setSelectedId} />
          <FarmUnitList title={t('map.listTitle')} units={units} timeZone={timeZone} selectedId={selectedId} onSelect={setSelectedId} />
          <p className="text-base">
            <Link to={farmPath('alerts', farmId)} className="gw-link">
              {t('map.allAlerts')}
            </Link>
          </p>
        </>
      )}

      <UnitSheet
        farmId={farmId}
        timeZone={timeZone}
        unit={selected}
        onClose={() => setSelectedId(null)}
        unitHref={selected ? farmPath('unit', farmId, { unitId: selected.id }) : '#'}
        alerts={selected ? <UnitAlerts farmId={farmId} unitId={selected.id} timeZone={timeZone} /> : null}
      />
    </div>
  );
}
