import type { UnitStatusDto } from '@shared/schemas/farms.schema';
import { useTranslation } from 'react-i18next';
import { cx } from '@/components/ui/cx';
import { mapStatusOf, statusGlyph, type MapStatus } from '../lib/palette';

const tone: Record<MapStatus, string> = {
  act: 'bg-act text-white border-act-ink',
  watch: 'bg-watch-soft text-watch-ink border-watch',
  silent: 'bg-silent-soft text-silent-ink border-silent border-dashed',
  clear: 'bg-clear-soft text-clear-ink border-clear',
  unrated: 'bg-card text-ink border-muted',
};

const order: MapStatus[] = ['act', 'watch', 'silent', 'clear', 'unrated'];

/** How many units are in each status, most urgent first (statuses with no unit are left out). */
export function StatusSummary({ units, className }: { units: readonly UnitStatusDto[]; className?: string }) {
  const { t } = useTranslation();
  const counts = new Map<MapStatus, number>();
  for (const u of units) counts.set(mapStatusOf(u.status), (counts.get(mapStatusOf(u.status)) ?? 0) + 1);
  return (
    <ul className={cx('flex flex-wrap gap-2', className)} aria-label={t('map.summaryLabel')} data-testid="status-summary">
      {order
        .filter((s) => counts.get(s))
        .map((s) => (
          <li
            key={s}
            data-status={s}
            className={cx('inline-flex items-center gap-1.5 rounded-full border-2 px-3 py-1 text-base font-bold', tone[s])}
          >
            <span aria-hidden="true">{statusGlyph[s]}</span>
            <span>{t('map.summaryCount', { count: counts.get(s), status: s === 'unrated' ? t('map.unrated') : t(`status.${s}`) })}</span>
          </li>
        ))}
    </ul>
  );
}
