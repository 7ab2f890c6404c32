import { useId, type ReactNode, type Ref, type TextareaHTMLAttributes } from 'react';
import { cx } from '@/components/ui/cx';

export interface TextAreaFieldProps extends TextareaHTMLAttributes<HTMLTextAreaElement> {
  label: ReactNode;
  hint?: ReactNode;
  error?: ReactNode;
  ref?: Ref<HTMLTextAreaElement>;
}

/** A multi-line field with the house field look; works with react-hook-form's register(). */
export function TextAreaField({ label, hint, error, id: givenId, className, required, rows = 3, ...rest }: TextAreaFieldProps) {
  const autoId = useId();
  const id = givenId ?? autoId;
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  return (
    <div className="flex flex-col gap-1.5">
      <label htmlFor={id} className="text-base font-bold text-ink">
        {label}
      </label>
      {hint ? (
        <p id={hintId} className="text-sm text-muted">
          {hint}
        </p>
      ) : null}
      <textarea
        id={id}
        rows={rows}
        aria-required={required || undefined}
        aria-invalid={error ? true : undefined}
        aria-describedby={[hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined}
        className={cx(
          'block w-full rounded-xl border-2 bg-card px-4 py-3 text-lg text-ink',
          error ? 'border-act' : 'border-line hover:border-abyss-500',
          className,
        )}
        {...rest}
      />
      {error ? (
        <p id={errorId} className="flex items-start gap-1.5 text-base font-bold text-act">
          <span aria-hidden="true" className="mt-0.5">
            ◆
          </span>
          <span>{error}</span>
        </p>
      ) : null}
    </div>
  );
}
