import { NH3_PER_NH3_N, type AmmoniaMethod } from '@shared/chemistry';
import type { DisplayPrefs } from '@shared/schemas/auth.schema';
import { analyteRules, analytes, type Analyte, type TestMethod } from '@shared/schemas/water-tests.schema';
import { useQuery } from '@tanstack/react-query';
import { useEffect, useMemo, useRef, useState } from 'react';
import { useForm, type FieldErrors, type Resolver } from 'react-hook-form';
import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { NumberField, parseDecimal, Select, TextField } from '@/components/ui/field';
import { Icon } from '@/components/ui/icon';
import { Spinner } from '@/components/ui/spinner';
import { StatusBadge } from '@/components/ui/status-badge';
import { useAuth } from '@/lib/auth';
import { pondsideQueries } from '../api/farm-data';
import { waterTestsPath } from '../api/water-tests';
import { useOutboxEntries, useOutboxSync } from '../hooks/use-outbox';
import { usePosition } from '../hooks/use-position';
import { clearDraft, pondsideDraftKey, pondsideLastKey, readDraft, writeDraft } from '../lib/draft-store';
import {
  farmClock,
  formatConcentration,
  formatNumber,
  formatTemperature,
  fromDisplayTemperature,
  temperatureSymbol,
  toDisplayTemperature,
} from '../lib/format';
import { instantFreeAmmonia, type InstantResult } from '../lib/instant-result';
import { cardSteps, defaultMethod } from '../lib/kit-cards';
import { checkAgainstRules, worstLevel } from '../lib/levels';
import { outbox, type OutboxEntry } from '../lib/outbox';
import { emptyTestForm, sanitizeDraft, validateWaterTest, type TestFormField, type TestFormValues } from '../lib/test-form';
import { testErrorText } from '../lib/test-messages';
import { orderUnits } from '../lib/unit-order';
import { photoForOutbox } from '../lib/photo';
import { newClientId } from '../lib/uuid';
import { AmmoniaReadout, type ProfileRules } from './ammonia-readout';
import { ChoiceGroup } from '@/components/ui/choice-group';
import { OutboxList } from './outbox-list';
import { PhotoPicker } from '@/components/ui/photo-picker';
import { InstantValues } from './provenance';
import { TestResult, type SavedTest } from './test-result';
import { UnitPicker } from './unit-picker';

const DEFAULT_PREFS: DisplayPrefs = { temperatureUnit: 'C', concentrationUnit: 'mg/L', ammoniaBasis: 'nh3' };
/** Any valid UUID: validation only needs the shape; the real client id is made at "Save". */
const PLACEHOLDER_ID = '00000000-0000-4000-8000-000000000000';
const INTERFERING = new Set(['formalin', 'copper', 'ammonia_binder']);
const LAST_KEEP_MS = 12 * 3600_000;

function restoreLast(farmId: string): SavedTest | null {
  const raw = readDraft(pondsideLastKey(farmId), 'session');
  if (!raw || typeof raw !== 'object') return null;
  const s = raw as Partial<SavedTest>;
  if (typeof s.clientId !== 'string' || typeof s.unitId !== 'string' || !s.body || typeof s.savedAt !== 'string') return null;
  if (Date.now() - Date.parse(s.savedAt) > LAST_KEEP_MS) return null;
  return s as SavedTest;
}

function sampledAtOf(time: string): Date {
  const m = /^(\d{1,2}):(\d{2})$/.exec(time.trim());
  const at = new Date();
  if (m) at.setHours(Number(m[1]), Number(m[2]), 0, 0);
  return at;
}

function toHhmm(iso: string | undefined): string {
  if (!iso) return '';
  const d = new Date(iso);
  return `${String(d.getHours()).padStart(2, '0')}:${String(d.getMinutes()).padStart(2, '0')}`;
}

export interface PondsideTestProps {
  farmId: string;
  timeZone: string;
  /** The unit named in the URL (/units/:unitId/test). */
  unitIdFromUrl?: string | undefined;
  /** ?label= from a scanned QR label. */
  labelId?: string | null | undefined;
  /** Keep the address bar on the chosen unit, so a reload comes back to it. */
  onUnitChange?: ((unitId: string) => void) | undefined;
  /** Link to the printable QR label of a unit. */
  labelHref?: ((unitId: string) => string) | undefined;
  /** Open this refused outbox entry in the form to fix it (?fix= from another screen). */
  fixId?: string | null | undefined;
}

/** The pondside test: choose the unit, the kit, tap the card step, see the free ammonia, save. */
export function PondsideTest({ farmId, timeZone, unitIdFromUrl, labelId, onUnitChange, labelHref, fixId }: PondsideTestProps) {
  const { t, i18n } = useTranslation();
  const lang = i18n.language;
  const { me } = useAuth();
  const prefs = me?.user.prefs ?? DEFAULT_PREFS;
  const userId = me?.user.id ?? '';
  useOutboxSync();

  const unitsQ = useQuery(pondsideQueries.units(farmId));
  const statusQ = useQuery(pondsideQueries.status(farmId));
  const farmQ = useQuery(pondsideQueries.farm(farmId));
  const tasksQ = useQuery(pondsideQueries.tasks(farmId));
  const thresholdsQ = useQuery(pondsideQueries.thresholds(farmId));
  const labelQ = useQuery({ ...pondsideQueries.label(farmId, labelId ?? '-'), enabled: Boolean(labelId) });
  const position = usePosition();
  const entries = useOutboxEntries().filter((e) => e.farmId === farmId && e.userId === userId);

  const draftKey = pondsideDraftKey(farmId);
  const lastKey = pondsideLastKey(farmId);
  const [saved, setSaved] = useState<SavedTest | null>(() => {
    // A scanned label or a link to another unit means a new test; a reload comes back to the result.
    const last = labelId ? null : restoreLast(farmId);
    return last && (!unitIdFromUrl || last.unitId === unitIdFromUrl) ? last : null;
  });
  const [editing, setEditing] = useState<OutboxEntry | null>(null);
  const [photo, setPhoto] = useState<File | null>(null);

  const [firstDraft] = useState(() => sanitizeDraft(readDraft(draftKey)));
  const draftTyped = Boolean(
    firstDraft.reading?.trim() || firstDraft.ph?.trim() || firstDraft.temperature?.trim() || firstDraft.note?.trim(),
  );
  // Opened for another unit than the half-typed draft's: never carry a reading over to another unit,
  // but keep the draft aside so the hand can go back to it.
  const asideKey = `${draftKey}.aside`;
  const [setAside, setSetAsideState] = useState<Partial<TestFormValues> | null>(() => {
    if (unitIdFromUrl && firstDraft.unitId && firstDraft.unitId !== unitIdFromUrl && draftTyped) {
      writeDraft(asideKey, firstDraft);
      return firstDraft;
    }
    const kept = sanitizeDraft(readDraft(asideKey));
    return kept.unitId ? kept : null;
  });
  const setSetAside = (v: Partial<TestFormValues> | null) => {
    if (!v) clearDraft(asideKey);
    setSetAsideState(v);
  };
  const [initial] = useState(() =>
    unitIdFromUrl && firstDraft.unitId && firstDraft.unitId !== unitIdFromUrl
      ? emptyTestForm({ unitId: unitIdFromUrl, analyte: firstDraft.analyte, method: firstDraft.method, basis: firstDraft.basis })
      : emptyTestForm({ ...firstDraft, ...(unitIdFromUrl ? { unitId: unitIdFromUrl } : {}) }),
  );

  const tempUnitRef = useRef(prefs.temperatureUnit);
  tempUnitRef.current = prefs.temperatureUnit;
  const resolver = useMemo<Resolver<TestFormValues>>(
    () => (values) => {
      const r = validateWaterTest(values, { clientId: PLACEHOLDER_ID, temperatureUnit: tempUnitRef.current, now: new Date() });
      if (r.body) return { values, errors: {} };
      const errors: FieldErrors<TestFormValues> = {};
      for (const issue of r.issues) if (issue.field !== 'form') errors[issue.field] = { type: issue.code, message: issue.message };
      return { values: {}, errors };
    },
    [],
  );

  const form = useForm<TestFormValues>({ defaultValues: initial, resolver, mode: 'onSubmit', reValidateMode: 'onChange' });
  const { register, setValue, handleSubmit, formState, reset, watch, setFocus } = form;
  const values = watch();

  useEffect(() => {
    const sub = watch((v) => writeDraft(draftKey, v));
    return () => sub.unsubscribe();
  }, [watch, draftKey]);

  // A scanned label names the unit; trust the label over a stale address.
  const labelUnitId = labelQ.data?.unitId;
  useEffect(() => {
    if (labelUnitId && labelUnitId !== form.getValues('unitId')) setValue('unitId', labelUnitId);
  }, [labelUnitId, setValue, form]);

  const units = useMemo(() => unitsQ.data?.units ?? [], [unitsQ.data]);
  const rows = useMemo(() => orderUnits(units, tasksQ.data?.tests ?? [], position.position), [units, tasksQ.data, position.position]);
  const unit = units.find((u) => u.id === values.unitId) ?? null;
  const unitStatus = statusQ.data?.units.find((u) => u.id === values.unitId) ?? null;
  const settings = farmQ.data?.settings;
  const windowMinutes = settings?.probeWindowMinutes ?? 30;
  const farmMethod: AmmoniaMethod | undefined = settings && settings.freeAmmoniaMethod !== 'auto' ? settings.freeAmmoniaMethod : undefined;
  const profiles = thresholdsQ.data?.profiles ?? [];

  const profileOf = (unitId: string): ProfileRules | null => {
    const u = units.find((x) => x.id === unitId);
    const p = u ? (profiles.find((x) => x.id === u.thresholdProfileId) ?? profiles.find((x) => x.unitIds.includes(u.id))) : undefined;
    return p ? { name: p.name, rules: p.rules } : null;
  };
  const profile = unit ? profileOf(unit.id) : null;

  const treatmentsQ = useQuery({
    ...pondsideQueries.unitTreatments(farmId, values.unitId || '-'),
    enabled: Boolean(values.unitId) && values.method === 'nessler',
  });
  const interferenceHours = settings?.nesslerInterferenceHours ?? 72;
  const interfering = (treatmentsQ.data?.treatments ?? []).find(
    (tr) =>
      INTERFERING.has(tr.product) &&
      Date.now() - Date.parse(tr.startsAt) <= interferenceHours * 3600_000 &&
      Date.parse(tr.startsAt) <= Date.now(),
  );

  const isAmmonia = values.analyte === 'total_ammonia';
  const readingNumber = parseDecimal(values.reading);
  const handTemp = parseDecimal(values.temperature);
  const latest = unitStatus?.latest ?? {};
  const instant: InstantResult | null =
    isAmmonia && unit
      ? instantFreeAmmonia({
          readingMgL: readingNumber,
          basis: values.basis,
          probe: { ph: latest.ph, temperature: latest.water_temperature, salinity: latest.salinity },
          handheld: {
            ph: parseDecimal(values.ph),
            temperatureC: handTemp === undefined ? undefined : fromDisplayTemperature(handTemp, prefs.temperatureUnit),
            salinityPpt: parseDecimal(values.salinity),
          },
          defaultSalinityPpt: unit.defaultSalinityPpt,
          sampledAt: sampledAtOf(values.sampledTime),
          windowMinutes,
          method: farmMethod,
        })
      : null;

  const rules = analyteRules[values.analyte];
  const methodChoices = (rules.methods as readonly TestMethod[]).map((m) => ({
    value: m,
    label: t(`pondside.method.${m}`),
    description: m === 'salicylate' || m === 'nessler' ? t(`pondside.methodHint.${m}`) : undefined,
  }));
  const basisChoices = (rules.bases as readonly string[]).map((b) => ({
    value: b,
    label: t(`pondside.basis.${b}`),
    description: t(`pondside.basisHint.${b}`),
  }));
  const steps = cardSteps(values.analyte, values.method);
  const readingUnit = values.analyte === 'temperature' ? temperatureSymbol(prefs.temperatureUnit) : rules.unit;

  const err = (field: TestFormField) => testErrorText(t, field, formState.errors[field], values, prefs.temperatureUnit, lang);

  const chooseAnalyte = (a: Analyte) => {
    setValue('analyte', a);
    const r = analyteRules[a];
    if (!(r.methods as readonly string[]).includes(form.getValues('method'))) setValue('method', defaultMethod[a]);
    setValue('basis', r.bases[0]);
  };

  const chooseUnit = (id: string) => {
    setValue('unitId', id, { shouldValidate: formState.isSubmitted });
    onUnitChange?.(id);
  };

  const onSubmit = handleSubmit(async (v) => {
    const clientId = editing?.id ?? newClientId();
    const r = validateWaterTest(v, { clientId, temperatureUnit: prefs.temperatureUnit, now: new Date() });
    const chosen = units.find((u) => u.id === v.unitId);
    if (!r.body || !chosen) return;
    const body = r.body;
    if (editing) await outbox.replace(editing.id, body as unknown as Record<string, unknown>);
    else
      await outbox.add({
        id: clientId,
        farmId,
        unitId: chosen.id,
        userId,
        kind: 'water-test',
        path: waterTestsPath(farmId, chosen.id),
        body: body as unknown as Record<string, unknown>,
        unitCode: chosen.code,
        unitName: chosen.name,
        photo: photo ? await photoForOutbox(photo, photo.name) : null,
      });
    const next: SavedTest = {
      clientId,
      farmId,
      unitId: chosen.id,
      unitCode: chosen.code,
      unitName: chosen.name,
      body,
      instant,
      savedAt: new Date().toISOString(),
      hasPhoto: Boolean(photo) || Boolean(editing?.photo),
    };
    setPhoto(null);
    setSaved(next);
    writeDraft(lastKey, next, 'session');
    setEditing(null);
    reset(emptyTestForm({ unitId: v.unitId, analyte: v.analyte, method: v.method, basis: v.basis }));
    if (typeof window !== 'undefined') window.scrollTo({ top: 0 });
  });

  const startOver = (keepUnit: boolean) => {
    const unitId = keepUnit ? (saved?.unitId ?? '') : '';
    setSaved(null);
    clearDraft(lastKey, 'session');
    reset(emptyTestForm({ unitId, analyte: values.analyte, method: values.method, basis: values.basis }));
    if (keepUnit) setTimeout(() => setFocus('reading'), 0);
  };

  const fix = (entry: OutboxEntry) => {
    const b = entry.body;
    const text = (v: unknown) => (typeof v === 'number' ? formatNumber(v, lang, 4) : '');
    const analyte = (analytes as readonly string[]).includes(String(b.analyte)) ? (b.analyte as Analyte) : 'total_ammonia';
    const tempC = typeof b.handheldTemperatureC === 'number' ? b.handheldTemperatureC : undefined;
    const value = typeof b.value === 'number' ? b.value : undefined;
    reset(
      emptyTestForm({
        unitId: entry.unitId,
        analyte,
        method: String(b.method) as TestMethod,
        basis: String(b.basis),
        reading: analyte === 'temperature' && value !== undefined ? text(toDisplayTemperature(value, prefs.temperatureUnit)) : text(value),
        ph: text(b.handheldPh),
        temperature: tempC === undefined ? '' : text(toDisplayTemperature(tempC, prefs.temperatureUnit)),
        salinity: text(b.handheldSalinityPpt),
        sampledTime: toHhmm(typeof b.sampledAt === 'string' ? b.sampledAt : undefined),
        note: typeof b.note === 'string' ? b.note : '',
      }),
    );
    for (const [field, messages] of Object.entries(entry.error?.fieldErrors ?? {})) {
      const key =
        (
          {
            value: 'reading',
            handheldPh: 'ph',
            handheldTemperatureC: 'temperature',
            handheldSalinityPpt: 'salinity',
            sampledAt: 'sampledTime',
          } as Record<string, TestFormField>
        )[field] ?? (field as TestFormField);
      if (messages[0]) form.setError(key, { type: 'server', message: messages[0] });
    }
    setEditing(entry);
    setSaved(null);
    clearDraft(lastKey, 'session');
    if (typeof window !== 'undefined') window.scrollTo({ top: 0 });
  };

  const fixRequested = useRef(false);
  const toFix = fixId ? entries.find((e) => e.id === fixId && e.state === 'rejected') : undefined;
  useEffect(() => {
    if (toFix && !fixRequested.current) {
      fixRequested.current = true;
      fix(toFix);
    }
  });

  const profileCheck =
    instant?.status === 'ok' && profile
      ? worstLevel(
          checkAgainstRules(profile.rules, {
            analyte: 'total_ammonia',
            nh3MgL: instant.nh3MgL,
            tanMgL: instant.tanMgL,
            salinityPpt: instant.salinity.value,
          }),
        )
      : null;

  if (saved) {
    return (
      <>
        <title>{`${t('nav.pondside')} · Gillwise`}</title>
        <TestResult
          saved={saved}
          timeZone={timeZone}
          prefs={prefs}
          profile={profileOf(saved.unitId)}
          windowMinutes={windowMinutes}
          onNewTest={() => startOver(false)}
          onAgain={() => startOver(true)}
          onFix={fix}
        />
        <OutboxList entries={entries.filter((e) => e.id !== saved.clientId)} timeZone={timeZone} onFix={fix} className="mt-6" />
      </>
    );
  }

  const loading = unitsQ.isPending;
  const probePh = latest.ph;
  const probeTemp = latest.water_temperature;
  const probeFresh = (at: string | undefined) => Boolean(at && Math.abs(Date.now() - Date.parse(at)) <= windowMinutes * 60_000);
  const showSalinity = Boolean(unit && unit.waterType !== 'fresh') || Boolean(values.salinity);
  const shownNh3 = instant?.status === 'ok' ? (prefs.ammoniaBasis === 'nh3-n' ? instant.nh3MgL / NH3_PER_NH3_N : instant.nh3MgL) : null;

  return (
    <form onSubmit={(e) => void onSubmit(e)} noValidate className="flex flex-col gap-7" data-testid="pondside-form">
      <title>{`${t('nav.pondside')} · Gillwise`}</title>
      <header className="flex flex-col gap-1">
        <h1 className="text-3xl font-bold leading-tight">{editing ? t('pondside.fixTitle') : t('pondside.title')}</h1>
        <p className="text-lg text-muted">{t('pondside.intro')}</p>
      </header>

      {labelId && labelQ.data ? (
        <p className="flex items-center gap-2 rounded-xl bg-abyss-50 px-4 py-3 font-bold text-abyss-800">
          <Icon name="check" /> {t('pondside.fromLabel', { code: labelQ.data.code })}
        </p>
      ) : null}
      {labelId && labelQ.isError ? <Callout tone="caution">{t('pondside.labelUnknown')}</Callout> : null}
      {editing ? (
        <Callout tone="danger" title={t('pondside.fixBanner')}>
          {t('pondside.fixExplain')}
        </Callout>
      ) : null}

      {setAside ? (
        <Callout tone="caution" title={t('pondside.setAside.title')}>
          <p>
            {t('pondside.setAside.body', {
              code: units.find((u) => u.id === setAside.unitId)?.code ?? '',
              reading: setAside.reading ? `${setAside.reading} ${analyteRules[setAside.analyte ?? 'total_ammonia'].unit}` : '—',
            })}
          </p>
          <div className="mt-2 flex flex-wrap gap-2">
            <Button
              variant="primary"
              onClick={() => {
                reset(emptyTestForm(setAside));
                if (setAside.unitId) onUnitChange?.(setAside.unitId);
                setSetAside(null);
              }}
            >
              {t('pondside.setAside.back')}
            </Button>
            <Button variant="secondary" onClick={() => setSetAside(null)}>
              {t('pondside.setAside.drop')}
            </Button>
          </div>
        </Callout>
      ) : null}

      <OutboxList entries={entries} timeZone={timeZone} onFix={fix} />

      {loading ? (
        <p className="flex items-center gap-3 text-lg" role="status">
          <Spinner /> {t('common.loading')}
        </p>
      ) : unitsQ.isError ? (
        <Callout tone="danger" title={t('pondside.unitsFailed')}>
          <Button variant="secondary" onClick={() => void unitsQ.refetch()}>
            {t('common.retry')}
          </Button>
        </Callout>
      ) : (
        <UnitPicker
          rows={rows}
          selectedId={values.unitId}
          onSelect={chooseUnit}
          position={position}
          error={err('unitId')}
          statusOf={(id) => statusQ.data?.units.find((u) => u.id === id)?.status ?? null}
        />
      )}

      <section aria-labelledby="kit-title" className="flex flex-col gap-4">
        <h2 id="kit-title" className="text-xl font-bold">
          {t('pondside.kit.title')}
        </h2>
        <Select
          label={t('pondside.kit.analyte')}
          value={values.analyte}
          onChange={(e) => chooseAnalyte(e.target.value as Analyte)}
          options={analytes.map((a) => ({ value: a, label: t(`pondside.analyte.${a}`) }))}
        />
        <ChoiceGroup
          legend={t('pondside.kit.method')}
          name="method"
          value={values.method}
          choices={methodChoices}
          onChange={(m) => setValue('method', m, { shouldValidate: formState.isSubmitted })}
          error={err('method')}
          columns={3}
        />
        {values.method === 'nessler' ? (
          <Callout tone="caution" title={t('pondside.nessler.title')}>
            <span className="flex flex-col gap-2">
              <span>{t('cautions.nessler')}</span>
              <span>{t('pondside.nessler.interference')}</span>
            </span>
          </Callout>
        ) : null}
        {values.method === 'nessler' && interfering ? (
          <Callout tone="danger" title={t('pondside.nessler.recentTitle')}>
            {t('pondside.nessler.recent', {
              product: t(`pondside.product.${interfering.product}`),
              hours: Math.max(1, Math.round((Date.now() - Date.parse(interfering.startsAt)) / 3600_000)),
            })}
          </Callout>
        ) : null}
        {basisChoices.length > 1 ? (
          <ChoiceGroup
            legend={t('pondside.kit.basis')}
            hint={t('pondside.kit.basisHint')}
            name="basis"
            value={values.basis}
            choices={basisChoices}
            onChange={(b) => setValue('basis', b, { shouldValidate: formState.isSubmitted })}
            error={err('basis')}
            columns={1}
          />
        ) : null}
      </section>

      <section aria-labelledby="reading-title" className="flex flex-col gap-3">
        <h2 id="reading-title" className="sr-only">
          {t('pondside.reading.title')}
        </h2>
        <NumberField
          label={t('pondside.reading.label', { analyte: t(`pondside.analyte.${values.analyte}`) })}
          hint={steps.length ? t('pondside.reading.hintSteps') : t('pondside.reading.hint')}
          unit={readingUnit}
          className="min-h-16 text-3xl font-bold tabular-nums"
          error={err('reading')}
          {...register('reading')}
        />
        {steps.length ? (
          <div role="group" aria-label={t('pondside.reading.steps')} className="flex flex-col gap-2">
            <p className="text-sm font-bold uppercase tracking-wide text-muted">{t('pondside.reading.steps')}</p>
            <div className="flex flex-wrap gap-2">
              {steps.map((s) => {
                const pressed = readingNumber === s;
                return (
                  <button
                    key={s}
                    type="button"
                    aria-pressed={pressed}
                    onClick={() => setValue('reading', formatNumber(s, lang, 3), { shouldValidate: formState.isSubmitted })}
                    className={cx(
                      'min-h-14 min-w-16 rounded-xl border-2 px-3 text-xl font-bold tabular-nums',
                      pressed ? 'border-abyss-900 bg-abyss-800 text-white' : 'border-abyss-600 bg-card text-abyss-900 hover:bg-abyss-50',
                    )}
                  >
                    {formatNumber(s, lang, 3)}
                  </button>
                );
              })}
            </div>
          </div>
        ) : null}
      </section>

      {isAmmonia && instant && instant.status !== 'no_reading' ? (
        <section aria-labelledby="instant-title" aria-live="polite" className="flex flex-col gap-3" data-testid="instant-section">
          <h2 id="instant-title" className="sr-only">
            {t('pondside.instant.title')}
          </h2>
          {instant.status === 'ok' ? (
            <>
              <AmmoniaReadout
                testId="instant-result"
                caption={t('pondside.result.instantCaption')}
                nh3MgL={instant.nh3MgL}
                tanMgL={instant.tanMgL}
                fraction={instant.fraction}
                salinityPpt={instant.salinity.value}
                profile={profile}
                prefs={prefs}
              />
              <InstantValues
                timeZone={timeZone}
                prefs={prefs}
                values={[
                  { quantity: 'ph', value: instant.pH },
                  { quantity: 'water_temperature', value: instant.temperature },
                  { quantity: 'salinity', value: instant.salinity },
                ]}
              />
            </>
          ) : instant.status === 'out_of_range' ? (
            <Callout tone="caution" title={t('pondside.instant.outOfRangeTitle')}>
              {t('pondside.instant.outOfRange')}
            </Callout>
          ) : (
            <Callout tone="caution" title={t('pondside.instant.needsTitle')}>
              <span data-testid="instant-needs">{t(`pondside.instant.${instant.status}`, { minutes: windowMinutes })}</span>
            </Callout>
          )}
        </section>
      ) : null}

      {isAmmonia ? (
        <section aria-labelledby="water-title" className="flex flex-col gap-3">
          <h2 id="water-title" className="text-xl font-bold">
            {t('pondside.water.title')}
          </h2>
          {unit ? (
            <p className="text-base" data-testid="probe-now">
              {probePh || probeTemp
                ? t('pondside.water.probeNow', {
                    values: [
                      probePh ? t('pondside.prov.ph', { v: formatNumber(probePh.value, lang, 2) }) : null,
                      probeTemp ? formatTemperature(probeTemp.value, prefs.temperatureUnit, lang) : null,
                    ]
                      .filter(Boolean)
                      .join(' · '),
                    time: farmClock((probePh ?? probeTemp)!.at, timeZone, lang),
                  })
                : t('pondside.water.noProbe')}{' '}
              {(probePh && !probeFresh(probePh.at)) || (probeTemp && !probeFresh(probeTemp.at)) ? (
                <strong>{t('pondside.water.stale', { minutes: windowMinutes })}</strong>
              ) : null}
            </p>
          ) : null}
          <p className="text-sm text-muted">{t('pondside.water.hint')}</p>
          <div className={cx('grid gap-3', showSalinity ? 'grid-cols-2 sm:grid-cols-3' : 'grid-cols-2')}>
            <NumberField label={t('pondside.water.ph')} error={err('ph')} {...register('ph')} />
            <NumberField
              label={t('pondside.water.temperature')}
              unit={temperatureSymbol(prefs.temperatureUnit)}
              error={err('temperature')}
              {...register('temperature')}
            />
            {showSalinity ? (
              <NumberField label={t('pondside.water.salinity')} unit="‰" error={err('salinity')} {...register('salinity')} />
            ) : null}
          </div>
        </section>
      ) : null}

      <section aria-labelledby="more-title" className="flex flex-col gap-3">
        <h2 id="more-title" className="text-xl font-bold">
          {t('pondside.more.title')}
        </h2>
        <TextField
          type="time"
          label={t('pondside.more.time')}
          hint={t('pondside.more.timeHint')}
          error={err('sampledTime')}
          containerClassName="max-w-xs"
          {...register('sampledTime')}
        />
        <div className="flex flex-col gap-1.5">
          <label htmlFor="test-note" className="text-base font-bold">
            {t('pondside.more.note')}
          </label>
          <textarea
            id="test-note"
            rows={3}
            className={cx(
              'block w-full rounded-xl border-2 bg-card px-4 py-3 text-lg text-ink',
              formState.errors.note ? 'border-act' : 'border-line hover:border-abyss-500',
            )}
            aria-invalid={formState.errors.note ? true : undefined}
            {...register('note')}
          />
          {err('note') ? <p className="text-base font-bold text-act">{err('note')}</p> : null}
        </div>
        {editing ? null : (
          <PhotoPicker
            file={photo}
            onChange={setPhoto}
            label={t('pondside.photo.label')}
            hint={t('pondside.photo.hint')}
            takeLabel={t('pondside.photo.take')}
            removeLabel={t('pondside.photo.remove')}
            previewAlt={t('pondside.photo.previewAlt')}
          />
        )}
        {unit && labelHref ? (
          <p>
            <Link to={labelHref(unit.id)} className="gw-link inline-flex min-h-12 items-center gap-2">
              <Icon name="grid" size={20} />
              {t('pondside.printLabel', { code: unit.code })}
            </Link>
          </p>
        ) : null}
      </section>

      <p className="-mb-4 text-center text-sm text-muted">{t('pondside.saveNote')}</p>
      <div className="sticky bottom-[calc(4rem+env(safe-area-inset-bottom))] z-20 -mx-4 flex flex-col gap-2 border-t-2 border-line bg-paper/95 px-4 py-3 backdrop-blur sm:-mx-6 sm:px-6 lg:bottom-0 lg:mx-0 lg:rounded-t-xl lg:px-0">
        {shownNh3 !== null ? (
          <p className="flex items-center justify-between gap-3 text-lg font-bold" aria-hidden="true">
            <span>
              {prefs.ammoniaBasis === 'nh3-n' ? 'NH3-N' : 'NH3'} {formatConcentration(shownNh3, lang)} {prefs.concentrationUnit}
            </span>
            {profileCheck ? <StatusBadge status={profileCheck} size="sm" /> : null}
          </p>
        ) : null}
        <Button type="submit" variant="accent" size="lg" fullWidth loading={formState.isSubmitting} data-testid="save-test">
          {editing ? t('pondside.resend') : t('pondside.save')}
        </Button>
      </div>
    </form>
  );
}
