import type { UnitStatusDto } from '@shared/schemas/farms.schema';
import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { cx } from '@/components/ui/cx';
import { Icon } from '@/components/ui/icon';
import { useAuth } from '@/lib/auth';
import { formatFarmTime, formatNumber, temperatureIn } from '../lib/format';
import { mapStatusOf, statusRank } from '../lib/palette';
import { MapStatusBadge } from './map-status-badge';

export interface FarmUnitListProps {
  units: readonly UnitStatusDto[];
  timeZone: string;
  /** Open the unit's details (the map's side sheet). */
  onSelect?: (unitId: string) => void;
  /** Or link each unit to a page. */
  unitHref?: (unitId: string) => string;
  selectedId?: string | null;
  className?: string;
  /** Heading of the list (an h2). */
  title: string;
}

export function sortByUrgency(units: readonly UnitStatusDto[]): UnitStatusDto[] {
  return [...units].sort((a, b) => statusRank[mapStatusOf(a.status)] - statusRank[mapStatusOf(b.status)] || a.walkOrder - b.walkOrder);
}

function useValueText() {
  const { i18n, t } = useTranslation();
  const { me } = useAuth();
  const locale = i18n.language;
  const tempUnit = me?.user.prefs.temperatureUnit ?? 'C';
  const nh3Basis = me?.user.prefs.ammoniaBasis ?? 'nh3';
  return {
    locale,
    doText: (u: UnitStatusDto) => (u.latest.dissolved_oxygen ? formatNumber(u.latest.dissolved_oxygen.value, 1, locale) : '—'),
    phText: (u: UnitStatusDto) => (u.latest.ph ? formatNumber(u.latest.ph.value, 2, locale) : '—'),
    tempUnit,
    tempText: (u: UnitStatusDto) =>
      u.latest.water_temperature ? formatNumber(temperatureIn(u.latest.water_temperature.value, tempUnit), 1, locale) : '—',
    nh3Text: (u: UnitStatusDto) => {
      const r = u.latestResult;
      const v = nh3Basis === 'nh3-n' ? r?.nh3NMgL : r?.nh3MgL;
      return v == null ? '—' : formatNumber(v, 3, locale);
    },
    nh3Unit: nh3Basis === 'nh3-n' ? t('map.nh3nUnit') : t('map.nh3Unit'),
    nh3Short: nh3Basis === 'nh3-n' ? t('map.col.nh3nShort') : t('map.col.nh3Short'),
  };
}

/**
 * Every unit of the farm as a list, most urgent first: the map's information for keyboards and
 * screen readers (a table on wide screens, cards on phones).
 */
export function FarmUnitList({ units, timeZone, onSelect, unitHref, selectedId, className, title }: FarmUnitListProps) {
  const { t } = useTranslation();
  const v = useValueText();
  const sorted = sortByUrgency(units);

  const nameControl = (u: UnitStatusDto, extra?: string) => {
    const label = (
      <>
        <span className="font-bold">{u.code}</span>
        <span className="text-muted"> · </span>
        <span>{u.name}</span>
      </>
    );
    const cls = cx('gw-link inline-flex min-h-11 items-center text-left', extra);
    if (unitHref) {
      return (
        <Link to={unitHref(u.id)} className={cls}>
          <span>{label}</span>
        </Link>
      );
    }
    return (
      <button
        type="button"
        className={cls}
        onClick={() => onSelect?.(u.id)}
        aria-pressed={selectedId === u.id}
        aria-haspopup="dialog"
        data-unit-button={u.code}
      >
        <span>{label}</span>
      </button>
    );
  };

  const lastReading = (u: UnitStatusDto) => (u.lastReadingAt ? formatFarmTime(u.lastReadingAt, timeZone, v.locale) : t('map.noReadings'));

  return (
    <section aria-labelledby="unit-list-title" className={cx('flex flex-col gap-3', className)} data-testid="unit-list">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="unit-list-title" className="text-xl font-bold">
          {title}
        </h2>
        <p className="text-base text-muted">{t('map.listOrder')}</p>
      </div>

      {/* Wide screens: a table. */}
      <div className="hidden overflow-x-auto rounded-xl border-2 border-line bg-card md:block">
        <table className="w-full border-collapse text-base">
          <caption className="sr-only">{title}</caption>
          <thead className="bg-abyss-50 text-left">
            <tr>
              <th scope="col" className="border-b-2 border-line px-3 py-2.5">
                {t('map.col.status')}
              </th>
              <th scope="col" className="border-b-2 border-line px-3 py-2.5">
                {t('map.col.unit')}
              </th>
              <th scope="col" className="border-b-2 border-line px-3 py-2.5 text-right">
                {t('map.col.do')} <span className="block text-sm font-normal text-muted">mg/L</span>
              </th>
              <th scope="col" className="border-b-2 border-line px-3 py-2.5 text-right">
                {t('map.col.ph')}
              </th>
              <th scope="col" className="border-b-2 border-line px-3 py-2.5 text-right">
                {t('map.col.temperature')} <span className="block text-sm font-normal text-muted">°{v.tempUnit}</span>
              </th>
              <th scope="col" className="border-b-2 border-line px-3 py-2.5 text-right">
                {t('map.col.nh3')} <span className="block text-sm font-normal text-muted">{v.nh3Unit}</span>
              </th>
              <th scope="col" className="border-b-2 border-line px-3 py-2.5 text-right">
                {t('map.col.lastReading')}
              </th>
            </tr>
          </thead>
          <tbody>
            {sorted.map((u) => (
              <tr
                key={u.id}
                data-unit-row={u.code}
                className={cx('border-b border-line last:border-b-0', selectedId === u.id ? 'bg-ember-50' : 'even:bg-paper')}
              >
                <td className="px-3 py-1.5">
                  <MapStatusBadge status={mapStatusOf(u.status)} size="sm" />
                </td>
                <th scope="row" className="px-3 py-1.5 text-left font-normal">
                  {nameControl(u)}
                  <span className="block text-sm text-muted">
                    {t(`map.kind.${u.kind}`)}
                    {u.state !== 'active' ? ` · ${t(`map.state.${u.state}`)}` : ''}
                  </span>
                </th>
                <td className="whitespace-nowrap px-3 py-1.5 text-right tabular-nums">{v.doText(u)}</td>
                <td className="whitespace-nowrap px-3 py-1.5 text-right tabular-nums">{v.phText(u)}</td>
                <td className="whitespace-nowrap px-3 py-1.5 text-right tabular-nums">{v.tempText(u)}</td>
                <td className="whitespace-nowrap px-3 py-1.5 text-right tabular-nums">{v.nh3Text(u)}</td>
                <td className="whitespace-nowrap px-3 py-1.5 text-right tabular-nums">{lastReading(u)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>

      {/* Phones: one card per unit. */}
      <ul className="flex flex-col gap-2 md:hidden">
        {sorted.map((u) => (
          <li
            key={u.id}
            data-unit-card={u.code}
            className={cx('rounded-xl border-2 bg-card px-4 py-2', selectedId === u.id ? 'border-ember-500' : 'border-line')}
          >
            <div className="flex items-start justify-between gap-3">
              <div className="min-w-0 flex-1">
                {nameControl(u)}
                <span className="block text-sm text-muted">
                  {t(`map.kind.${u.kind}`)}
                  {u.state !== 'active' ? ` · ${t(`map.state.${u.state}`)}` : ''} · {lastReading(u)}
                </span>
              </div>
              <MapStatusBadge status={mapStatusOf(u.status)} size="sm" className="mt-2 shrink-0" />
            </div>
            <dl className="mt-1 grid grid-cols-4 gap-x-3 text-sm">
              <div>
                <dt className="text-muted">{t('map.col.doUnit')}</dt>
                <dd className="font-bold tabular-nums">{v.doText(u)}</dd>
              </div>
              <div>
                <dt className="text-muted">{t('map.col.ph')}</dt>
                <dd className="font-bold tabular-nums">{v.phText(u)}</dd>
              </div>
              <div>
                <dt className="text-muted">
                  {t('map.col.temperatureShort')} °{v.tempUnit}
                </dt>
                <dd className="font-bold tabular-nums">{v.tempText(u)}</dd>
              </div>
              <div>
                <dt className="text-muted">{v.nh3Short}</dt>
                <dd className="font-bold tabular-nums">{v.nh3Text(u)}</dd>
              </div>
            </dl>
          </li>
        ))}
      </ul>
      {unitHref ? null : (
        <p className="flex items-center gap-2 text-sm text-muted">
          <Icon name="info" size={18} />
          {t('map.listHint')}
        </p>
      )}
    </section>
  );
}
