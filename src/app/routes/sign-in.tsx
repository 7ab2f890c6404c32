import type { MeResponse } from '@shared/schemas/auth.schema';
import { useTranslation } from 'react-i18next';
import { Navigate, useNavigate, useSearchParams } from 'react-router';
import { Callout } from '@/components/ui/callout';
import { FullPageSpinner } from '@/components/ui/spinner';
import { paths, safeNext } from '@/config/paths';
import { SignInForm } from '@/features/auth';
import { roleOnFarm, useAuth } from '@/lib/auth';
import { AuthLayout } from '../auth-layout';
import { homePathFor } from '../nav';

function landingFor(me: MeResponse, next: string | null): string {
  const target = safeNext(next);
  if (target) return target;
  const first = me.farms[0];
  return first ? homePathFor(roleOnFarm(me, first), first.id) : paths.root;
}

export default function SignInRoute() {
  const { t } = useTranslation();
  const { me, status } = useAuth();
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const next = params.get('next');

  if (status === 'loading') return <FullPageSpinner label={t('shell.checkingSession')} />;
  if (me) return <Navigate to={landingFor(me, next)} replace />;

  return (
    <AuthLayout title={t('signIn.title')} intro={t('signIn.intro')}>
      {safeNext(next) ? (
        <Callout tone="info" className="mb-5">
          {t('signIn.sessionEnded')}
        </Callout>
      ) : null}
      <SignInForm onSignedIn={(signedIn) => navigate(landingFor(signedIn, next), { replace: true })} />
    </AuthLayout>
  );
}
