import { useTranslation } from 'react-i18next';
import { useParams, useSearchParams } from 'react-router';
import { farmPath } from '@/config/paths';
import { UnitAlerts } from '@/features/alerts';
import { useFarmEventStream } from '@/features/map';
import { isChartRange, UnitPage, type ChartRange } from '@/features/units';
import { useCurrentFarm } from '@/lib/current-farm';

/** One unit: now, charts over a range (in the URL), kit results, alerts. */
export default function UnitRoute() {
  const { t } = useTranslation();
  const { farmId = '', unitId = '' } = useParams();
  const current = useCurrentFarm();
  useFarmEventStream(farmId);
  const [params, setParams] = useSearchParams();
  const rangeParam = params.get('range');
  const range: ChartRange = isChartRange(rangeParam) ? rangeParam : '24h';
  const timeZone = current?.farm.timeZone ?? 'UTC';
  const fromMap = current?.role === 'manager' || current?.role === 'admin';

  return (
    <>
      <title>{`${t('units.page.title')} · ${current?.farm.name ?? ''} · Gillwise`}</title>
      <UnitPage
        key={unitId}
        farmId={farmId}
        unitId={unitId}
        timeZone={timeZone}
        range={range}
        onRange={(r) => setParams(r === '24h' ? {} : { range: r }, { replace: true })}
        backHref={farmPath(fromMap ? 'map' : 'home', farmId)}
        backLabel={fromMap ? t('units.page.backToMap') : t('units.page.backHome')}
        alerts={<UnitAlerts farmId={farmId} unitId={unitId} timeZone={timeZone} />}
      />
    </>
  );
}
