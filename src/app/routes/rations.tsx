import { useTranslation } from 'react-i18next';
import { useParams, useSearchParams } from 'react-router';
import { farmPath } from '@/config/paths';
import { isDay, RationsScreen, type RationView } from '@/features/rations';
import { useCurrentFarm } from '@/lib/current-farm';

/** Rations of a farm-local day (?day=YYYY-MM-DD, today by default; ?view=sheet for the hands' printable sheet). */
export default function RationsRoute() {
  const { t } = useTranslation();
  const { farmId = '' } = useParams();
  const current = useCurrentFarm();
  const [params, setParams] = useSearchParams();
  const dayParam = params.get('day');
  const day = isDay(dayParam) ? dayParam : null;
  const view: RationView = params.get('view') === 'sheet' ? 'sheet' : 'plan';
  const role = current?.role;
  const canDecide = role === 'planner' || role === 'manager' || role === 'admin';

  const update = (next: { day?: string | null; view?: RationView }) => {
    const p = new URLSearchParams(params);
    const d = next.day === undefined ? day : next.day;
    const v = next.view ?? view;
    if (d) p.set('day', d);
    else p.delete('day');
    if (v === 'sheet') p.set('view', 'sheet');
    else p.delete('view');
    setParams(p, { replace: true });
  };

  return (
    <div className="flex flex-col gap-5" data-testid="rations-screen">
      <title>{`${t('nav.rations')} · ${current?.farm.name ?? ''} · Gillwise`}</title>
      <header className="gw-no-print">
        <h1 className="text-3xl font-bold leading-tight">{t('rations.title')}</h1>
        <p className="mt-1 max-w-prose text-base text-muted sm:text-lg">{t('rations.intro')}</p>
      </header>
      <RationsScreen
        farmId={farmId}
        farmName={current?.farm.name ?? ''}
        timeZone={current?.farm.timeZone ?? 'UTC'}
        day={day}
        onDay={(d) => update({ day: d })}
        view={view}
        onView={(v) => update({ view: v })}
        unitHref={(unitId) => farmPath('unit', farmId, { unitId })}
        canDecide={canDecide}
      />
    </div>
  );
}
