import type { RecommendationDto } from '@shared/schemas/feed.schema';
import { useTranslation } from 'react-i18next';
import { cx } from '@/components/ui/cx';

const looks = {
  feed: { glyph: '●', className: 'border-clear bg-clear-soft text-clear-ink' },
  cut: { glyph: '▲', className: 'border-watch bg-watch-soft text-watch-ink' },
  withhold: { glyph: '◆', className: 'border-act-ink bg-act text-white' },
} as const;

/** What the rule proposes, as colour, shape and words: feed ●, cut N % ▲, withhold ◆. */
export function ActionPill({ action, cutPct, className }: { action: RecommendationDto['action']; cutPct: number; className?: string }) {
  const { t } = useTranslation();
  const look = looks[action];
  return (
    <span
      data-action={action}
      className={cx(
        'inline-flex items-center gap-1.5 rounded-full border-2 px-3 py-1 text-base font-bold leading-none',
        look.className,
        className,
      )}
    >
      <span aria-hidden="true">{look.glyph}</span>
      {action === 'cut' ? t('rations.action.cut', { pct: Math.round(cutPct) }) : t(`rations.action.${action}`)}
    </span>
  );
}
