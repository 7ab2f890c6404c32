import type { UnitDto } from '@shared/schemas/units.schema';
import { useQuery } from '@tanstack/react-query';
import { lazy, Suspense, useMemo, useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Icon } from '@/components/ui/icon';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { setupQueries } from '../../api/setup-queries';
import { areaM2, cornersOf, formatCorners, parseCorners, polygonFrom, type LngLat } from '../../lib/polygon';
import { TextAreaField } from '@/components/ui/text-area-field';
import { UnitForm } from './unit-form';

const OutlineEditorCanvas = lazy(() => import('./outline-editor-canvas'));

type Mode = 'idle' | 'drawing' | 'shaped';

function fmtArea(m2: number, locale: string): string {
  return m2 >= 10_000
    ? `${new Intl.NumberFormat(locale, { maximumFractionDigits: 2 }).format(m2 / 10_000)} ha`
    : `${new Intl.NumberFormat(locale, { maximumFractionDigits: 0 }).format(m2)} m²`;
}

/** Units on the farm map: draw a new one, or pick one to change its outline and what it is. */
export function UnitsPanel({ farmId, canEdit }: { farmId: string; canEdit: boolean }) {
  const { t, i18n } = useTranslation();
  const units = useQuery(setupQueries.units(farmId));
  const farm = useQuery(setupQueries.farm(farmId));
  const thresholds = useQuery(setupQueries.thresholds(farmId));
  const [selectedId, setSelectedId] = useState<string | null>(null);
  const [creating, setCreating] = useState(false);
  const [mode, setMode] = useState<Mode>('idle');
  const [corners, setCorners] = useState<LngLat[]>([]);
  const [outlineChanged, setOutlineChanged] = useState(false);
  const [saved, setSaved] = useState<string | null>(null);
  const [typed, setTyped] = useState('');
  const [typedError, setTypedError] = useState<string | null>(null);

  const list = useMemo(
    () => [...(units.data ?? [])].sort((a, b) => a.walkOrder - b.walkOrder || a.code.localeCompare(b.code)),
    [units.data],
  );
  const selected = list.find((u) => u.id === selectedId) ?? null;
  const flows = useQuery({
    ...setupQueries.flows(farmId, selectedId ?? ''),
    enabled: !!selected && (selected.kind === 'raceway' || selected.kind === 'tank'),
  });
  const designFlow = flows.data?.items.find((f) => f.source === 'design')?.flowLpm ?? null;
  const species = useMemo(
    () =>
      [
        ...new Set(
          [...(units.data ?? []).map((u) => u.species), ...(thresholds.data?.profiles ?? []).map((p) => p.species)].filter(
            (s): s is string => !!s,
          ),
        ),
      ].sort(),
    [units.data, thresholds.data],
  );
  const center: LngLat | null =
    farm.data?.longitude != null && farm.data.latitude != null ? [farm.data.longitude, farm.data.latitude] : null;

  const pick = (unit: UnitDto) => {
    if (mode === 'drawing') return;
    setCreating(false);
    setSelectedId(unit.id);
    setCorners(cornersOf(unit.outline));
    setMode(unit.outline ? 'shaped' : 'idle');
    setOutlineChanged(false);
    setSaved(null);
  };
  const startNew = () => {
    setSelectedId(null);
    setCreating(true);
    setCorners([]);
    setMode('drawing');
    setOutlineChanged(true);
    setSaved(null);
  };
  const redraw = () => {
    setCorners([]);
    setMode('drawing');
    setOutlineChanged(true);
  };
  const close = () => {
    setSelectedId(null);
    setCreating(false);
    setCorners([]);
    setMode('idle');
    setOutlineChanged(false);
  };
  const finish = () => {
    if (corners.length >= 3) setMode('shaped');
  };
  const outline = mode === 'shaped' ? polygonFrom(corners) : null;
  const formOpen = creating || selected !== null;
  const area = corners.length >= 3 ? areaM2(corners) : 0;

  if (units.isPending) return <Spinner label={t('setup.loading')} />;
  if (units.isError)
    return (
      <Callout tone="danger" title={t('setup.loadFailed')}>
        {requestErrorText(t, units.error)}
      </Callout>
    );

  return (
    <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_23rem]" data-testid="units-panel">
      <section className="flex flex-col gap-3" aria-labelledby="setup-map-title">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <h2 id="setup-map-title" className="text-xl font-bold">
            {t('setup.map.title')}
          </h2>
          {canEdit && mode !== 'drawing' ? (
            <Button variant="accent" onClick={startNew} icon={<Icon name="map" />}>
              {t('setup.map.drawNew')}
            </Button>
          ) : null}
        </div>
        <div className="relative overflow-hidden rounded-2xl border-2 border-line bg-card">
          <Suspense
            fallback={
              <div className="grid h-[26rem] place-items-center lg:h-[36rem]">
                <Spinner label={t('setup.map.loading')} />
              </div>
            }
          >
            <OutlineEditorCanvas
              units={list}
              selectedId={selectedId}
              corners={corners}
              drawing={mode === 'drawing'}
              editable={canEdit && mode !== 'idle'}
              onCornersChange={(c) => {
                setCorners(c);
                setOutlineChanged(true);
              }}
              onFinish={finish}
              onSelectUnit={(id) => {
                const u = list.find((x) => x.id === id);
                if (u) pick(u);
              }}
              center={center}
              className="h-[26rem] w-full lg:h-[36rem]"
            />
          </Suspense>
          {mode === 'drawing' ? (
            <div
              className="absolute left-2 right-14 top-2 rounded-xl bg-abyss-900/90 px-3 py-2 text-base text-white sm:right-auto sm:max-w-md"
              role="status"
              data-testid="draw-help"
            >
              {corners.length < 3
                ? t('setup.map.helpStart', { count: corners.length })
                : t('setup.map.helpFinish', { count: corners.length })}
            </div>
          ) : null}
        </div>
        {mode !== 'idle' ? (
          <div className="flex flex-wrap items-center gap-2" data-testid="draw-tools">
            {mode === 'drawing' ? (
              <>
                <Button variant="primary" onClick={finish} disabled={corners.length < 3} icon={<Icon name="check" />}>
                  {t('setup.map.finish')}
                </Button>
                <Button variant="secondary" onClick={() => setCorners((c) => c.slice(0, -1))} disabled={corners.length === 0}>
                  {t('setup.map.undo')}
                </Button>
                <Button variant="ghost" onClick={close}>
                  {t('setup.cancel')}
                </Button>
              </>
            ) : canEdit ? (
              <Button variant="secondary" onClick={redraw}>
                {t('setup.map.redraw')}
              </Button>
            ) : null}
            {area > 0 ? <p className="text-base text-muted">{t('setup.map.area', { area: fmtArea(area, i18n.language) })}</p> : null}
            {mode === 'shaped' && canEdit ? <p className="basis-full text-sm text-muted">{t('setup.map.dragHint')}</p> : null}
          </div>
        ) : (
          <p className="text-base text-muted">{canEdit ? t('setup.map.pickHint') : t('setup.map.readOnly')}</p>
        )}
        {canEdit && mode !== 'idle' ? (
          <details className="rounded-xl border-2 border-line bg-card px-4 py-3">
            <summary className="cursor-pointer text-base font-bold">{t('setup.map.typeTitle')}</summary>
            <div className="mt-3 flex flex-col gap-3">
              <TextAreaField
                label={t('setup.map.typeLabel')}
                hint={t('setup.map.typeHint')}
                rows={5}
                className="font-mono text-base"
                value={typed || formatCorners(corners)}
                onChange={(e) => setTyped(e.target.value)}
                error={typedError ?? undefined}
              />
              <Button
                variant="secondary"
                className="self-start"
                onClick={() => {
                  const parsed = parseCorners(typed || formatCorners(corners));
                  if (!parsed || parsed.length < 3) return setTypedError(t('setup.map.typeInvalid'));
                  setTypedError(null);
                  setTyped('');
                  setCorners(parsed);
                  setMode('shaped');
                  setOutlineChanged(true);
                }}
              >
                {t('setup.map.typeApply')}
              </Button>
            </div>
          </details>
        ) : null}
      </section>

      <section className="flex flex-col gap-3" aria-labelledby="setup-units-title">
        {formOpen && canEdit ? (
          <div className="gw-card p-4" data-testid="unit-editor">
            <h2 className="mb-3 text-xl font-bold">
              {selected ? t('setup.unit.editTitle', { code: selected.code }) : t('setup.unit.newTitle')}
            </h2>
            {mode === 'drawing' ? <p className="mb-3 text-base text-muted">{t('setup.unit.drawFirst')}</p> : null}
            {selected && (selected.kind === 'raceway' || selected.kind === 'tank') && flows.isPending ? (
              <Spinner label={t('setup.loading')} />
            ) : (
              <UnitForm
                key={`${selected?.id ?? 'new'}-${designFlow ?? ''}`}
                farmId={farmId}
                unit={selected}
                outline={outline}
                outlineChanged={outlineChanged}
                designFlowLpm={designFlow}
                profiles={thresholds.data?.profiles ?? []}
                speciesSuggestions={species}
                onSaved={(u) => {
                  setSaved(u.code);
                  setCreating(false);
                  setSelectedId(u.id);
                  setCorners(cornersOf(u.outline));
                  setMode(u.outline ? 'shaped' : 'idle');
                  setOutlineChanged(false);
                }}
                onCancel={close}
              />
            )}
          </div>
        ) : null}
        {saved ? <Callout tone="success" live title={t('setup.unit.saved', { code: saved })} /> : null}
        <h2 id="setup-units-title" className="text-xl font-bold">
          {t('setup.units.title', { count: list.length })}
        </h2>
        <ul className="flex flex-col gap-1.5" data-testid="setup-unit-list">
          {list.map((u) => (
            <li key={u.id}>
              <button
                type="button"
                onClick={() => pick(u)}
                aria-pressed={u.id === selectedId}
                className={cx(
                  'flex min-h-12 w-full items-center gap-3 rounded-xl border-2 bg-card px-3 py-1.5 text-left hover:border-abyss-500',
                  u.id === selectedId ? 'border-ember-600 bg-ember-50' : 'border-line',
                )}
              >
                <span className="min-w-12 text-lg font-bold">{u.code}</span>
                <span className="min-w-0 flex-1">
                  <span className="block truncate">{u.name}</span>
                  <span className="block truncate text-sm text-muted">
                    {[t(`setup.kind.${u.kind}`), u.species?.replace(/_/g, ' ')].filter(Boolean).join(' · ')}
                  </span>
                </span>
                {u.state !== 'active' ? (
                  <span
                    className={cx(
                      'rounded-full border-2 px-2 py-0.5 text-sm font-bold',
                      u.state === 'cycling' ? 'border-watch bg-watch-soft text-watch-ink' : 'border-line bg-paper text-muted',
                    )}
                  >
                    {t(`setup.state.${u.state}`)}
                  </span>
                ) : null}
                {!u.outline ? <span className="text-sm text-muted">{t('setup.units.noOutline')}</span> : null}
              </button>
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}
