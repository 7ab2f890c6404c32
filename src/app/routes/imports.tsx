import { useTranslation } from 'react-i18next';
import { useParams } from 'react-router';
import { ImportsScreen } from '@/features/imports';
import { useCurrentFarm } from '@/lib/current-farm';

/** Imports (CSV upload, mapping, row check, commit) and CSV exports. */
export default function ImportsRoute() {
  const { t } = useTranslation();
  const { farmId = '' } = useParams();
  const current = useCurrentFarm();
  return (
    <div className="flex flex-col gap-5" data-testid="imports-screen">
      <title>{`${t('nav.imports')} · ${current?.farm.name ?? ''} · Gillwise`}</title>
      <header>
        <h1 className="text-3xl font-bold leading-tight">{t('imports.title')}</h1>
        <p className="mt-1 max-w-prose text-base text-muted sm:text-lg">{t('imports.intro')}</p>
      </header>
      <ImportsScreen farmId={farmId} timeZone={current?.farm.timeZone ?? 'UTC'} />
    </div>
  );
}
