import { useTranslation } from 'react-i18next';
import { generatePath, useParams, useSearchParams } from 'react-router';
import { farmPath, farmScreens, paths } from '@/config/paths';
import { SetupScreen, setupTabs, type SetupTab } from '@/features/setup';
import { useCurrentFarm } from '@/lib/current-farm';

function isTab(v: string | null): v is SetupTab {
  return v !== null && (setupTabs as readonly string[]).includes(v);
}

/** The printable label page of a unit, when the client has that route. */
export function labelPageHref(farmId: string, unitId: string): string | null {
  const segment = (farmScreens as Record<string, string>).unitLabel;
  return segment ? generatePath(`${paths.farm}/${segment}`, { farmId, unitId }) : null;
}

/** Setup of the farm (?tab=units|probes|thresholds|feeding|onCall|people|labels). */
export default function SetupRoute({ fixedTab }: { fixedTab?: SetupTab }) {
  const { t } = useTranslation();
  const { farmId = '' } = useParams();
  const current = useCurrentFarm();
  const [params, setParams] = useSearchParams();
  const tabParam = params.get('tab');
  const tab: SetupTab = fixedTab ?? (isTab(tabParam) ? tabParam : 'units');

  return (
    <div className="flex flex-col gap-5" data-testid="setup-screen">
      <title>{`${t(tab === 'people' ? 'nav.people' : 'nav.setup')} · ${current?.farm.name ?? ''} · Gillwise`}</title>
      <header className="gw-no-print">
        <h1 className="text-3xl font-bold leading-tight">{t('setup.title')}</h1>
        <p className="mt-1 max-w-prose text-base text-muted sm:text-lg">{t('setup.intro')}</p>
      </header>
      <SetupScreen
        farmId={farmId}
        timeZone={current?.farm.timeZone ?? 'UTC'}
        role={current?.role ?? 'hand'}
        tab={tab}
        onTab={(next) => setParams(next === 'units' ? {} : { tab: next }, { replace: true })}
        outboxHref={farmPath('outbox', farmId)}
        labelPageHref={(unitId) => labelPageHref(farmId, unitId)}
      />
    </div>
  );
}
