export { login, useLogin } from './api/login';
export { confirmPasswordReset, requestPasswordReset } from './api/password-reset';
export { ForgotPasswordForm } from './components/forgot-password-form';
export { isPlausibleResetToken, ResetPasswordForm } from './components/reset-password-form';
export { SignInForm } from './components/sign-in-form';
