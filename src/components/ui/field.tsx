import { useId, type InputHTMLAttributes, type ReactNode, type Ref, type SelectHTMLAttributes } from 'react';
import { cx } from './cx';
import { Icon } from './icon';

const controlBase =
  'block w-full min-h-12 rounded-xl border-2 px-4 text-lg placeholder:text-muted ' +
  'transition-colors disabled:bg-abyss-50 disabled:text-muted';

function controlClasses(invalid: boolean) {
  return cx(controlBase, 'bg-card text-ink', invalid ? 'border-act' : 'border-line hover:border-abyss-500');
}

const darkControl =
  'block w-full min-h-12 rounded-xl border-2 border-abyss-500 bg-abyss-800 px-4 text-lg font-bold text-white hover:border-abyss-300';

interface FieldFrameProps {
  id: string;
  label: ReactNode;
  hint?: ReactNode;
  error?: ReactNode;
  hintId: string;
  errorId: string;
  required?: boolean;
  className?: string;
  children: ReactNode;
}

function FieldFrame({ id, label, hint, error, hintId, errorId, className, children }: FieldFrameProps) {
  return (
    <div className={cx('flex flex-col gap-1.5', className)}>
      <label htmlFor={id} className="text-base font-bold text-ink">
        {label}
      </label>
      {hint ? (
        <p id={hintId} className="text-sm text-muted">
          {hint}
        </p>
      ) : null}
      {children}
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

function describedBy(hint: unknown, error: unknown, hintId: string, errorId: string, extra?: string) {
  return [hint ? hintId : null, error ? errorId : null, extra].filter(Boolean).join(' ') || undefined;
}

export interface TextFieldProps extends Omit<InputHTMLAttributes<HTMLInputElement>, 'size'> {
  label: ReactNode;
  hint?: ReactNode;
  /** Message shown under the field; also sets aria-invalid. */
  error?: ReactNode;
  /** Something inside the right edge of the field (a unit, a show-password button). */
  trailing?: ReactNode;
  containerClassName?: string;
  ref?: Ref<HTMLInputElement>;
}

export function TextField({
  label,
  hint,
  error,
  trailing,
  id: givenId,
  className,
  containerClassName,
  required,
  ...rest
}: TextFieldProps) {
  const autoId = useId();
  const id = givenId ?? autoId;
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  return (
    <FieldFrame
      id={id}
      label={label}
      hint={hint}
      error={error}
      hintId={hintId}
      errorId={errorId}
      className={containerClassName}
    >
      <div className="relative flex items-stretch">
        <input
          id={id}
          className={cx(controlClasses(Boolean(error)), trailing ? 'pr-16' : undefined, className)}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy(hint, error, hintId, errorId, rest['aria-describedby'])}
          aria-required={required || undefined}
          {...rest}
        />
        {trailing ? <div className="absolute inset-y-0 right-1 flex items-center">{trailing}</div> : null}
      </div>
    </FieldFrame>
  );
}

export interface NumberFieldProps extends Omit<TextFieldProps, 'type' | 'inputMode' | 'trailing'> {
  /** Unit shown inside the field, e.g. "mg/L" or "°C". */
  unit?: ReactNode;
}

/** A number entry that brings up the decimal keypad on phones. Accepts "7.4" and "7,4". */
export function NumberField({ unit, autoComplete = 'off', ...rest }: NumberFieldProps) {
  return (
    <TextField
      type="text"
      inputMode="decimal"
      autoComplete={autoComplete}
      spellCheck={false}
      trailing={unit ? <span className="px-3 text-lg font-bold text-muted">{unit}</span> : undefined}
      {...rest}
    />
  );
}

/** "7,4" → 7.4; blank or not a number → undefined. */
export function parseDecimal(value: string | null | undefined): number | undefined {
  if (value == null) return undefined;
  const cleaned = value.trim().replace(/\s/g, '').replace(',', '.');
  if (cleaned === '' || !/^[-+]?(\d+\.?\d*|\.\d+)$/.test(cleaned)) return undefined;
  return Number(cleaned);
}

export interface SelectOption {
  value: string;
  label: string;
  disabled?: boolean;
}

export interface SelectProps extends Omit<SelectHTMLAttributes<HTMLSelectElement>, 'size'> {
  label: ReactNode;
  options: readonly SelectOption[];
  hint?: ReactNode;
  error?: ReactNode;
  placeholder?: string;
  containerClassName?: string;
  /** Hide the label visually (still read by screen readers). */
  hideLabel?: boolean;
  /** 'dark' for use on the top bar. */
  tone?: 'light' | 'dark';
  ref?: Ref<HTMLSelectElement>;
}

export function Select({
  label,
  options,
  hint,
  error,
  placeholder,
  id: givenId,
  className,
  containerClassName,
  hideLabel,
  tone = 'light',
  ...rest
}: SelectProps) {
  const autoId = useId();
  const id = givenId ?? autoId;
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  return (
    <FieldFrame
      id={id}
      label={hideLabel ? <span className="sr-only">{label}</span> : label}
      hint={hint}
      error={error}
      hintId={hintId}
      errorId={errorId}
      className={cx(hideLabel && 'gap-0', containerClassName)}
    >
      <div className="relative">
        <select
          id={id}
          className={cx(tone === 'dark' ? darkControl : controlClasses(Boolean(error)), 'appearance-none pr-12', className)}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy(hint, error, hintId, errorId)}
          {...rest}
        >
          {placeholder ? (
            <option value="" disabled>
              {placeholder}
            </option>
          ) : null}
          {options.map((o) => (
            <option key={o.value} value={o.value} disabled={o.disabled}>
              {o.label}
            </option>
          ))}
        </select>
        <Icon
          name="chevronDown"
          className="pointer-events-none absolute right-4 top-1/2 -translate-y-1/2 text-current opacity-80"
        />
      </div>
    </FieldFrame>
  );
}
