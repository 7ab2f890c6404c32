import { alertKinds } from '@shared/schemas/alerts.schema';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Select } from '@/components/ui/field';
import { unitOptionsQuery } from '../api/alert-queries';
import type { AlertListFilters, AlertStateFilter } from '../api/keys';
import { AlertList } from './alert-list';

export const alertTabs = ['open', 'acknowledged', 'resolved'] as const satisfies readonly AlertStateFilter[];
export type AlertTab = (typeof alertTabs)[number];

export interface AlertsScreenProps {
  farmId: string;
  timeZone: string;
  tab: AlertTab;
  unitId: string | undefined;
  kind: string | undefined;
  onChange: (next: { tab: AlertTab; unitId: string | undefined; kind: string | undefined }) => void;
}

const tabGlyph: Record<AlertTab, string> = { open: '!', acknowledged: '✓', resolved: '✓✓' };

/** Where an alert goes after each action (assigning leaves it where it is). */
const doneTab: Record<'acknowledged' | 'assigned' | 'resolved', AlertTab | null> = {
  acknowledged: 'acknowledged',
  assigned: null,
  resolved: 'resolved',
};

/** Alerts of the farm by state, filtered by unit and kind, with the safety caution. */
export function AlertsScreen({ farmId, timeZone, tab, unitId, kind, onChange }: AlertsScreenProps) {
  const { t } = useTranslation();
  const units = useQuery(unitOptionsQuery(farmId));
  const filters: AlertListFilters = { state: tab, ...(unitId ? { unitId } : {}), ...(kind ? { kind } : {}) };
  // What the last action did, said where the alert went (an acknowledged alert leaves the Open tab).
  const [done, setDone] = useState<{ action: 'acknowledged' | 'assigned' | 'resolved'; title: string } | null>(null);
  const target = done ? doneTab[done.action] : null;

  return (
    <div className="flex flex-col gap-5">
      <Callout tone="caution" className="py-2 sm:py-3">
        <span className="sm:hidden">{t('cautions.short')}</span>
        <span className="hidden sm:inline">{t('cautions.thresholds')}</span>
      </Callout>

      <div className="flex flex-col gap-4">
        <div
          role="group"
          aria-label={t('alerts.stateGroup')}
          className="grid grid-cols-3 gap-2 sm:flex sm:flex-wrap"
          data-testid="alert-tabs"
        >
          {alertTabs.map((s) => (
            <button
              key={s}
              type="button"
              aria-pressed={tab === s}
              onClick={() => {
                setDone(null);
                onChange({ tab: s, unitId, kind });
              }}
              className={cx(
                'inline-flex min-h-12 items-center justify-center gap-1.5 rounded-xl border-2 px-1 text-[0.94rem] font-bold sm:px-4 sm:text-lg',
                tab === s ? 'border-abyss-700 bg-abyss-700 text-white' : 'border-abyss-700 bg-card text-abyss-900 hover:bg-abyss-50',
              )}
            >
              <span aria-hidden="true" className="hidden sm:inline">
                {tabGlyph[s]}
              </span>
              {t(`alerts.tab.${s}`)}
            </button>
          ))}
        </div>

        <div className="grid grid-cols-2 gap-3">
          <Select
            label={t('alerts.filter.unit')}
            value={unitId ?? ''}
            onChange={(e) => onChange({ tab, unitId: e.target.value || undefined, kind })}
            options={[
              { value: '', label: t('alerts.filter.allUnits') },
              ...(units.data ?? []).map((u) => ({ value: u.id, label: `${u.code} · ${u.name}` })),
            ]}
          />
          <Select
            label={t('alerts.filter.kind')}
            value={kind ?? ''}
            onChange={(e) => onChange({ tab, unitId, kind: e.target.value || undefined })}
            options={[
              { value: '', label: t('alerts.filter.allKinds') },
              ...alertKinds.map((k) => ({ value: k, label: t(`alerts.kind.${k}`) })),
            ]}
          />
        </div>
      </div>

      <div role="status" aria-live="polite">
        {done ? (
          <Callout tone="success">
            {t(`alerts.done.${done.action}`, { title: done.title })}{' '}
            {target && target !== tab ? (
              <button
                type="button"
                className="gw-link"
                onClick={() => {
                  onChange({ tab: target, unitId, kind });
                  setDone(null);
                }}
              >
                {t(`alerts.done.show.${done.action}`)}
              </button>
            ) : null}
          </Callout>
        ) : null}
      </div>

      <section aria-label={t(`alerts.tab.${tab}`)}>
        <AlertList
          farmId={farmId}
          timeZone={timeZone}
          filters={filters}
          emptyTitle={t(`alerts.empty.${tab}`)}
          emptyBody={unitId || kind ? t('alerts.empty.filtered') : undefined}
          onDone={(action, title) => setDone({ action, title })}
        />
      </section>
    </div>
  );
}
