import type { ButtonHTMLAttributes, ReactNode, Ref } from 'react';
import { cx } from './cx';
import { Spinner } from './spinner';

export type ButtonVariant = 'primary' | 'accent' | 'secondary' | 'ghost' | 'onDark' | 'danger';
export type ButtonSize = 'md' | 'lg' | 'icon';

const variants: Record<ButtonVariant, string> = {
  primary: 'bg-abyss-700 text-white hover:bg-abyss-800 active:bg-abyss-900 border-2 border-abyss-700',
  accent: 'bg-ember-400 text-abyss-950 hover:bg-ember-300 active:bg-ember-500 border-2 border-ember-500',
  secondary: 'bg-card text-abyss-900 border-2 border-abyss-700 hover:bg-abyss-50 active:bg-abyss-100',
  ghost: 'bg-transparent text-abyss-800 border-2 border-transparent hover:bg-abyss-50 active:bg-abyss-100',
  onDark: 'bg-transparent text-white border-2 border-abyss-500 hover:bg-abyss-800 active:bg-abyss-950',
  danger: 'bg-act text-white border-2 border-act hover:bg-act-ink',
};

const sizes: Record<ButtonSize, string> = {
  md: 'min-h-12 px-5 text-lg gap-2',
  lg: 'min-h-14 px-6 text-xl gap-3',
  icon: 'min-h-12 min-w-12 px-2',
};

export function buttonClasses({
  variant = 'primary',
  size = 'md',
  fullWidth,
  className,
}: { variant?: ButtonVariant; size?: ButtonSize; fullWidth?: boolean; className?: string } = {}) {
  return cx(
    'inline-flex select-none items-center justify-center rounded-xl font-bold leading-tight transition-colors',
    'disabled:cursor-not-allowed disabled:opacity-60',
    variants[variant],
    sizes[size],
    fullWidth && 'w-full',
    className,
  );
}

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: ButtonVariant;
  size?: ButtonSize;
  fullWidth?: boolean;
  /** Shows a spinner, disables the button and sets aria-busy. */
  loading?: boolean;
  icon?: ReactNode;
  ref?: Ref<HTMLButtonElement>;
}

export function Button({
  variant,
  size,
  fullWidth,
  loading = false,
  icon,
  className,
  children,
  disabled,
  type = 'button',
  ...rest
}: ButtonProps) {
  return (
    <button
      type={type}
      className={buttonClasses({ variant, size, fullWidth, className })}
      disabled={disabled || loading}
      aria-busy={loading || undefined}
      {...rest}
    >
      {loading ? <Spinner size={20} /> : icon}
      {children}
    </button>
  );
}
