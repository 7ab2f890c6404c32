import type { Role } from '@shared/schemas/auth.schema';
import { useEffect, useRef } from 'react';
import { useTranslation } from 'react-i18next';
import { cx } from '@/components/ui/cx';
import { FeedingTablesPanel } from './feeding/feeding-tables-panel';
import { LabelsPanel } from './labels/labels-panel';
import { OnCallPanel } from './on-call/on-call-panel';
import { PeoplePanel } from './people/people-panel';
import { ProbesPanel } from './probes/probes-panel';
import { ThresholdsPanel } from './thresholds/thresholds-panel';
import { UnitsPanel } from './units/units-panel';

export const setupTabs = ['units', 'probes', 'thresholds', 'feeding', 'onCall', 'people', 'labels'] as const;
export type SetupTab = (typeof setupTabs)[number];

export interface SetupScreenProps {
  farmId: string;
  timeZone: string;
  role: Role;
  tab: SetupTab;
  onTab: (tab: SetupTab) => void;
  outboxHref: string;
  labelPageHref: (unitId: string) => string | null;
}

/** Setting the farm up: units on the map, probes, thresholds, feeding tables, who is on call, people, QR labels. */
export function SetupScreen({ farmId, timeZone, role, tab, onTab, outboxHref, labelPageHref }: SetupScreenProps) {
  const { t } = useTranslation();
  const office = role === 'manager' || role === 'admin';
  const decides = office || role === 'planner';
  const strip = useRef<HTMLDivElement>(null);
  // Keep the chosen tab in sight in the scrolling strip on phones (sideways only, the page stays put).
  useEffect(() => {
    const box = strip.current;
    const el = box?.querySelector<HTMLElement>(`#setup-tab-${tab}`);
    if (box && el && (el.offsetLeft < box.scrollLeft || el.offsetLeft + el.offsetWidth > box.scrollLeft + box.clientWidth))
      box.scrollLeft = el.offsetLeft - 16;
  }, [tab]);
  return (
    <div className="flex flex-col gap-5" data-testid="setup" data-tab={tab}>
      <div ref={strip} className="gw-no-print -mx-1 overflow-x-auto px-1 pb-1">
        <div
          role="tablist"
          aria-label={t('setup.tabsLabel')}
          className="inline-flex min-w-full gap-1 rounded-xl border-2 border-abyss-700 bg-card p-1 sm:min-w-0"
        >
          {setupTabs.map((k) => (
            <button
              key={k}
              type="button"
              role="tab"
              id={`setup-tab-${k}`}
              aria-selected={tab === k}
              aria-controls="setup-panel"
              onClick={() => onTab(k)}
              className={cx(
                'min-h-11 shrink-0 whitespace-nowrap rounded-lg px-4 text-base font-bold',
                tab === k ? 'bg-abyss-700 text-white' : 'text-abyss-800 hover:bg-abyss-50',
              )}
            >
              {t(`setup.tab.${k}`)}
            </button>
          ))}
        </div>
      </div>
      <div id="setup-panel" role="tabpanel" aria-labelledby={`setup-tab-${tab}`}>
        {tab === 'units' ? <UnitsPanel farmId={farmId} canEdit={office} /> : null}
        {tab === 'probes' ? <ProbesPanel farmId={farmId} timeZone={timeZone} canEdit={office} /> : null}
        {tab === 'thresholds' ? <ThresholdsPanel farmId={farmId} canEdit={office} /> : null}
        {tab === 'feeding' ? <FeedingTablesPanel farmId={farmId} canEdit={decides} /> : null}
        {tab === 'onCall' ? <OnCallPanel farmId={farmId} /> : null}
        {tab === 'people' ? <PeoplePanel farmId={farmId} actor={role} timeZone={timeZone} outboxHref={outboxHref} /> : null}
        {tab === 'labels' ? <LabelsPanel farmId={farmId} labelPageHref={labelPageHref} /> : null}
      </div>
    </div>
  );
}
