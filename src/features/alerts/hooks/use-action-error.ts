import { useTranslation } from 'react-i18next';
import { isApiError } from '@/lib/api-client';

/** A failed alert action in words the manager can act on. */
export function useActionError(error: unknown): string | null {
  const { t } = useTranslation();
  if (!error) return null;
  if (isApiError(error)) {
    if (error.status === 0) return t('errors.network');
    if (error.code === 'alert_resolved' || error.status === 409) return t('alerts.errors.resolved');
    if (error.status === 403) return t('alerts.errors.forbidden');
    if (error.status === 404) return t('alerts.errors.gone');
    if (error.status === 400) return error.message;
  }
  return t('errors.server');
}
