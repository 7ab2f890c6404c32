import { useTranslation } from 'react-i18next';
import { Link, useSearchParams } from 'react-router';
import { Callout } from '@/components/ui/callout';
import { paths } from '@/config/paths';
import { isPlausibleResetToken, ResetPasswordForm } from '@/features/auth';
import { AuthLayout } from '../auth-layout';

export default function ResetPasswordRoute() {
  const { t } = useTranslation();
  const [params] = useSearchParams();
  const token = params.get('token');
  return (
    <AuthLayout title={t('reset.title')}>
      {isPlausibleResetToken(token) ? (
        <ResetPasswordForm token={token} />
      ) : (
        <Callout tone="danger" title={t('reset.invalidTokenTitle')}>
          <p>{t('reset.missingToken')}</p>
          <Link to={paths.forgotPassword} className="gw-link mt-2 inline-flex min-h-12 items-center">
            {t('reset.requestNew')}
          </Link>
        </Callout>
      )}
    </AuthLayout>
  );
}
