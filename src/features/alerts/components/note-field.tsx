import { useId } from 'react';
import { cx } from '@/components/ui/cx';

export interface NoteFieldProps {
  label: string;
  value: string;
  onChange: (value: string) => void;
  hint?: string;
  error?: string;
  required?: boolean;
  autoFocus?: boolean;
}

/** A multi-line note with the house field look (label, hint, error tied to the control). */
export function NoteField({ label, value, onChange, hint, error, required, autoFocus }: NoteFieldProps) {
  const id = useId();
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
        value={value}
        rows={3}
        autoFocus={autoFocus}
        required={required}
        aria-required={required || undefined}
        aria-invalid={error ? true : undefined}
        aria-describedby={[hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined}
        onChange={(e) => onChange(e.target.value)}
        className={cx(
          'block w-full rounded-xl border-2 bg-card px-4 py-3 text-lg text-ink',
          error ? 'border-act' : 'border-line hover:border-abyss-500',
        )}
      />
      {error ? (
        <p id={errorId} className="flex items-start gap-1.5 text-base font-bold text-act">
          <span aria-hidden="true">◆</span>
          <span>{error}</span>
        </p>
      ) : null}
    </div>
  );
}
