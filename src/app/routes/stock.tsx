import { useTranslation } from 'react-i18next';
import { useParams, useSearchParams } from 'react-router';
import { StockScreen } from '@/features/stock';
import { useCurrentFarm } from '@/lib/current-farm';

/** Stock of the farm; ?unit=<id> opens one unit. */
export default function StockRoute() {
  const { t } = useTranslation();
  const { farmId = '' } = useParams();
  const current = useCurrentFarm();
  const [params, setParams] = useSearchParams();
  return (
    <div className="flex flex-col gap-5" data-testid="stock-screen">
      <title>{`${t('nav.stock')} · ${current?.farm.name ?? ''} · Gillwise`}</title>
      <header>
        <h1 className="text-3xl font-bold leading-tight">{t('stock.title')}</h1>
        <p className="mt-1 max-w-prose text-base text-muted sm:text-lg">{t('stock.intro')}</p>
      </header>
      <StockScreen
        farmId={farmId}
        timeZone={current?.farm.timeZone ?? 'UTC'}
        unitId={params.get('unit')}
        onUnit={(unitId) => setParams({ unit: unitId }, { replace: true })}
      />
    </div>
  );
}
