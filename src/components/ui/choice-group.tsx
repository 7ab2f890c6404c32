import { useId, type ReactNode } from 'react';
import { cx } from './cx';

export interface Choice<V extends string> {
  value: V;
  label: ReactNode;
  /** A second line in plain words. */
  description?: ReactNode;
}

export interface ChoiceGroupProps<V extends string> {
  legend: ReactNode;
  hint?: ReactNode;
  error?: ReactNode;
  name: string;
  value: V | '';
  choices: readonly Choice<V>[];
  onChange: (value: V) => void;
  /** Columns on wide screens; phones always stack or pair. */
  columns?: 1 | 2 | 3;
  className?: string;
}

/**
 * Big radio buttons (a whole card is the target, at least 56 px tall): easy with wet fingers, and the
 * arrow keys move between them on a keyboard.
 */
export function ChoiceGroup<V extends string>({
  legend,
  hint,
  error,
  name,
  value,
  choices,
  onChange,
  columns = 2,
  className,
}: ChoiceGroupProps<V>) {
  const id = useId();
  const grid = columns === 1 ? 'grid-cols-1' : columns === 2 ? 'grid-cols-2' : 'grid-cols-2 sm:grid-cols-3';
  return (
    <fieldset
      className={cx('flex flex-col gap-2', className)}
      aria-describedby={cx(hint ? `${id}-hint` : null, error ? `${id}-error` : null) || undefined}
    >
      <legend className="mb-1 text-base font-bold text-ink">{legend}</legend>
      {hint ? (
        <p id={`${id}-hint`} className="-mt-1 text-sm text-muted">
          {hint}
        </p>
      ) : null}
      <div className={cx('grid gap-2', grid)}>
        {choices.map((c) => {
          const checked = c.value === value;
          return (
            <label key={c.value} className="relative flex">
              <input
                type="radio"
                name={name}
                value={c.value}
                checked={checked}
                onChange={() => onChange(c.value)}
                className="peer sr-only"
              />
              <span
                className={cx(
                  'flex min-h-14 w-full cursor-pointer flex-col justify-center rounded-xl border-2 px-4 py-2 leading-tight transition-colors',
                  'peer-focus-visible:outline-3 peer-focus-visible:outline-offset-2 peer-focus-visible:outline-ember-400',
                  checked ? 'border-abyss-800 bg-abyss-800 text-white' : 'border-line bg-card text-ink hover:border-abyss-500',
                )}
              >
                <span className="flex items-center gap-2 text-lg font-bold">
                  <span
                    aria-hidden="true"
                    className={cx(
                      'grid size-5 shrink-0 place-items-center rounded-full border-2',
                      checked ? 'border-ember-300 bg-ember-300' : 'border-abyss-500',
                    )}
                  >
                    {checked ? <span className="size-2 rounded-full bg-abyss-900" /> : null}
                  </span>
                  {c.label}
                </span>
                {c.description ? (
                  <span className={cx('mt-0.5 text-sm', checked ? 'text-abyss-100' : 'text-muted')}>{c.description}</span>
                ) : null}
              </span>
            </label>
          );
        })}
      </div>
      {error ? (
        <p id={`${id}-error`} className="flex items-start gap-1.5 text-base font-bold text-act">
          <span aria-hidden="true">◆</span>
          <span>{error}</span>
        </p>
      ) : null}
    </fieldset>
  );
}
