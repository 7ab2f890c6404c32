import { cx } from './cx';

export interface SpinnerProps {
  /** Announced to screen readers; omit when the surrounding element already says what is loading. */
  label?: string;
  size?: number;
  className?: string;
}

export function Spinner({ label, size = 24, className }: SpinnerProps) {
  const svg = (
    <svg
      width={size}
      height={size}
      viewBox="0 0 24 24"
      aria-hidden="true"
      className={cx('animate-spin motion-reduce:animate-[spin_3s_linear_infinite]', className)}
    >
      <circle cx="12" cy="12" r="9.5" fill="none" stroke="currentColor" strokeOpacity="0.25" strokeWidth="3" />
      <path d="M12 2.5a9.5 9.5 0 0 1 9.5 9.5" fill="none" stroke="currentColor" strokeWidth="3" strokeLinecap="round" />
    </svg>
  );
  if (!label) return svg;
  return (
    <span role="status" aria-live="polite" className="inline-flex items-center gap-3">
      {svg}
      <span className="sr-only">{label}</span>
    </span>
  );
}

export function FullPageSpinner({ label }: { label: string }) {
  return (
    <div className="grid min-h-dvh place-items-center bg-paper text-abyss-800">
      <div className="flex flex-col items-center gap-4">
        <Spinner size={44} />
        <p role="status" aria-live="polite" className="text-lg font-bold">
          {label}
        </p>
      </div>
    </div>
  );
}
