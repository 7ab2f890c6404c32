import { cx } from './cx';

/**
 * The Gillwise mark: a round amber head with three gill arcs and an eye — a fish breathing easy.
 */
export function GillwiseMark({ size = 36, className }: { size?: number; className?: string }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true" focusable="false" className={className}>
      <circle cx="16" cy="16" r="14.5" fill="var(--color-ember-400)" />
      <path
        d="M12.5 8.5c2.6 2 3.9 4.5 3.9 7.5s-1.3 5.5-3.9 7.5M17 9.5c2.2 1.8 3.3 4 3.3 6.5s-1.1 4.7-3.3 6.5M21.5 11c1.6 1.4 2.4 3 2.4 5s-.8 3.6-2.4 5"
        fill="none"
        stroke="var(--color-abyss-900)"
        strokeWidth="2.2"
        strokeLinecap="round"
      />
      <circle cx="8.6" cy="13.2" r="1.9" fill="var(--color-abyss-900)" />
    </svg>
  );
}

export function Wordmark({ className, size = 34 }: { className?: string; size?: number }) {
  return (
    <span className={cx('inline-flex items-center gap-2 font-bold tracking-tight', className)}>
      <GillwiseMark size={size} />
      <span className="text-[1.4rem] leading-none">
        Gill<span className="text-ember-300">wise</span>
      </span>
    </span>
  );
}
