import type { TFunction } from 'i18next';
import type { FieldError, FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { isApiError } from './api-client';

/**
 * Turn a react-hook-form error (from the shared zod schema via zodResolver, whose `type` is the zod
 * issue code) into words in the user's language. `overrides` maps an issue code to a sentence.
 */
export function fieldErrorText(
  t: TFunction,
  error: FieldError | undefined,
  overrides: Partial<Record<string, string>> = {},
): string | undefined {
  if (!error) return undefined;
  const code = String(error.type);
  if (code === 'server') return error.message;
  const override = overrides[code];
  if (override) return override;
  switch (code) {
    case 'invalid_type':
    case 'too_small':
      return t('errors.required');
    case 'too_big':
      return t('errors.tooLong');
    case 'invalid_format':
      return t('errors.format');
    default:
      return error.message || t('errors.invalid');
  }
}

/** Put the server's `details.fieldErrors` beside the matching fields. Returns true if any matched. */
export function applyServerFieldErrors<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  fields: readonly Path<T>[],
): boolean {
  if (!isApiError(error)) return false;
  let matched = false;
  for (const [field, messages] of Object.entries(error.fieldErrors)) {
    if ((fields as readonly string[]).includes(field) && messages[0]) {
      setError(field as Path<T>, { type: 'server', message: messages[0] });
      matched = true;
    }
  }
  return matched;
}

/** A sentence for a failed request, for a form-level message. */
export function requestErrorText(t: TFunction, error: unknown): string {
  if (isApiError(error)) {
    if (error.code === 'network' || error.status === 0) return t('errors.network');
    if (error.status === 429 || error.code === 'rate_limited') return t('errors.rateLimited');
    if (error.status >= 500) return t('errors.server');
    if (error.message) return error.message;
  }
  return t('errors.server');
}
