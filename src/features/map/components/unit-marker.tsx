import { useTranslation } from 'react-i18next';
import { cx } from '@/components/ui/cx';
import { statusGlyph, type MapStatus } from '../lib/palette';

const colours: Record<MapStatus, string> = {
  clear: 'bg-clear-soft text-clear-ink border-clear',
  watch: 'bg-watch-soft text-watch-ink border-watch',
  act: 'bg-act text-white border-act-ink',
  silent: 'bg-silent-soft text-silent-ink border-silent border-dashed',
  unrated: 'bg-card text-ink border-muted',
};

const glyphColour: Record<MapStatus, string> = {
  clear: 'text-clear',
  watch: 'text-watch',
  act: 'text-white',
  silent: 'text-silent',
  unrated: 'text-muted',
};

export interface UnitMarkerProps {
  code: string;
  name: string;
  status: MapStatus;
  selected: boolean;
  offset: { dx: number; dy: number };
  onSelect: () => void;
}

/**
 * The label of a unit on the map: its status shape and code on the status colour, so it reads in
 * glare and without colour vision. A label moved off its unit is joined to it by a leader line the
 * map draws (see marker-layout.ts).
 */
export function UnitMarker({ code, name, status, selected, offset, onSelect }: UnitMarkerProps) {
  const { t } = useTranslation();
  const word = status === 'unrated' ? t('map.unrated') : t(`status.${status}`);
  return (
    <div className="relative size-0" data-unit-marker={code} data-status={status}>
      <button
        type="button"
        tabIndex={-1}
        onClick={(e) => {
          e.stopPropagation();
          onSelect();
        }}
        title={`${code} · ${name}`}
        aria-label={t('map.markerLabel', { code, name, status: word })}
        style={{ transform: `translate(calc(-50% + ${offset.dx}px), calc(-50% + ${offset.dy}px))` }}
        className={cx(
          'absolute left-0 top-0 flex items-center gap-1 whitespace-nowrap rounded-lg border-2 px-1.5 py-0.5 text-sm font-bold leading-none shadow-md',
          colours[status],
          selected && 'outline-3 outline-offset-1 outline-ember-400',
        )}
      >
        <span aria-hidden="true" className={cx('text-base leading-none', glyphColour[status])}>
          {statusGlyph[status]}
        </span>
        <span aria-hidden="true">{code}</span>
      </button>
    </div>
  );
}
