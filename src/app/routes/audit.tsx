import { useTranslation } from 'react-i18next';
import { useParams } from 'react-router';
import { AuditScreen } from '@/features/audit';
import { useCurrentFarm } from '@/lib/current-farm';

/** The audit log of the farm. */
export default function AuditRoute() {
  const { t } = useTranslation();
  const { farmId = '' } = useParams();
  const current = useCurrentFarm();
  return (
    <div className="flex flex-col gap-5" data-testid="audit-screen">
      <title>{`${t('nav.audit')} · ${current?.farm.name ?? ''} · Gillwise`}</title>
      <header>
        <h1 className="text-3xl font-bold leading-tight">{t('audit.title')}</h1>
        <p className="mt-1 max-w-prose text-base text-muted sm:text-lg">{t('audit.intro')}</p>
      </header>
      <AuditScreen farmId={farmId} timeZone={current?.farm.timeZone ?? 'UTC'} />
    </div>
  );
}
