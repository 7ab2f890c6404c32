import { useTranslation } from 'react-i18next';
import { ForgotPasswordForm } from '@/features/auth';
import { AuthLayout } from '../auth-layout';

export default function ForgotPasswordRoute() {
  const { t } = useTranslation();
  return (
    <AuthLayout title={t('forgot.title')} intro={t('forgot.intro')}>
      <ForgotPasswordForm />
    </AuthLayout>
  );
}
