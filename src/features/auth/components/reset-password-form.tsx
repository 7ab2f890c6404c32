import { zodResolver } from '@hookform/resolvers/zod';
import { passwordResetConfirmSchema } from '@shared/schemas/auth.schema';
import { useForm } from 'react-hook-form';
import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { z } from 'zod';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { applyServerFieldErrors, fieldErrorText, requestErrorText } from '@/lib/form-errors';
import { useConfirmPasswordReset } from '../api/password-reset';
import { PasswordInput } from './password-input';

const PASSWORD_MIN = 10;

/** The shared rule for the new password, plus "type it again". */
export const resetPasswordFormSchema = passwordResetConfirmSchema
  .pick({ password: true })
  .extend({ confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'mismatch' });

type ResetPasswordValues = z.infer<typeof resetPasswordFormSchema>;

export function ResetPasswordForm({ token }: { token: string }) {
  const { t } = useTranslation();
  const mutation = useConfirmPasswordReset();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<ResetPasswordValues>({
    resolver: zodResolver(resetPasswordFormSchema),
    defaultValues: { password: '', confirm: '' },
  });

  const onSubmit = handleSubmit(async ({ password }) => {
    try {
      await mutation.mutateAsync({ token, password });
    } catch (e) {
      applyServerFieldErrors(e, setError, ['password']);
    }
  });

  if (mutation.isSuccess) {
    return (
      <div className="flex flex-col gap-5">
        <Callout tone="success" live title={t('reset.doneTitle')}>
          {t('reset.doneBody')}
        </Callout>
        <Link to={paths.signIn} className="gw-link inline-flex min-h-12 items-center justify-center">
          {t('auth.backToSignIn')}
        </Link>
      </div>
    );
  }

  const badToken =
    isApiError(mutation.error) && (mutation.error.code === 'invalid_token' || mutation.error.fieldErrors.token);

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-5">
      <PasswordInput
        label={t('reset.password')}
        hint={t('reset.hint', { min: PASSWORD_MIN })}
        autoComplete="new-password"
        error={fieldErrorText(t, errors.password, { too_small: t('errors.passwordMin', { min: PASSWORD_MIN }) })}
        {...register('password')}
      />
      <PasswordInput
        label={t('reset.confirm')}
        autoComplete="new-password"
        error={fieldErrorText(t, errors.confirm, { custom: t('errors.passwordMismatch') })}
        {...register('confirm')}
      />
      {badToken ? (
        <Callout tone="danger" live title={t('reset.invalidTokenTitle')}>
          <p>{t('reset.invalidToken')}</p>
          <Link to={paths.forgotPassword} className="gw-link mt-2 inline-flex min-h-12 items-center">
            {t('reset.requestNew')}
          </Link>
        </Callout>
      ) : mutation.error && !errors.password ? (
        <Callout tone="danger" live>
          {requestErrorText(t, mutation.error)}
        </Callout>
      ) : null}
      <Button type="submit" size="lg" fullWidth loading={mutation.isPending}>
        {t('reset.submit')}
      </Button>
    </form>
  );
}

/** Whether a token from the link can be sent at all (the server still decides if it is valid). */
export function isPlausibleResetToken(token: string | null): token is string {
  return passwordResetConfirmSchema.shape.token.safeParse(token).success;
}
