import { useTranslation } from 'react-i18next';
import { useParams, useSearchParams } from 'react-router';
import { farmPath } from '@/config/paths';
import { useFarmEventStream } from '@/features/map';
import { isDay, MorningReportView } from '@/features/reports';
import { useCurrentFarm } from '@/lib/current-farm';

/** Morning report of a farm-local day (?day=YYYY-MM-DD; today's by default). */
export default function MorningReportRoute() {
  const { t } = useTranslation();
  const { farmId = '' } = useParams();
  const current = useCurrentFarm();
  useFarmEventStream(farmId);
  const [params, setParams] = useSearchParams();
  const dayParam = params.get('day');
  const day = isDay(dayParam) ? dayParam : null;
  return (
    <div className="flex flex-col gap-5" data-testid="morning-report-screen">
      <title>{`${t('nav.morningReport')} · ${current?.farm.name ?? ''} · Gillwise`}</title>
      <header>
        <h1 className="text-3xl font-bold leading-tight">{t('reports.title')}</h1>
        <p className="mt-1 max-w-prose text-base text-muted sm:text-lg">{t('reports.intro')}</p>
      </header>
      <MorningReportView
        farmId={farmId}
        day={day}
        onDay={(d) => setParams(d ? { day: d } : {}, { replace: true })}
        unitHref={(unitId) => farmPath('unit', farmId, { unitId })}
        alertsHref={farmPath('alerts', farmId)}
      />
    </div>
  );
}
