import { useTranslation } from 'react-i18next';
import { useParams, useSearchParams } from 'react-router';
import { alertTabs, AlertsScreen, type AlertTab } from '@/features/alerts';
import { useFarmEventStream } from '@/features/map';
import { useCurrentFarm } from '@/lib/current-farm';

function isTab(v: string | null): v is AlertTab {
  return v !== null && (alertTabs as readonly string[]).includes(v);
}

/** Alerts: open, acknowledged and resolved; the filters live in the URL so a link can point at one unit's alerts. */
export default function AlertsRoute() {
  const { t } = useTranslation();
  const { farmId = '' } = useParams();
  const current = useCurrentFarm();
  useFarmEventStream(farmId);
  const [params, setParams] = useSearchParams();
  const stateParam = params.get('state');
  const tab: AlertTab = isTab(stateParam) ? stateParam : 'open';

  return (
    <div className="flex flex-col gap-5" data-testid="alerts-screen">
      <title>{`${t('nav.alerts')} · ${current?.farm.name ?? ''} · Gillwise`}</title>
      <header>
        <h1 className="text-3xl font-bold leading-tight">{t('alerts.title')}</h1>
        <p className="mt-1 max-w-prose text-base text-muted sm:text-lg">{t('alerts.intro')}</p>
      </header>
      <AlertsScreen
        farmId={farmId}
        timeZone={current?.farm.timeZone ?? 'UTC'}
        tab={tab}
        unitId={params.get('unit') ?? undefined}
        kind={params.get('kind') ?? undefined}
        onChange={(next) => {
          const p = new URLSearchParams();
          if (next.tab !== 'open') p.set('state', next.tab);
          if (next.unitId) p.set('unit', next.unitId);
          if (next.kind) p.set('kind', next.kind);
          setParams(p, { replace: true });
        }}
      />
    </div>
  );
}
