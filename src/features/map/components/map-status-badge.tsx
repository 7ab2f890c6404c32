import { useTranslation } from 'react-i18next';
import { cx } from '@/components/ui/cx';
import { StatusBadge } from '@/components/ui/status-badge';
import type { MapStatus } from '../lib/palette';

/** The house status badge, plus a neutral one for a unit the server has not rated yet. */
export function MapStatusBadge({ status, size = 'md', className }: { status: MapStatus; size?: 'sm' | 'md' | 'lg'; className?: string }) {
  const { t } = useTranslation();
  if (status !== 'unrated') return <StatusBadge status={status} size={size} className={className} />;
  const word = t('map.unrated');
  return (
    <span
      role="img"
      aria-label={t('status.aria', { status: word })}
      data-status="unrated"
      className={cx(
        'inline-flex items-center gap-1.5 rounded-full border-2 border-muted bg-card px-3 py-1 text-base font-bold uppercase leading-none tracking-wide text-muted',
        size === 'sm' && 'gap-1 px-2 py-0.5 text-sm',
        className,
      )}
    >
      <span aria-hidden="true">–</span>
      <span aria-hidden="true">{word}</span>
    </span>
  );
}
