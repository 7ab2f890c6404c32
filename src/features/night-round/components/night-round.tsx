import type { DisplayPrefs } from '@shared/schemas/auth.schema';
import type { UnitStatusDto } from '@shared/schemas/farms.schema';
import { limitsAt, type ThresholdRuleDto } from '@shared/schemas/thresholds.schema';
import type { UnitDto } from '@shared/schemas/units.schema';
import type { WaterTestDto } from '@shared/schemas/water-tests.schema';
import { useQueries, useQuery } from '@tanstack/react-query';
import { useEffect, useMemo, useState, type ReactNode } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { NumberField, parseDecimal } from '@/components/ui/field';
import { Icon } from '@/components/ui/icon';
import { Spinner } from '@/components/ui/spinner';
import { StatusBadge } from '@/components/ui/status-badge';
import { nightRoundQueries } from '../api/night-round';
import { farmClock, farmWhen, formatNumber } from '../lib/format';
import { emptyPondEntry, fromCelsius, nightBodies, type NightBody, type PondEntry } from '../lib/night-form';

/** What the route hands in to send a reading: it goes into the device outbox (stored first, sent when possible). */
export interface NightRoundSender {
  send: (input: { unitId: string; unitCode: string; unitName: string; body: NightBody }) => Promise<string>;
  /** Ids of this round's readings still waiting on the phone. */
  pendingIds: ReadonlySet<string>;
  /** Ids the server refused (shown with the outbox list to fix or discard). */
  refusedIds: ReadonlySet<string>;
}

interface SavedPond {
  at: string;
  doMgL: number | null;
  temperatureC: number | null;
  aeratorOn: boolean;
  ids: string[];
}

const KEEP_MS = 14 * 3600_000;
const draftKey = (farmId: string) => `gillwise.night-round.${farmId}`;

interface Stored {
  entries: Record<string, PondEntry>;
  saved: Record<string, SavedPond>;
  at: string;
}

function readStored(farmId: string): Stored {
  try {
    const raw = globalThis.localStorage?.getItem(draftKey(farmId));
    const v = raw ? (JSON.parse(raw) as Partial<Stored>) : null;
    if (v && typeof v.at === 'string' && Date.now() - Date.parse(v.at) < KEEP_MS)
      return { entries: v.entries ?? {}, saved: v.saved ?? {}, at: v.at };
  } catch {
    /* fall through */
  }
  return { entries: {}, saved: {}, at: new Date().toISOString() };
}

function writeStored(farmId: string, s: Stored) {
  try {
    globalThis.localStorage?.setItem(draftKey(farmId), JSON.stringify({ ...s, at: new Date().toISOString() }));
  } catch {
    /* the round still works without storage */
  }
}

function doLevel(rules: readonly ThresholdRuleDto[] | null, doMgL: number | undefined): 'clear' | 'watch' | 'act' | null {
  const rule = rules?.find((r) => r.metric === 'do_min');
  if (!rule || doMgL === undefined) return null;
  const { watch, act } = limitsAt(rule, null);
  if (act !== null && doMgL <= act) return 'act';
  if (watch !== null && doMgL <= watch) return 'watch';
  return 'clear';
}

function PondCard({
  unit,
  status,
  lastDo,
  lastTemp,
  rules,
  entry,
  saved,
  sender,
  prefs,
  timeZone,
  onChange,
  onSaved,
  onAgain,
}: {
  unit: UnitDto;
  status: UnitStatusDto | undefined;
  lastDo: WaterTestDto | null | undefined;
  lastTemp: WaterTestDto | null | undefined;
  rules: readonly ThresholdRuleDto[] | null;
  entry: PondEntry;
  saved: SavedPond | undefined;
  sender: NightRoundSender;
  prefs: DisplayPrefs;
  timeZone: string;
  onChange: (e: PondEntry) => void;
  onSaved: (s: SavedPond) => void;
  onAgain: () => void;
}) {
  const { t, i18n } = useTranslation();
  const lang = i18n.language;
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [busy, setBusy] = useState(false);
  const tUnit = prefs.temperatureUnit === 'F' ? '°F' : '°C';
  const temp = (c: number) => `${formatNumber(fromCelsius(c, prefs.temperatureUnit), lang, 1)}\u00a0${tUnit}`;
  const probeDo = status?.latest.dissolved_oxygen;
  const probeT = status?.latest.water_temperature;
  const probeAerator = status?.latest.aerator_running;
  const typedDo = parseDecimal(entry.doMgL);
  const level = doLevel(rules, typedDo);

  const save = async () => {
    const { bodies, errors: problems } = nightBodies(entry, prefs.temperatureUnit, new Date());
    setErrors(problems);
    if (!bodies.length) return;
    setBusy(true);
    try {
      const ids: string[] = [];
      for (const body of bodies) ids.push(await sender.send({ unitId: unit.id, unitCode: unit.code, unitName: unit.name, body }));
      const doBody = bodies.find((b) => b.analyte === 'dissolved_oxygen');
      const tBody = bodies.find((b) => b.analyte === 'temperature');
      onSaved({
        at: new Date().toISOString(),
        doMgL: doBody?.value ?? null,
        temperatureC: tBody?.value ?? null,
        aeratorOn: entry.aeratorOn,
        ids,
      });
    } finally {
      setBusy(false);
    }
  };

  const errorText = (field: 'doMgL' | 'temperature') => {
    const code = errors[field];
    if (!code) return undefined;
    if (code === 'invalid_type') return t('nightRound.errors.number');
    return field === 'doMgL' ? t('nightRound.errors.doRange') : t('nightRound.errors.tempRange', { min: temp(-5), max: temp(50) });
  };

  const waiting = saved?.ids.some((id) => sender.pendingIds.has(id)) ?? false;
  const refused = saved?.ids.some((id) => sender.refusedIds.has(id)) ?? false;

  return (
    <article
      className={cx('gw-card flex flex-col gap-3 px-4 py-4', saved ? 'border-clear' : '')}
      data-night-unit={unit.code}
      aria-labelledby={`nr-${unit.id}`}
    >
      <header className="flex items-center gap-3">
        <span className="grid min-w-14 place-items-center rounded-xl bg-abyss-800 px-2 py-2 text-xl font-bold text-white">{unit.code}</span>
        <h2 id={`nr-${unit.id}`} className="min-w-0 flex-1 truncate text-lg font-bold">
          {unit.name}
        </h2>
      </header>

      <dl className="grid gap-1 text-base">
        <div className="flex flex-wrap gap-x-2">
          <dt className="font-bold text-muted">{t('nightRound.probeNow')}</dt>
          <dd data-testid="probe-now">
            {probeDo || probeT
              ? [
                  probeDo ? t('nightRound.do', { v: formatNumber(probeDo.value, lang, 1) }) : null,
                  probeT ? temp(probeT.value) : null,
                  probeAerator ? t(probeAerator.value >= 0.5 ? 'nightRound.aeratorRunning' : 'nightRound.aeratorStopped') : null,
                ]
                  .filter(Boolean)
                  .join(' · ') + ` (${farmClock((probeDo ?? probeT)!.at, timeZone, lang)})`
              : t('nightRound.noProbe')}
          </dd>
        </div>
        <div className="flex flex-wrap gap-x-2">
          <dt className="font-bold text-muted">{t('nightRound.lastHand')}</dt>
          <dd data-testid="last-reading">
            {lastDo || lastTemp
              ? [
                  lastDo
                    ? t('nightRound.doAt', { v: formatNumber(lastDo.value, lang, 1), when: farmWhen(lastDo.sampledAt, timeZone, lang) })
                    : null,
                  lastTemp ? `${temp(lastTemp.value)} (${farmWhen(lastTemp.sampledAt, timeZone, lang)})` : null,
                  (lastDo ?? lastTemp)?.aeratorOn ? t('nightRound.aeratorWasOn') : null,
                ]
                  .filter(Boolean)
                  .join(' · ')
              : t('nightRound.noLast')}
          </dd>
        </div>
      </dl>

      {saved ? (
        <div className="flex flex-col gap-2">
          <p className="flex items-start gap-2 rounded-xl bg-clear-soft px-3 py-2 text-base font-bold text-clear-ink">
            <Icon name="check" className="mt-0.5 shrink-0" />
            <span>
              {t('nightRound.saved', { time: farmClock(saved.at, timeZone, lang) })}{' '}
              {[
                saved.doMgL !== null ? t('nightRound.do', { v: formatNumber(saved.doMgL, lang, 1) }) : null,
                saved.temperatureC !== null ? temp(saved.temperatureC) : null,
                saved.aeratorOn ? t('nightRound.aeratorOn') : null,
              ]
                .filter(Boolean)
                .join(' · ')}
            </span>
          </p>
          <p className="text-base font-bold" data-testid="night-send-state" data-state={refused ? 'refused' : waiting ? 'waiting' : 'sent'}>
            {refused ? (
              <span className="text-act">◆ {t('nightRound.refused')}</span>
            ) : waiting ? (
              <span className="text-ember-700">◔ {t('nightRound.waiting')}</span>
            ) : (
              <span className="text-clear-ink">● {t('nightRound.sent')}</span>
            )}
          </p>
          <Button variant="ghost" onClick={onAgain} className="self-start">
            {t('nightRound.again')}
          </Button>
        </div>
      ) : (
        <>
          <div className="grid grid-cols-2 gap-3">
            <NumberField
              label={t('nightRound.doLabel')}
              unit="mg/L"
              className="min-h-14 text-2xl font-bold"
              value={entry.doMgL}
              onChange={(e) => onChange({ ...entry, doMgL: e.target.value })}
              error={errorText('doMgL')}
            />
            <NumberField
              label={t('nightRound.tempLabel')}
              unit={tUnit}
              className="min-h-14 text-2xl font-bold"
              value={entry.temperature}
              onChange={(e) => onChange({ ...entry, temperature: e.target.value })}
              error={errorText('temperature')}
            />
          </div>
          {level ? (
            <p className="flex items-center gap-2 text-base font-bold">
              <StatusBadge status={level} size="sm" /> {t(`nightRound.level.${level}`)}
            </p>
          ) : null}
          {errors.form ? <p className="text-base font-bold text-act">◆ {t('nightRound.errors.empty')}</p> : null}
          <div className="grid gap-3 sm:grid-cols-2">
            <button
              type="button"
              aria-pressed={entry.aeratorOn}
              onClick={() => onChange({ ...entry, aeratorOn: !entry.aeratorOn })}
              className={cx(
                'flex min-h-14 items-center justify-center gap-2 rounded-xl border-2 px-3 text-lg font-bold',
                entry.aeratorOn ? 'border-ember-600 bg-ember-400 text-abyss-950' : 'border-abyss-600 bg-card text-abyss-900',
              )}
            >
              <span
                aria-hidden="true"
                className={cx(
                  'grid size-6 place-items-center rounded-md border-2',
                  entry.aeratorOn ? 'border-abyss-950 bg-abyss-950 text-ember-300' : 'border-abyss-600',
                )}
              >
                {entry.aeratorOn ? '✓' : ''}
              </span>
              {t('nightRound.aeratorOn')}
            </button>
            <Button variant="primary" size="lg" onClick={() => void save()} loading={busy}>
              {t('nightRound.save', { code: unit.code })}
            </Button>
          </div>
        </>
      )}
    </article>
  );
}

export interface NightRoundProps {
  farmId: string;
  timeZone: string;
  prefs: DisplayPrefs;
  sender: NightRoundSender;
  /** The device outbox list, composed in by the route. */
  outbox?: ReactNode;
}

/** The night round: ponds in walking order, one DO and temperature per pond, aerator in one tap, stamped now. */
export function NightRound({ farmId, timeZone, prefs, sender, outbox }: NightRoundProps) {
  const { t } = useTranslation();
  const unitsQ = useQuery(nightRoundQueries.units(farmId));
  const statusQ = useQuery(nightRoundQueries.status(farmId));
  const thresholdsQ = useQuery(nightRoundQueries.thresholds(farmId));
  const [allKinds, setAllKinds] = useState(false);
  const [stored, setStored] = useState<Stored>(() => readStored(farmId));
  useEffect(() => writeStored(farmId, stored), [farmId, stored]);

  const units = useMemo(
    () =>
      [...(unitsQ.data?.units ?? [])]
        .filter((u) => u.state !== 'fallow' && (allKinds || u.kind === 'pond'))
        .sort((a, b) => a.walkOrder - b.walkOrder || a.code.localeCompare(b.code)),
    [unitsQ.data, allKinds],
  );
  const lastQs = useQueries({
    queries: units.flatMap((u) => [
      nightRoundQueries.last(farmId, u.id, 'dissolved_oxygen'),
      nightRoundQueries.last(farmId, u.id, 'temperature'),
    ]),
  });
  const profiles = thresholdsQ.data?.profiles ?? null;
  const rulesOf = (u: UnitDto) => {
    const p = profiles?.find((x) => x.id === u.thresholdProfileId) ?? profiles?.find((x) => x.unitIds.includes(u.id));
    return p?.rules ?? null;
  };
  const done = units.filter((u) => stored.saved[u.id]).length;

  return (
    <div className="flex flex-col gap-6" data-testid="night-round">
      <title>{`${t('nav.nightRound')} · Gillwise`}</title>
      <header className="flex flex-col gap-1">
        <h1 className="text-3xl font-bold leading-tight">{t('nightRound.title')}</h1>
        <p className="text-lg text-muted">{t('nightRound.intro')}</p>
        {units.length ? (
          <p className="text-lg font-bold text-abyss-700" data-testid="night-progress">
            {t('nightRound.progress', { done, total: units.length })}
          </p>
        ) : null}
      </header>
      {outbox}
      <label className="flex min-h-12 items-center gap-3 text-base font-bold">
        <input type="checkbox" className="size-6 accent-abyss-700" checked={allKinds} onChange={(e) => setAllKinds(e.target.checked)} />
        {t('nightRound.allKinds')}
      </label>
      {unitsQ.isPending ? (
        <p className="flex items-center gap-3 text-lg" role="status">
          <Spinner /> {t('common.loading')}
        </p>
      ) : unitsQ.isError ? (
        <Callout tone="danger" title={t('nightRound.failed')}>
          <Button variant="secondary" onClick={() => void unitsQ.refetch()}>
            {t('common.retry')}
          </Button>
        </Callout>
      ) : (
        <ol className="flex flex-col gap-4">
          {units.map((u, i) => (
            <li key={u.id}>
              <PondCard
                unit={u}
                status={statusQ.data?.units.find((s) => s.id === u.id)}
                lastDo={lastQs[i * 2]?.data}
                lastTemp={lastQs[i * 2 + 1]?.data}
                rules={rulesOf(u)}
                entry={stored.entries[u.id] ?? emptyPondEntry()}
                saved={stored.saved[u.id]}
                sender={sender}
                prefs={prefs}
                timeZone={timeZone}
                onChange={(e) => setStored((s) => ({ ...s, entries: { ...s.entries, [u.id]: e } }))}
                onSaved={(sv) =>
                  setStored((s) => {
                    const entries = { ...s.entries };
                    delete entries[u.id];
                    return { ...s, entries, saved: { ...s.saved, [u.id]: sv } };
                  })
                }
                onAgain={() =>
                  setStored((s) => {
                    const saved = { ...s.saved };
                    delete saved[u.id];
                    return { ...s, saved };
                  })
                }
              />
            </li>
          ))}
        </ol>
      )}
      <p className="text-sm text-muted">{t('cautions.thresholds')}</p>
    </div>
  );
}
