import { zodResolver } from '@hookform/resolvers/zod';
import { loginRequestSchema, type LoginRequest, type MeResponse } from '@shared/schemas/auth.schema';
import { useForm } from 'react-hook-form';
import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { TextField } from '@/components/ui/field';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { applyServerFieldErrors, fieldErrorText, requestErrorText } from '@/lib/form-errors';
import { useLogin } from '../api/login';
import { PasswordInput } from './password-input';

export interface SignInFormProps {
  onSignedIn: (me: MeResponse) => void;
  defaultEmail?: string;
}

export function SignInForm({ onSignedIn, defaultEmail = '' }: SignInFormProps) {
  const { t } = useTranslation();
  const loginMutation = useLogin();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<LoginRequest>({
    resolver: zodResolver(loginRequestSchema),
    defaultValues: { email: defaultEmail, password: '' },
  });

  const onSubmit = handleSubmit(async (values) => {
    try {
      const me = await loginMutation.mutateAsync({ email: values.email.trim(), password: values.password });
      onSignedIn(me);
    } catch (e) {
      applyServerFieldErrors(e, setError, ['email', 'password']);
    }
  });

  const failure = loginMutation.error;
  const failureText = !failure
    ? null
    : isApiError(failure) && (failure.code === 'invalid_credentials' || failure.status === 401)
      ? t('signIn.invalidCredentials')
      : isApiError(failure) && failure.status === 400 && Object.keys(failure.fieldErrors).length > 0
        ? null
        : requestErrorText(t, failure);

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-5" aria-describedby={failureText ? 'sign-in-error' : undefined}>
      <TextField
        label={t('auth.email')}
        type="email"
        inputMode="email"
        autoComplete="username"
        autoCapitalize="none"
        autoCorrect="off"
        spellCheck={false}
        error={fieldErrorText(t, errors.email, { invalid_format: t('errors.email') })}
        {...register('email')}
      />
      <PasswordInput
        label={t('auth.password')}
        autoComplete="current-password"
        error={fieldErrorText(t, errors.password)}
        {...register('password')}
      />
      {failureText ? (
        <Callout id="sign-in-error" tone="danger" live title={t('signIn.failedTitle')}>
          {failureText}
        </Callout>
      ) : null}
      <Button type="submit" size="lg" fullWidth loading={loginMutation.isPending}>
        {loginMutation.isPending ? t('signIn.submitting') : t('signIn.submit')}
      </Button>
      <p className="text-center">
        <Link to={paths.forgotPassword} className="gw-link inline-flex min-h-12 items-center px-2">
          {t('signIn.forgot')}
        </Link>
      </p>
    </form>
  );
}
