import { lazy, Suspense } from 'react';
import { useTranslation } from 'react-i18next';
import { Spinner } from '@/components/ui/spinner';
import type { UnitPageProps } from './unit-page';

// The unit page brings uPlot; loading it on demand keeps uPlot out of every screen that only shows the unit sheet.
const LazyUnitPage = lazy(() => import('./unit-page').then((m) => ({ default: m.UnitPage })));

export function UnitPage(props: UnitPageProps) {
  const { t } = useTranslation();
  return (
    <Suspense fallback={<Spinner label={t('units.loading')} />}>
      <LazyUnitPage {...props} />
    </Suspense>
  );
}
