import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Link, Navigate, Outlet, useLocation, useNavigate } from 'react-router';
import { Wordmark } from '@/components/ui/brand';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { Icon } from '@/components/ui/icon';
import { FullPageSpinner } from '@/components/ui/spinner';
import { paths, signInPath } from '@/config/paths';
import { useAuth } from '@/lib/auth';
import { useCurrentFarm } from '@/lib/current-farm';
import { useLiveEvents } from '@/lib/live-events';
import { LanguageSwitch } from '../language-switch';
import { homePathFor, navFor } from '../nav';
import { AboutDialog } from './about-dialog';
import { FarmPicker } from './farm-picker';
import { MoreSheet } from './more-sheet';
import { ShellFooter } from './shell-footer';
import { SideNav } from './side-nav';
import { overflowEntries, TabBar } from './tab-bar';

/** Sends anyone not signed in to /sign-in, remembering where they were going. */
export function RequireAuth({ children }: { children: React.ReactNode }) {
  const { status, signedOutReason, retry } = useAuth();
  const location = useLocation();
  const { t } = useTranslation();
  if (status === 'loading') return <FullPageSpinner label={t('shell.checkingSession')} />;
  if (status === 'error') {
    return (
      <main id="main" className="mx-auto max-w-xl px-5 py-16">
        <EmptyState
          icon="caution"
          title={t('shell.unreachableTitle')}
          action={
            <Button variant="primary" onClick={retry}>
              {t('common.retry')}
            </Button>
          }
        >
          {t('errors.network')}
        </EmptyState>
      </main>
    );
  }
  if (status === 'signed-out') {
    const next = signedOutReason === 'session' ? location.pathname + location.search : null;
    return <Navigate to={signInPath(next)} replace />;
  }
  return <>{children}</>;
}

export function AppShell() {
  return (
    <RequireAuth>
      <FarmShell />
    </RequireAuth>
  );
}

function FarmShell() {
  const { t } = useTranslation();
  const { me, signOut } = useAuth();
  const current = useCurrentFarm();
  const navigate = useNavigate();
  const [moreOpen, setMoreOpen] = useState(false);
  const [aboutOpen, setAboutOpen] = useState(false);
  const [signingOut, setSigningOut] = useState(false);
  useLiveEvents(current?.farm.id);

  if (!me) return null;

  const handleSignOut = async () => {
    setSigningOut(true);
    try {
      await signOut();
    } catch {
      /* the session is dropped locally either way */
    }
    setSigningOut(false);
    setMoreOpen(false);
    void navigate(paths.signIn, { replace: true });
  };

  const entries = current ? navFor(current.role) : [];
  const farms = me.farms;
  const homeHref = current ? homePathFor(current.role, current.farm.id) : paths.root;

  return (
    <div className="flex min-h-dvh flex-col bg-paper">
      <a
        href="#main"
        className="sr-only z-50 rounded-xl bg-ember-400 px-4 py-3 font-bold text-abyss-950 focus:not-sr-only focus:fixed focus:left-3 focus:top-3"
      >
        {t('shell.skipToContent')}
      </a>
      <header className="sticky top-0 z-30 bg-abyss-900 text-white shadow-md">
        <div className="flex h-16 items-center gap-3 px-3 sm:px-4">
          <Link to={homeHref} className="flex min-h-12 items-center rounded-xl px-1" aria-label={t('shell.homeLink')}>
            <Wordmark size={32} />
          </Link>
          {current && farms.length > 1 ? (
            <FarmPicker farms={farms} currentId={current.farm.id} className="ml-4 hidden w-72 lg:block" />
          ) : current ? (
            <span className="ml-4 hidden truncate text-lg font-bold text-abyss-100 lg:inline">{current.farm.name}</span>
          ) : null}
          <div className="ml-auto flex items-center gap-2">
            <LanguageSwitch tone="dark" />
            {current ? (
              <span className="hidden text-right leading-tight xl:block">
                <span className="block font-bold">{me.user.name}</span>
                <span className="block text-sm text-abyss-200">{t(`roles.${current.role}`)}</span>
              </span>
            ) : null}
            <Button
              variant="onDark"
              size="icon"
              className="sm:px-4"
              onClick={() => void handleSignOut()}
              loading={signingOut}
              aria-label={t('shell.signOut')}
              icon={signingOut ? undefined : <Icon name="signOut" />}
            >
              <span className="hidden sm:inline">{t('shell.signOut')}</span>
            </Button>
          </div>
        </div>
        {current && farms.length > 1 ? (
          <div className="px-3 pb-3 lg:hidden">
            <FarmPicker farms={farms} currentId={current.farm.id} />
          </div>
        ) : current ? (
          <p className="truncate px-4 pb-2 text-base font-bold text-abyss-100 lg:hidden">{current.farm.name}</p>
        ) : null}
      </header>

      <div className="flex flex-1">
        {current ? <SideNav entries={entries} farmId={current.farm.id} onAbout={() => setAboutOpen(true)} /> : null}
        <main id="main" tabIndex={-1} className="min-w-0 flex-1 px-4 pb-32 pt-5 sm:px-6 lg:px-10 lg:pb-10 lg:pt-8">
          <div className="mx-auto max-w-4xl">
            {current ? <Outlet /> : <FarmNotFound />}
            <ShellFooter onAbout={() => setAboutOpen(true)} />
          </div>
        </main>
      </div>

      {current ? (
        <>
          <TabBar entries={entries} farmId={current.farm.id} moreOpen={moreOpen} onMore={() => setMoreOpen(true)} />
          <MoreSheet
            open={moreOpen}
            onClose={() => setMoreOpen(false)}
            entries={overflowEntries(entries)}
            farmId={current.farm.id}
            me={me}
            role={current.role}
            farmName={current.farm.name}
            onAbout={() => setAboutOpen(true)}
            onSignOut={() => void handleSignOut()}
            signingOut={signingOut}
          />
        </>
      ) : null}
      <AboutDialog open={aboutOpen} onClose={() => setAboutOpen(false)} />
    </div>
  );
}

function FarmNotFound() {
  const { t } = useTranslation();
  return (
    <>
      <title>{`${t('farmNotFound.title')} · Gillwise`}</title>
      <EmptyState
        icon="caution"
        title={t('farmNotFound.title')}
        action={
          <Link to={paths.root} className="gw-link inline-flex min-h-12 items-center">
            {t('notFound.home')}
          </Link>
        }
      >
        {t('farmNotFound.body')}
      </EmptyState>
    </>
  );
}
