import { zodResolver } from '@hookform/resolvers/zod';
import { passwordResetRequestSchema } from '@shared/schemas/auth.schema';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { TextField } from '@/components/ui/field';
import { paths } from '@/config/paths';
import { applyServerFieldErrors, fieldErrorText, requestErrorText } from '@/lib/form-errors';
import { useRequestPasswordReset, type PasswordResetRequest } from '../api/password-reset';

export function ForgotPasswordForm() {
  const { t } = useTranslation();
  const mutation = useRequestPasswordReset();
  const [sentTo, setSentTo] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<PasswordResetRequest>({
    resolver: zodResolver(passwordResetRequestSchema),
    defaultValues: { email: '' },
  });

  const onSubmit = handleSubmit(async ({ email }) => {
    try {
      await mutation.mutateAsync({ email: email.trim() });
      setSentTo(email.trim());
    } catch (e) {
      applyServerFieldErrors(e, setError, ['email']);
    }
  });

  if (sentTo) {
    return (
      <div className="flex flex-col gap-5">
        <Callout tone="success" live title={t('forgot.sentTitle')}>
          {t('forgot.sentBody', { email: sentTo })}
        </Callout>
        <Link to={paths.signIn} className="gw-link inline-flex min-h-12 items-center justify-center">
          {t('auth.backToSignIn')}
        </Link>
      </div>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-5">
      <TextField
        label={t('auth.email')}
        type="email"
        inputMode="email"
        autoComplete="email"
        autoCapitalize="none"
        spellCheck={false}
        error={fieldErrorText(t, errors.email, { invalid_format: t('errors.email') })}
        {...register('email')}
      />
      {mutation.error && !errors.email ? (
        <Callout tone="danger" live>
          {requestErrorText(t, mutation.error)}
        </Callout>
      ) : null}
      <Button type="submit" size="lg" fullWidth loading={mutation.isPending}>
        {t('forgot.submit')}
      </Button>
      <p className="text-center">
        <Link to={paths.signIn} className="gw-link inline-flex min-h-12 items-center px-2">
          {t('auth.backToSignIn')}
        </Link>
      </p>
    </form>
  );
}
