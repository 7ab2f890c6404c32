import { epa2013Criteria } from '@shared/chemistry';
import type { UnitStatusDto } from '@shared/schemas/farms.schema';
import { useQuery } from '@tanstack/react-query';
import { useMemo, type ReactNode } from 'react';
import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { Icon } from '@/components/ui/icon';
import { Spinner } from '@/components/ui/spinner';
import { StatusBadge } from '@/components/ui/status-badge';
import { unitQueries } from '../api/unit-queries';
import { limitBands } from '../lib/chart-data';
import { chartQuantities, quantityMeta, type ChartQuantity } from '../lib/format';
import { rangeWindow, type ChartRange } from '../lib/ranges';
import { AmmoniaChart } from './ammonia-chart';
import { CYCLE_WEEKS, CycleChart } from './cycle-chart';
import { EpaReference, type EpaReferenceData } from './epa-reference';
import { FreeAmmoniaPanel } from './free-ammonia-panel';
import { LatestValues } from './latest-values';
import { QuantityChart } from './quantity-chart';
import { RangePicker } from './range-picker';
import { ResultsList } from './results-list';

export interface UnitPageProps {
  farmId: string;
  unitId: string;
  timeZone: string;
  range: ChartRange;
  onRange: (r: ChartRange) => void;
  backHref: string;
  backLabel: string;
  /** The unit's open alerts, composed in by the route. */
  alerts?: ReactNode;
}

function chartQuantitiesFor(unit: Pick<UnitStatusDto, 'kind' | 'latest' | 'waterType'>): ChartQuantity[] {
  return chartQuantities.filter((q) => {
    if (unit.latest[q]) return q !== 'specific_conductance' || !unit.latest.salinity;
    return q === 'flow' ? unit.kind !== 'pond' : q === 'ph' || q === 'water_temperature' || q === 'dissolved_oxygen';
  });
}

/** Rainbow trout and other salmonids are Oncorhynchus: the EPA acute criterion is stricter where they live. */
function isOncorhynchus(species: string | null): boolean {
  return /trout|salmon|oncorhynchus/i.test(species ?? '');
}

/** The unit page: what the unit is doing now, its probe charts over a range, its kit results with provenance, and the EPA reference. */
export function UnitPage({ farmId, unitId, timeZone, range, onRange, backHref, backLabel, alerts }: UnitPageProps) {
  const { t } = useTranslation();
  const detail = useQuery(unitQueries.detail(farmId, unitId));
  const status = useQuery(unitQueries.farmStatus(farmId));
  const profiles = useQuery(unitQueries.profiles(farmId));
  const latest = useQuery(unitQueries.latestResult(farmId, unitId));
  const evaluation = useQuery(unitQueries.evaluation(farmId, unitId));
  const window = useMemo(() => rangeWindow(range), [range]);
  // The nitrogen-cycle view needs weeks of tests whatever the chart range.
  const testsFrom = useMemo(() => {
    const span = Math.max(window.to.getTime() - window.from.getTime(), CYCLE_WEEKS * 7 * 86_400_000);
    return new Date(Math.floor((window.to.getTime() - span) / 3_600_000) * 3_600_000).toISOString();
  }, [window]);
  const tests = useQuery(unitQueries.tests(farmId, unitId, testsFrom));

  const unitStatus = status.data?.units.find((u) => u.id === unitId) ?? null;
  const unit = detail.data;
  const quantities = unitStatus ? chartQuantitiesFor(unitStatus) : [];
  const series = useQuery(unitQueries.series(farmId, unitId, range, quantities));

  if (detail.isPending) return <Spinner label={t('units.loading')} />;
  if (detail.isError || !unit) {
    return (
      <Callout tone="danger" title={t('units.loadFailed')}>
        <Button variant="secondary" className="mt-2" onClick={() => void detail.refetch()}>
          {t('common.retry')}
        </Button>
      </Callout>
    );
  }

  const profile = profiles.data?.profiles.find((p) => p.id === unit.thresholdProfileId) ?? null;
  const salinity = unitStatus?.latest.salinity?.value ?? unit.defaultSalinityPpt;
  const testsInRange = (tests.data ?? []).filter((x) => Date.parse(x.sampledAt) >= window.from.getTime());

  let epa: EpaReferenceData | null = evaluation.data?.reference.epa2013 ?? null;
  if (!epa && unit.waterType === 'fresh') {
    // No evaluation from the server: the same published equations, at the latest result's pH and temperature.
    const r = latest.data;
    const pH = r?.pH ?? unitStatus?.latest.ph?.value ?? null;
    const temperatureC = r?.temperatureC ?? unitStatus?.latest.water_temperature?.value ?? null;
    let criteria: ReturnType<typeof epa2013Criteria> | null = null;
    try {
      criteria =
        pH !== null && temperatureC !== null
          ? epa2013Criteria({ pH, temperatureC, oncorhynchusPresent: isOncorhynchus(unit.species) })
          : null;
    } catch {
      criteria = null;
    }
    epa = {
      applicable: criteria !== null,
      note: '',
      pH,
      temperatureC,
      cmcMgL: criteria?.cmcMgL ?? null,
      cccMgL: criteria?.cccMgL ?? null,
      oncorhynchusPresent: isOncorhynchus(unit.species),
      latestTanMgL: r?.tanMgL ?? null,
    };
  }
  const fresh = unit.waterType === 'fresh';
  const epaLines = fresh && epa?.applicable ? { cmcMgL: epa.cmcMgL, cccMgL: epa.cccMgL } : null;

  return (
    <div className="flex flex-col gap-6" data-testid="unit-page" data-unit={unit.code}>
      <header className="flex flex-col gap-2">
        <Link to={backHref} className="gw-link inline-flex min-h-11 items-center gap-1 self-start">
          <Icon name="arrowRight" className="rotate-180" size={20} />
          {backLabel}
        </Link>
        <div className="flex flex-wrap items-center justify-between gap-3">
          <h1 className="text-3xl font-bold leading-tight">
            {unit.code} · {unit.name}
          </h1>
          {unitStatus?.status ? <StatusBadge status={unitStatus.status} size="lg" /> : null}
        </div>
        <p className="text-lg text-muted">
          {[
            t(`units.kind.${unit.kind}`),
            t(`units.water.${unit.waterType}`) + (unit.waterType !== 'fresh' ? ` (${salinity} ‰)` : ''),
            t(`units.state.${unit.state}`),
            unit.species ? t(`units.species.${unit.species}`, { defaultValue: unit.species.replace(/_/g, ' ') }) : null,
          ]
            .filter(Boolean)
            .join(' · ')}
        </p>
        {unitStatus?.status ? <p className="text-base">{t(`status.describe.${unitStatus.status}`)}</p> : null}
      </header>

      <section aria-labelledby="unit-now" className="gw-card px-5 py-4">
        <h2 id="unit-now" className="mb-3 text-xl font-bold">
          {t('units.page.now')}
        </h2>
        {unitStatus ? (
          <LatestValues unit={unitStatus} timeZone={timeZone} className="sm:grid-cols-[repeat(auto-fit,minmax(10rem,1fr))]" />
        ) : (
          <Spinner />
        )}
      </section>

      <section aria-labelledby="unit-nh3" className="gw-card px-5 py-4">
        <h2 id="unit-nh3" className="mb-3 text-xl font-bold">
          {t('units.sheet.nh3')}
        </h2>
        {latest.isPending ? <Spinner /> : <FreeAmmoniaPanel result={latest.data ?? null} timeZone={timeZone} detailed />}
      </section>

      {alerts ? (
        <section aria-labelledby="unit-alerts">
          <h2 id="unit-alerts" className="mb-3 text-xl font-bold">
            {t('units.sheet.alerts')}
          </h2>
          {alerts}
        </section>
      ) : null}

      <section aria-labelledby="unit-charts" className="flex flex-col gap-4">
        <div className="flex flex-wrap items-center justify-between gap-3">
          <h2 id="unit-charts" className="text-xl font-bold">
            {t('units.page.charts')}
          </h2>
          <RangePicker value={range} onChange={onRange} />
        </div>
        {profile ? (
          <p className="text-base text-muted">{t('units.page.profile', { name: profile.name })}</p>
        ) : (
          <p className="text-base text-muted">{t('units.page.noProfile')}</p>
        )}
        <AmmoniaChart
          tests={testsInRange}
          latest={latest.data ?? null}
          limits={limitBands(profile, ['nh3'], salinity)}
          epa={epaLines}
          timeZone={timeZone}
          window={window}
        />
        {series.isPending && quantities.length ? (
          <Spinner label={t('units.chart.loading')} />
        ) : series.isError ? (
          <Callout tone="danger">{t('units.chart.failed')}</Callout>
        ) : (
          (series.data?.series ?? [])
            .filter((s) => (chartQuantities as readonly string[]).includes(s.quantity))
            .map((s) => (
              <QuantityChart
                key={s.quantity}
                series={s}
                limits={limitBands(profile, quantityMeta[s.quantity as ChartQuantity].metrics, salinity)}
                timeZone={timeZone}
                window={window}
              />
            ))
        )}
      </section>

      {unit.state === 'cycling' ? <CycleChart tests={tests.data ?? []} timeZone={timeZone} /> : null}

      {fresh && epa ? <EpaReference epa={epa} /> : null}

      <section aria-labelledby="unit-results" className="flex flex-col gap-3">
        <h2 id="unit-results" className="text-xl font-bold">
          {t('units.page.results', { range: t(`units.range.long.${range}`) })}
        </h2>
        {tests.isPending ? <Spinner /> : <ResultsList tests={testsInRange} timeZone={timeZone} />}
      </section>

      <Callout tone="caution" title={t('units.page.cautionTitle')}>
        {t('cautions.thresholds')}
      </Callout>
    </div>
  );
}
