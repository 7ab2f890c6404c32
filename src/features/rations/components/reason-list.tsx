import type { FeedReasonDto } from '@shared/schemas/feed.schema';
import { useTranslation } from 'react-i18next';
import { cx } from '@/components/ui/cx';

const glyph: Record<FeedReasonDto['effect'], { mark: string; className: string }> = {
  withhold: { mark: '◆', className: 'text-act' },
  cut: { mark: '▲', className: 'text-watch' },
  cap: { mark: '▲', className: 'text-watch' },
  note: { mark: '•', className: 'text-abyss-600' },
};

/** The rule's reasons in plain words, each with what it did (withhold, cut, cap, note) and its source. */
export function ReasonList({ reasons, compact }: { reasons: readonly FeedReasonDto[]; compact?: boolean }) {
  const { t } = useTranslation();
  if (reasons.length === 0) return <p className="text-base text-muted">{t('rations.noReasons')}</p>;
  return (
    <ul className="flex flex-col gap-2" data-testid="reason-list">
      {reasons.map((r) => (
        <li key={`${r.code}-${r.text}`} className="flex gap-2" data-reason={r.code}>
          <span aria-hidden="true" className={cx('mt-0.5 w-4 shrink-0 text-center font-bold', glyph[r.effect].className)}>
            {glyph[r.effect].mark}
          </span>
          <span className="min-w-0">
            <span className="sr-only">{t(`rations.effect.${r.effect}`)}: </span>
            <span className="text-base">{r.text}</span>
            {r.source && !compact ? <span className="block text-sm text-muted">{t('rations.source', { source: r.source })}</span> : null}
          </span>
        </li>
      ))}
    </ul>
  );
}
