import type { RationSheetRowDto } from '@shared/schemas/feed.schema';
import type { ReactNode } from 'react';
import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { Button } from '@/components/ui/button';
import { cx } from '@/components/ui/cx';
import { Icon } from '@/components/ui/icon';
import { farmClock, fmt, fmtKg, fmtNh3 } from '../lib/format';
import { nh3Level, readInputs } from '../lib/inputs';
import { ActionPill } from './action-pill';
import { ReasonList } from './reason-list';

export interface RationCardProps {
  row: RationSheetRowDto;
  day: string;
  timeZone: string;
  unitHref: string;
  canDecide: boolean;
  selected: boolean;
  onSelect: (selected: boolean) => void;
  onAccept: () => void;
  onOverride: () => void;
  accepting: boolean;
}

function Figure({ label, children, testId }: { label: string; children: ReactNode; testId?: string }) {
  return (
    <div className="min-w-0">
      <dt className="text-sm font-bold text-muted">{label}</dt>
      <dd className="text-lg tabular-nums" data-testid={testId}>
        {children}
      </dd>
    </div>
  );
}

const levelLook = {
  clear: { glyph: '●', className: 'text-clear' },
  watch: { glyph: '▲', className: 'text-watch' },
  act: { glyph: '◆', className: 'text-act' },
} as const;

function Nh3Value({ mgL, level }: { mgL: number; level: 'clear' | 'watch' | 'act' | null }) {
  const { t, i18n } = useTranslation();
  return (
    <span className="font-bold">
      {level ? (
        <span aria-hidden="true" className={cx('mr-1', levelLook[level].className)}>
          {levelLook[level].glyph}
        </span>
      ) : null}
      {fmtNh3(mgL, i18n.language)} <span className="text-base font-normal">mg/L</span>
      {level ? <span className="sr-only"> ({t(`status.${level}`)})</span> : null}
    </span>
  );
}

export function humanSpecies(species: string | null): string | null {
  return species ? species.replace(/_/g, ' ') : null;
}

/** One unit's ration for the day: the figures behind it, what the rule proposes and why, and the decision. */
export function RationCard({
  row,
  day,
  timeZone,
  unitHref,
  canDecide,
  selected,
  onSelect,
  onAccept,
  onOverride,
  accepting,
}: RationCardProps) {
  const { t, i18n } = useTranslation();
  const locale = i18n.language;
  const rec = row.recommendation;
  const inputs = readInputs(rec);
  const species = humanSpecies(row.unit.species);

  return (
    <li
      className={cx('gw-card flex flex-col gap-4 p-4 sm:p-5', selected && 'border-abyss-600 ring-2 ring-abyss-300')}
      data-testid="ration-row"
      data-unit-code={row.unit.code}
      data-status={row.status}
    >
      <div className="flex items-start gap-3">
        {canDecide && rec && row.status === 'pending' ? (
          <label className="-m-1 grid size-12 shrink-0 place-items-center rounded-xl hover:bg-abyss-50">
            <input
              type="checkbox"
              className="size-6 accent-abyss-700"
              checked={selected}
              onChange={(e) => onSelect(e.target.checked)}
              aria-label={t('rations.select', { unit: row.unit.code })}
            />
          </label>
        ) : null}
        <div className="min-w-0 flex-1">
          <h3 className="text-xl font-bold leading-tight">
            <Link to={unitHref} className="gw-link">
              {row.unit.code}
            </Link>{' '}
            <span className="font-normal">{row.unit.name}</span>
          </h3>
          <p className="text-base text-muted">
            {[t(`rations.kind.${row.unit.kind}`, { defaultValue: row.unit.kind }), species].filter(Boolean).join(' · ')}
          </p>
        </div>
        <DecisionBadge status={row.status} />
      </div>

      {rec ? (
        <dl className="grid grid-cols-2 gap-x-4 gap-y-3 sm:grid-cols-3 xl:grid-cols-5">
          <Figure label={t('rations.fig.biomass')} testId="biomass">
            <span className="font-bold">{fmt(rec.biomassKg, 0, locale)}</span> kg
            {inputs.biomass95 ? (
              <span className="block text-sm text-muted">
                {t('rations.fig.biomass95', { low: fmt(inputs.biomass95.lowKg, 0, locale), high: fmt(inputs.biomass95.highKg, 0, locale) })}
              </span>
            ) : null}
          </Figure>
          <Figure label={t('rations.fig.planned')} testId="planned">
            <span className="font-bold">{fmtKg(rec.plannedKg, locale)}</span> kg
            <span className="block text-sm text-muted">{t('rations.fig.pctBw', { pct: fmt(rec.plannedPctBw, 1, locale) })}</span>
          </Figure>
          <Figure label={t('rations.fig.load')} testId="load">
            {inputs.plannedTanKgPerDay !== null ? (
              <>
                <span className="font-bold">{fmt(inputs.plannedTanKgPerDay, 2, locale)}</span> {t('rations.fig.loadUnit')}
                {inputs.recommendedTanKgPerDay !== null && inputs.recommendedTanKgPerDay !== inputs.plannedTanKgPerDay ? (
                  <span className="block text-sm text-muted">
                    {t('rations.fig.loadAfter', { value: fmt(inputs.recommendedTanKgPerDay, 2, locale) })}
                  </span>
                ) : null}
              </>
            ) : (
              '—'
            )}
          </Figure>
          <Figure label={t('rations.fig.latestNh3')} testId="latest-nh3">
            {inputs.latestNh3 ? (
              <>
                <Nh3Value mgL={inputs.latestNh3.mgL} level={nh3Level(inputs.latestNh3.mgL, inputs)} />
                <span className="block text-sm text-muted">
                  {farmClock(inputs.latestNh3.sampledAt, timeZone, locale, day)}
                  {inputs.latestNh3.flagged ? ` · ${t('rations.fig.flagged')}` : ''}
                </span>
              </>
            ) : (
              <span className="text-base text-muted">{t('rations.fig.noResult')}</span>
            )}
          </Figure>
          <Figure label={t('rations.fig.forecast')} testId="forecast-nh3">
            {inputs.forecastNh3 ? (
              <>
                <Nh3Value mgL={inputs.forecastNh3.mgL} level={nh3Level(inputs.forecastNh3.mgL, inputs)} />
                {inputs.forecastNh3.localTime ? (
                  <span className="block text-sm text-muted">{t('rations.fig.forecastAt', { time: inputs.forecastNh3.localTime })}</span>
                ) : null}
              </>
            ) : (
              <span className="text-base text-muted">{t('rations.fig.noForecast')}</span>
            )}
          </Figure>
        </dl>
      ) : (
        <p className="text-base text-muted">{t('rations.noRecommendation')}</p>
      )}

      {rec ? (
        <div className="grid gap-4 border-t-2 border-line pt-4 lg:grid-cols-[minmax(0,1fr)_18rem]">
          <section aria-label={t('rations.recommendation')} className="flex flex-col gap-3">
            <div className="flex flex-wrap items-center gap-x-3 gap-y-2">
              <ActionPill action={rec.action} cutPct={rec.cutPct} />
              <span className="text-lg">{t('rations.recommendedKg', { kg: fmtKg(rec.recommendedKg, locale) })}</span>
            </div>
            <ReasonList reasons={rec.reasons} />
          </section>
          <section
            aria-label={t('rations.decision')}
            className="flex flex-col gap-3 lg:border-l-2 lg:border-line lg:pl-4"
            data-testid="decision"
          >
            {row.status === 'pending' ? (
              <>
                <p className="text-base text-muted">{t('rations.waiting')}</p>
                {canDecide ? (
                  <div className="flex flex-col gap-2">
                    <Button variant="primary" onClick={onAccept} loading={accepting} icon={<Icon name="check" />}>
                      {t('rations.accept', { kg: fmtKg(rec.recommendedKg, locale) })}
                    </Button>
                    <Button variant="secondary" onClick={onOverride}>
                      {t('rations.overrideButton')}
                    </Button>
                  </div>
                ) : null}
              </>
            ) : (
              <>
                <p className="text-lg">
                  <span className="font-bold">
                    {t(row.status === 'accepted' ? 'rations.acceptedKg' : 'rations.overriddenKg', {
                      kg: fmtKg(rec.approvedKg ?? 0, locale),
                    })}
                  </span>
                  {rec.decidedAt ? (
                    <span className="block text-sm text-muted">
                      {t('rations.decidedAt', { time: farmClock(rec.decidedAt, timeZone, locale, day) })}
                    </span>
                  ) : null}
                </p>
                {rec.overrideNote ? (
                  <blockquote className="rounded-lg border-l-4 border-abyss-300 bg-paper px-3 py-2 text-base" data-testid="override-note">
                    {rec.overrideNote}
                  </blockquote>
                ) : null}
                {rec.laterProposal ? (
                  <div className="rounded-xl border-2 border-ember-500 bg-ember-50 px-3 py-2 text-base" data-testid="later-proposal">
                    <p className="font-bold">
                      {t('rations.later.title', { time: farmClock(rec.laterProposal.computedAt, timeZone, locale, day) })}
                    </p>
                    <p>
                      {rec.laterProposal.action === 'cut'
                        ? t('rations.later.cut', {
                            pct: Math.round(rec.laterProposal.cutPct),
                            kg: fmtKg(rec.laterProposal.recommendedKg, locale),
                          })
                        : t(`rations.later.${rec.laterProposal.action}`, { kg: fmtKg(rec.laterProposal.recommendedKg, locale) })}
                    </p>
                    {canDecide ? (
                      <Button variant="secondary" className="mt-2" onClick={onAccept} loading={accepting}>
                        {t('rations.later.accept')}
                      </Button>
                    ) : null}
                  </div>
                ) : null}
                {canDecide ? (
                  <Button variant="ghost" onClick={onOverride}>
                    {t('rations.change')}
                  </Button>
                ) : null}
              </>
            )}
          </section>
        </div>
      ) : null}
    </li>
  );
}

const badgeLook = {
  pending: { glyph: '○', className: 'border-dashed border-abyss-600 bg-card text-abyss-800' },
  accepted: { glyph: '✓', className: 'border-clear bg-clear-soft text-clear-ink' },
  overridden: { glyph: '✎', className: 'border-abyss-700 bg-abyss-100 text-abyss-900' },
  none: { glyph: '–', className: 'border-line bg-paper text-muted' },
} as const;

export function DecisionBadge({ status }: { status: RationSheetRowDto['status'] }) {
  const { t } = useTranslation();
  const look = badgeLook[status];
  return (
    <span
      data-testid="decision-status"
      data-status={status}
      className={cx(
        'inline-flex shrink-0 items-center gap-1.5 rounded-full border-2 px-3 py-1 text-sm font-bold uppercase tracking-wide',
        look.className,
      )}
    >
      <span aria-hidden="true">{look.glyph}</span>
      {t(`rations.status.${status}`)}
    </span>
  );
}
