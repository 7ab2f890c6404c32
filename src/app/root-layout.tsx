import { useTranslation } from 'react-i18next';
import { isRouteErrorResponse, Link, Outlet, ScrollRestoration, useRouteError } from 'react-router';
import { buttonClasses } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { FullPageSpinner } from '@/components/ui/spinner';
import { env } from '@/config/env';
import { paths } from '@/config/paths';

export function RootLayout() {
  return (
    <>
      <Outlet />
      <ScrollRestoration />
    </>
  );
}

export function BootFallback() {
  const { t } = useTranslation();
  return <FullPageSpinner label={t('common.loading')} />;
}

/** Shown when a route fails to load or throws (e.g. a lazy chunk missing after a deploy). */
export function RouteError() {
  const { t } = useTranslation();
  const error = useRouteError();
  if (env.DEV) console.error(error);
  const notFound = isRouteErrorResponse(error) && error.status === 404;
  return (
    <main id="main" className="mx-auto flex min-h-dvh max-w-xl flex-col justify-center gap-5 px-5 py-10">
      <title>{`${t(notFound ? 'notFound.title' : 'routeError.title')} · Gillwise`}</title>
      <Callout tone="danger" title={t(notFound ? 'notFound.title' : 'routeError.title')}>
        {t(notFound ? 'notFound.body' : 'routeError.body')}
      </Callout>
      <div className="flex flex-wrap gap-3">
        <button type="button" className={buttonClasses({ variant: 'primary' })} onClick={() => window.location.reload()}>
          {t('routeError.reload')}
        </button>
        <Link to={paths.root} className={buttonClasses({ variant: 'secondary' })}>
          {t('notFound.home')}
        </Link>
      </div>
    </main>
  );
}
