import { useTranslation } from 'react-i18next';
import { useParams } from 'react-router';
import { RecordsScreen } from '@/features/records';
import { useCurrentFarm } from '@/lib/current-farm';

/** Inspection-ready records for a period: on screen, printed and as CSV. */
export default function RecordsRoute() {
  const { t } = useTranslation();
  const { farmId = '' } = useParams();
  const current = useCurrentFarm();
  return (
    <div className="flex flex-col gap-5" data-testid="records-screen">
      <title>{`${t('nav.records')} · ${current?.farm.name ?? ''} · Gillwise`}</title>
      <header className="gw-no-print">
        <h1 className="text-3xl font-bold leading-tight">{t('records.title')}</h1>
        <p className="mt-1 max-w-prose text-base text-muted sm:text-lg">{t('records.intro')}</p>
      </header>
      <RecordsScreen farmId={farmId} timeZone={current?.farm.timeZone ?? 'UTC'} />
    </div>
  );
}
