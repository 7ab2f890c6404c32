import { useTranslation } from 'react-i18next';
import { cx } from './cx';

export const unitStatuses = ['clear', 'watch', 'act', 'silent'] as const;
export type UnitStatus = (typeof unitStatuses)[number];

/** Colour, shape and word together, so the status reads in sun glare and without colour vision. */
export const statusStyle: Record<UnitStatus, { glyph: string; className: string }> = {
  clear: { glyph: '●', className: 'bg-clear-soft text-clear-ink border-clear' },
  watch: { glyph: '▲', className: 'bg-watch-soft text-watch-ink border-watch' },
  act: { glyph: '◆', className: 'bg-act text-white border-act-ink' },
  silent: { glyph: '○', className: 'bg-silent-soft text-silent-ink border-silent border-dashed' },
};

const glyphColour: Record<UnitStatus, string> = {
  clear: 'text-clear',
  watch: 'text-watch',
  act: 'text-white',
  silent: 'text-silent',
};

export interface StatusBadgeProps {
  status: UnitStatus;
  size?: 'sm' | 'md' | 'lg';
  className?: string;
}

const sizes = {
  sm: 'text-sm px-2 py-0.5 gap-1 border-2',
  md: 'text-base px-3 py-1 gap-1.5 border-2',
  lg: 'text-xl px-4 py-2 gap-2 border-[3px]',
} as const;

export function StatusBadge({ status, size = 'md', className }: StatusBadgeProps) {
  const { t } = useTranslation();
  const { glyph, className: colours } = statusStyle[status];
  const word = t(`status.${status}`);
  return (
    <span
      role="img"
      aria-label={t('status.aria', { status: word })}
      data-status={status}
      className={cx(
        'inline-flex items-center rounded-full font-bold uppercase tracking-wide leading-none',
        `status-${status}`,
        colours,
        sizes[size],
        className,
      )}
    >
      <span aria-hidden="true" className={cx('leading-none', glyphColour[status])}>
        {glyph}
      </span>
      <span aria-hidden="true">{word}</span>
    </span>
  );
}
