import type { UnitStatusDto } from '@shared/schemas/farms.schema';
import { Component, lazy, Suspense, type ReactNode } from 'react';
import { useTranslation } from 'react-i18next';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Spinner } from '@/components/ui/spinner';
import type { ProbePoint } from '../lib/geo';
import { MapLegend } from './map-legend';

// maplibre-gl (about 300 kB gzipped) and its worker load only when a map is on screen.
const FarmMapCanvas = lazy(() => import('./farm-map-canvas'));

class MapErrorBoundary extends Component<{ fallback: ReactNode; children: ReactNode }, { failed: boolean }> {
  override state = { failed: false };
  static getDerivedStateFromError() {
    return { failed: true };
  }
  override render() {
    return this.state.failed ? this.props.fallback : this.props.children;
  }
}

export interface FarmMapPanelProps {
  units: readonly UnitStatusDto[];
  probes: readonly ProbePoint[];
  selectedId: string | null;
  onSelect: (unitId: string) => void;
  className?: string;
}

/** The farm map with its legend; the list of units (FarmUnitList) carries the same information for keyboards and screen readers. */
export function FarmMapPanel({ units, probes, selectedId, onSelect, className }: FarmMapPanelProps) {
  const { t } = useTranslation();
  const withOutline = units.filter((u) => u.outline).length;
  const frame =
    'relative h-[min(24rem,52dvh)] min-h-72 w-full overflow-hidden rounded-2xl border-2 border-line bg-paper sm:h-[28rem] lg:h-[30rem]';

  return (
    <section aria-labelledby="farm-map-title" className={cx('flex flex-col gap-3', className)} data-testid="farm-map">
      <h2 id="farm-map-title" className="sr-only">
        {t('map.mapRegion')}
      </h2>
      {withOutline === 0 ? (
        <Callout tone="info" title={t('map.noOutlinesTitle')}>
          {t('map.noOutlines')}
        </Callout>
      ) : (
        <MapErrorBoundary
          fallback={
            <Callout tone="caution" title={t('map.failedTitle')}>
              {t('map.failed')}
            </Callout>
          }
        >
          <Suspense
            fallback={
              <div className={cx(frame, 'grid place-items-center text-abyss-800')}>
                <Spinner label={t('map.loadingMap')} size={36} />
              </div>
            }
          >
            <FarmMapCanvas units={units} probes={probes} selectedId={selectedId} onSelect={onSelect} className={frame} />
          </Suspense>
        </MapErrorBoundary>
      )}
      <MapLegend />
    </section>
  );
}
