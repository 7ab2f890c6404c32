import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { cx } from '@/components/ui/cx';
import { Sheet } from '@/components/ui/dialog';
import { Icon } from '@/components/ui/icon';
import { StatusBadge, statusStyle, type UnitStatus } from '@/components/ui/status-badge';
import type { PositionStatus } from '../hooks/use-position';
import { formatNumber } from '../lib/format';
import type { OrderedUnit } from '../lib/unit-order';

export function DueChip({ task }: { task: OrderedUnit['task'] }) {
  const { t } = useTranslation();
  if (!task || task.status === 'upcoming') return null;
  const overdue = task.status === 'overdue';
  const style = statusStyle[overdue ? 'act' : 'watch'];
  return (
    <span
      className={cx('inline-flex items-center gap-1 rounded-full border-2 px-2 py-0.5 text-sm font-bold leading-none', style.className)}
    >
      <span aria-hidden="true">{style.glyph}</span>
      {overdue ? t('pondside.unit.overdue', { count: task.daysOverdue }) : t('pondside.unit.due')}
    </span>
  );
}

function Distance({ m }: { m: number | null }) {
  const { t, i18n } = useTranslation();
  if (m === null) return null;
  return (
    <span className="text-sm text-muted">
      {m < 1000
        ? t('pondside.unit.metres', { n: formatNumber(Math.round(m / 5) * 5, i18n.language, 0) })
        : t('pondside.unit.km', { n: formatNumber(m / 1000, i18n.language, 1) })}
    </span>
  );
}

function UnitRow({
  row,
  selected,
  onPick,
  status,
}: {
  row: OrderedUnit;
  selected: boolean;
  onPick: () => void;
  status: UnitStatus | null;
}) {
  const { t } = useTranslation();
  return (
    <button
      type="button"
      onClick={onPick}
      aria-pressed={selected}
      data-unit-code={row.unit.code}
      className={cx(
        'flex min-h-16 w-full items-center gap-3 rounded-xl border-2 px-3 py-2 text-left',
        selected ? 'border-abyss-800 bg-abyss-50' : 'border-line bg-card hover:border-abyss-500',
      )}
    >
      <span className="grid min-w-14 place-items-center rounded-lg bg-abyss-800 px-2 py-2 text-xl font-bold text-white">
        {row.unit.code}
      </span>
      <span className="min-w-0 flex-1">
        <span className="block text-lg font-bold leading-snug">{row.unit.name}</span>
        <span className="flex flex-wrap items-center gap-x-2 gap-y-1">
          <span className="text-sm text-muted">{t(`pondside.kind.${row.unit.kind}`)}</span>
          {status ? <StatusBadge status={status} size="sm" /> : null}
          <DueChip task={row.task} />
          <Distance m={row.distanceM} />
        </span>
      </span>
      {selected ? <Icon name="check" className="shrink-0 text-abyss-800" /> : null}
    </button>
  );
}

export interface UnitPickerProps {
  rows: readonly OrderedUnit[];
  selectedId: string;
  onSelect: (unitId: string) => void;
  position: { status: PositionStatus; request: () => void };
  error?: string | undefined;
  /** The unit's status on the farm map (clear, watch, act, silent), when known. */
  statusOf?: ((unitId: string) => UnitStatus | null) | undefined;
}

/** Which unit the test is for: the chosen one as a card, the rest nearest-first or in task order. */
export function UnitPicker({ rows, selectedId, onSelect, position, error, statusOf }: UnitPickerProps) {
  const { t } = useTranslation();
  const [open, setOpen] = useState(false);
  const [showAll, setShowAll] = useState(false);
  const selected = rows.find((r) => r.unit.id === selectedId) ?? null;

  const locate = (
    <div className="flex flex-wrap items-center gap-2">
      {position.status === 'on' ? (
        <p className="flex items-center gap-2 text-base font-bold text-abyss-700">
          <Icon name="map" size={20} /> {t('pondside.unit.nearestOn')}
        </p>
      ) : position.status === 'unavailable' ? (
        <p className="text-sm text-muted">{t('pondside.unit.noLocation')}</p>
      ) : (
        <Button variant="secondary" onClick={position.request} loading={position.status === 'asking'} icon={<Icon name="map" size={20} />}>
          {t('pondside.unit.nearestFirst')}
        </Button>
      )}
      {position.status === 'denied' ? <p className="text-sm text-muted">{t('pondside.unit.locationDenied')}</p> : null}
      {position.status !== 'on' ? <p className="w-full text-sm text-muted">{t('pondside.unit.taskOrder')}</p> : null}
    </div>
  );

  const list = (items: readonly OrderedUnit[], after?: () => void) => (
    <ul className="flex flex-col gap-2">
      {items.map((row) => (
        <li key={row.unit.id}>
          <UnitRow
            row={row}
            selected={row.unit.id === selectedId}
            status={statusOf?.(row.unit.id) ?? null}
            onPick={() => {
              onSelect(row.unit.id);
              after?.();
            }}
          />
        </li>
      ))}
    </ul>
  );

  return (
    <section aria-labelledby="unit-title" className="flex flex-col gap-3">
      <h2 id="unit-title" className="text-xl font-bold">
        {t('pondside.unit.title')}
      </h2>
      {selected ? (
        <div className="gw-card flex items-center gap-3 border-abyss-700 p-3" data-testid="chosen-unit">
          <span className="grid min-w-16 place-items-center rounded-xl bg-abyss-800 px-2 py-3 text-2xl font-bold text-white">
            {selected.unit.code}
          </span>
          <div className="min-w-0 flex-1">
            <p className="text-lg font-bold leading-snug">{selected.unit.name}</p>
            <p className="flex flex-wrap items-center gap-x-2 gap-y-1">
              <span className="text-sm text-muted">{t(`pondside.kind.${selected.unit.kind}`)}</span>
              {statusOf?.(selected.unit.id) ? <StatusBadge status={statusOf(selected.unit.id)!} size="sm" /> : null}
              <DueChip task={selected.task} />
              <Distance m={selected.distanceM} />
            </p>
          </div>
          <Button variant="secondary" onClick={() => setOpen(true)} aria-haspopup="dialog">
            {t('pondside.unit.change')}
          </Button>
        </div>
      ) : (
        <>
          {locate}
          {list(showAll ? rows : rows.slice(0, 5))}
          {!showAll && rows.length > 5 ? (
            <Button variant="ghost" onClick={() => setShowAll(true)}>
              {t('pondside.unit.showAll', { count: rows.length })}
            </Button>
          ) : null}
        </>
      )}
      {error ? (
        <p className="flex items-start gap-1.5 text-base font-bold text-act" role="alert">
          <span aria-hidden="true">◆</span>
          {error}
        </p>
      ) : null}
      <Sheet open={open} onClose={() => setOpen(false)} title={t('pondside.unit.choose')}>
        <div className="flex flex-col gap-3">
          {open ? locate : null}
          {open ? list(rows, () => setOpen(false)) : null}
        </div>
      </Sheet>
    </section>
  );
}
