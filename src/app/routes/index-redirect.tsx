import { Navigate } from 'react-router';
import { useTranslation } from 'react-i18next';
import { EmptyState } from '@/components/ui/empty-state';
import { Button } from '@/components/ui/button';
import { paths } from '@/config/paths';
import { roleOnFarm, useAuth } from '@/lib/auth';
import { RequireAuth } from '../shell/app-shell';
import { homePathFor } from '../nav';

/** "/" → the first farm's home for the user's role there, or sign-in. */
export default function IndexRedirectRoute() {
  return (
    <RequireAuth>
      <ToFirstFarm />
    </RequireAuth>
  );
}

function ToFirstFarm() {
  const { me, signOut } = useAuth();
  const { t } = useTranslation();
  const first = me?.farms[0];
  if (me && first) return <Navigate to={homePathFor(roleOnFarm(me, first), first.id)} replace />;
  return (
    <main id="main" className="mx-auto max-w-xl px-5 py-16">
      <title>{`${t('noFarms.title')} · Gillwise`}</title>
      <EmptyState
        icon="fish"
        title={t('noFarms.title')}
        action={
          <Button variant="primary" onClick={() => void signOut().then(() => window.location.assign(paths.signIn))}>
            {t('shell.signOut')}
          </Button>
        }
      >
        {t('noFarms.body')}
      </EmptyState>
    </main>
  );
}
