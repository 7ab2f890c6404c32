import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { buttonClasses } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { paths } from '@/config/paths';

export default function NotFoundRoute() {
  const { t } = useTranslation();
  return (
    <main id="main" className="mx-auto w-full max-w-xl px-5 py-16">
      <title>{`${t('notFound.title')} · Gillwise`}</title>
      <EmptyState
        icon="map"
        title={t('notFound.title')}
        action={
          <Link to={paths.root} className={buttonClasses({ variant: 'primary' })}>
            {t('notFound.home')}
          </Link>
        }
      >
        {t('notFound.body')}
      </EmptyState>
    </main>
  );
}
