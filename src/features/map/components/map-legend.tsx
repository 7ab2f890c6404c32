import { useTranslation } from 'react-i18next';
import { unitStatuses } from '@/components/ui/status-badge';
import { cx } from '@/components/ui/cx';
import { statusGlyph } from '../lib/palette';

const swatch = {
  clear: 'bg-clear-soft border-clear text-clear',
  watch: 'bg-watch-soft border-watch text-watch',
  act: 'bg-act border-act-ink text-white',
  silent: 'bg-silent-soft border-silent border-dashed text-silent',
} as const;

/** What the colours, shapes and dots on the map mean. */
export function MapLegend() {
  const { t } = useTranslation();
  return (
    <div className="flex flex-wrap items-center gap-x-4 gap-y-1.5 text-sm sm:gap-x-5 sm:text-base" data-testid="map-legend">
      <span className="font-bold text-muted">{t('map.legend')}</span>
      <ul className="contents">
        {unitStatuses.map((s) => (
          <li key={s} className="inline-flex items-center gap-1.5">
            <span
              aria-hidden="true"
              className={cx('inline-grid h-6 min-w-7 place-items-center rounded-md border-2 text-sm font-bold', swatch[s])}
            >
              {statusGlyph[s]}
            </span>
            <span>{t(`status.${s}`)}</span>
          </li>
        ))}
        <li className="inline-flex items-center gap-1.5">
          <span
            aria-hidden="true"
            className="inline-block size-3.5 rounded-full border-2 border-white bg-abyss-700 ring-1 ring-abyss-700"
          />
          <span>{t('map.legendProbe')}</span>
        </li>
        <li className="inline-flex items-center gap-1.5">
          <span aria-hidden="true" className="inline-block size-3.5 rounded-full border-2 border-silent bg-white" />
          <span>{t('map.legendProbeSilent')}</span>
        </li>
      </ul>
    </div>
  );
}
