import {
  createObservationSchema,
  dieOffKinds,
  observationKinds,
  observationSchema,
  type CreateObservation,
} from '@shared/schemas/treatments.schema';
import { useQuery } from '@tanstack/react-query';
import { useEffect, useMemo, useState, type ReactNode } from 'react';
import { useForm, type FieldErrors, type Resolver } from 'react-hook-form';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { NumberField, parseDecimal, Select, TextField } from '@/components/ui/field';
import { Spinner } from '@/components/ui/spinner';
import { observationQueries } from '../api/observations';
import { ChoiceGroup } from '@/components/ui/choice-group';
import { PhotoPicker } from '@/components/ui/photo-picker';

type Kind = (typeof observationKinds)[number];

export interface ObservationFormValues {
  unitId: string;
  kind: Kind | '';
  detail: string;
  count: string;
  observedAt: string;
}

/** What the route hands in: the device outbox (stored first, sent when possible; idempotent by client id). */
export interface ObservationSender {
  send: (input: {
    unitId: string;
    unitCode: string;
    unitName: string;
    body: CreateObservation & { clientId: string };
    photo: File | null;
  }) => Promise<void>;
  newId: () => string;
  /** Still on the phone. */
  pendingIds: ReadonlySet<string>;
  refusedIds: ReadonlySet<string>;
  /** The server's answer once stored during this visit. */
  sentBody: (id: string) => unknown;
}

const PLACEHOLDER_ID = '00000000-0000-4000-8000-000000000000';
const quickDetails: Partial<Record<Kind, readonly string[]>> = {
  water_colour: ['clear', 'lightGreen', 'darkGreen', 'brown', 'blueGreenScum', 'milky'],
  odour: ['musty', 'rotten', 'chemical'],
  streaking: ['surface', 'deep'],
};

function localInput(d: Date): string {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}T${p(d.getHours())}:${p(d.getMinutes())}`;
}

const emptyForm = (unitId = ''): ObservationFormValues => ({ unitId, kind: '', detail: '', count: '', observedAt: localInput(new Date()) });

export function toObservationBody(v: ObservationFormValues, clientId: string): Record<string, unknown> {
  const count = v.count.trim() ? (parseDecimal(v.count) ?? Number.NaN) : null;
  return {
    clientId,
    kind: v.kind || undefined,
    detail: v.detail.trim() || null,
    count,
    observedAt: v.observedAt ? new Date(v.observedAt).toISOString() : undefined,
  };
}

const resolver: Resolver<ObservationFormValues> = (values) => {
  const errors: FieldErrors<ObservationFormValues> = {};
  if (!values.unitId) errors.unitId = { type: 'required', message: '' };
  const parsed = createObservationSchema.safeParse(toObservationBody(values, PLACEHOLDER_ID));
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const field = String(issue.path[0] ?? '') as keyof ObservationFormValues;
      if (['kind', 'detail', 'count', 'observedAt'].includes(field) && !errors[field])
        errors[field] = { type: issue.code, message: issue.message };
    }
  }
  return Object.keys(errors).length ? { values: {}, errors } : { values, errors: {} };
};

const draftKey = (farmId: string) => `gillwise.observation.draft.${farmId}`;

export interface ObservationsScreenProps {
  farmId: string;
  timeZone: string;
  sender: ObservationSender;
  outbox?: ReactNode;
}

/** Log what the hand sees at the pond; die-off signs put the unit on closer watch (daily tests). */
export function ObservationsScreen({ farmId, timeZone, sender, outbox }: ObservationsScreenProps) {
  const { t, i18n } = useTranslation();
  const lang = i18n.language;
  const unitsQ = useQuery(observationQueries.units(farmId));
  const units = useMemo(() => [...(unitsQ.data?.units ?? [])].sort((a, b) => a.walkOrder - b.walkOrder), [unitsQ.data]);
  const initial = useMemo(() => {
    try {
      const raw = globalThis.localStorage?.getItem(draftKey(farmId));
      if (raw) return { ...emptyForm(), ...(JSON.parse(raw) as Partial<ObservationFormValues>) };
    } catch {
      /* ignore */
    }
    return emptyForm();
  }, [farmId]);
  const { register, handleSubmit, setValue, watch, reset, formState } = useForm<ObservationFormValues>({
    defaultValues: initial,
    resolver,
  });
  const values = watch();
  useEffect(() => {
    const sub = watch((v) => {
      try {
        globalThis.localStorage?.setItem(draftKey(farmId), JSON.stringify(v));
      } catch {
        /* ignore */
      }
    });
    return () => sub.unsubscribe();
  }, [watch, farmId]);
  const [last, setLast] = useState<{ id: string; unitId: string; kind: Kind } | null>(null);
  const [photo, setPhoto] = useState<File | null>(null);
  const listQ = useQuery({ ...observationQueries.list(farmId, values.unitId || '-'), enabled: Boolean(values.unitId) });

  const when = (iso: string) =>
    new Intl.DateTimeFormat(lang, {
      timeZone,
      weekday: 'short',
      day: 'numeric',
      month: 'short',
      hour: '2-digit',
      minute: '2-digit',
      hourCycle: 'h23',
    }).format(new Date(iso));
  const dayOnly = (iso: string) =>
    new Intl.DateTimeFormat(lang, { timeZone, weekday: 'long', day: 'numeric', month: 'long' }).format(new Date(iso));

  const errorText = (field: keyof ObservationFormValues): string | undefined => {
    const e = formState.errors[field];
    if (!e) return undefined;
    switch (field) {
      case 'unitId':
        return t('observations.errors.unit');
      case 'kind':
        return t('observations.errors.kind');
      case 'count':
        return e.type === 'invalid_type' && values.count.trim() && Number.isNaN(parseDecimal(values.count) ?? Number.NaN)
          ? t('observations.errors.number')
          : t('observations.errors.count');
      case 'detail':
        return t('errors.tooLong');
      case 'observedAt':
        return t('observations.errors.observedAt');
      default:
        return t('errors.invalid');
    }
  };

  const onSubmit = handleSubmit(async (v) => {
    const unit = units.find((u) => u.id === v.unitId);
    if (!unit || !v.kind) return;
    const id = sender.newId();
    const body = createObservationSchema.parse(toObservationBody(v, id)) as CreateObservation & { clientId: string };
    await sender.send({ unitId: unit.id, unitCode: unit.code, unitName: unit.name, body, photo });
    setPhoto(null);
    setLast({ id, unitId: unit.id, kind: v.kind });
    reset(emptyForm(v.unitId));
  });

  const lastUnit = last ? units.find((u) => u.id === last.unitId) : undefined;
  const lastSent = last ? observationSchema.safeParse(sender.sentBody(last.id)) : null;
  const lastDieOff = last ? dieOffKinds.includes(last.kind) : false;
  const watched = units.filter((u) => u.closeWatchUntil && Date.parse(u.closeWatchUntil) > Date.now());
  const dieOff = values.kind ? dieOffKinds.includes(values.kind) : false;
  const chosen = units.find((u) => u.id === values.unitId);

  return (
    <div className="flex flex-col gap-8" data-testid="observations">
      <title>{`${t('nav.observations')} · Gillwise`}</title>
      <header className="flex flex-col gap-1">
        <h1 className="text-3xl font-bold leading-tight">{t('observations.title')}</h1>
        <p className="text-lg text-muted">{t('observations.intro')}</p>
      </header>
      {outbox}

      {last && lastUnit ? (
        sender.refusedIds.has(last.id) ? (
          <Callout tone="danger" live title={t('observations.refusedTitle')}>
            {t('observations.refused')}
          </Callout>
        ) : lastSent?.success ? (
          <Callout tone="success" live title={t('observations.sentTitle', { code: lastUnit.code })}>
            <span data-testid="observation-sent">
              {lastSent.data.closeWatchUntil && lastDieOff
                ? t('observations.closeWatchUntil', { code: lastUnit.code, day: dayOnly(lastSent.data.closeWatchUntil) })
                : t('observations.sent')}
            </span>
          </Callout>
        ) : (
          <Callout tone="caution" live title={t('observations.waitingTitle')}>
            {lastDieOff ? t('observations.waitingDieOff', { code: lastUnit.code }) : t('observations.waiting')}
          </Callout>
        )
      ) : null}

      <form
        onSubmit={(e) => void onSubmit(e)}
        noValidate
        className="gw-card flex flex-col gap-5 px-4 py-5 sm:px-6"
        aria-labelledby="obs-title"
      >
        <h2 id="obs-title" className="text-2xl font-bold">
          {t('observations.logTitle')}
        </h2>
        {unitsQ.isPending ? (
          <Spinner label={t('common.loading')} />
        ) : (
          <Select
            label={t('observations.unit')}
            placeholder={t('observations.chooseUnit')}
            options={units.map((u) => ({ value: u.id, label: `${u.code} · ${u.name}` }))}
            error={errorText('unitId')}
            {...register('unitId')}
          />
        )}
        <ChoiceGroup
          legend={t('observations.kindLabel')}
          name="kind"
          value={values.kind}
          columns={2}
          choices={observationKinds.map((k) => ({
            value: k,
            label: t(`observations.kind.${k}`),
            description: t(`observations.kindHint.${k}`),
          }))}
          onChange={(k) => {
            setValue('kind', k, { shouldValidate: formState.isSubmitted });
          }}
          error={errorText('kind')}
        />
        {dieOff ? (
          <Callout tone="danger" title={t('observations.dieOffTitle')}>
            {t('observations.dieOff', { code: chosen?.code ?? t('observations.theUnit') })}
          </Callout>
        ) : null}
        {values.kind && quickDetails[values.kind] ? (
          <div role="group" aria-label={t('observations.quick')} className="flex flex-wrap gap-2">
            {quickDetails[values.kind]!.map((q) => {
              const text = t(`observations.quickDetail.${q}`);
              const on = values.detail === text;
              return (
                <button
                  key={q}
                  type="button"
                  aria-pressed={on}
                  onClick={() => setValue('detail', text)}
                  className={cx(
                    'min-h-12 rounded-xl border-2 px-3 text-base font-bold',
                    on ? 'border-abyss-900 bg-abyss-800 text-white' : 'border-abyss-600 bg-card text-abyss-900',
                  )}
                >
                  {text}
                </button>
              );
            })}
          </div>
        ) : null}
        <div className="flex flex-col gap-1.5">
          <label htmlFor="obs-detail" className="text-base font-bold">
            {t('observations.detail')}
          </label>
          <textarea
            id="obs-detail"
            rows={3}
            className="block w-full rounded-xl border-2 border-line bg-card px-4 py-3 text-lg hover:border-abyss-500"
            {...register('detail')}
          />
        </div>
        <PhotoPicker
          file={photo}
          onChange={setPhoto}
          label={t('observations.photo.label')}
          hint={t('observations.photo.hint')}
          takeLabel={t('observations.photo.take')}
          removeLabel={t('observations.photo.remove')}
          previewAlt={t('observations.photo.previewAlt')}
        />
        <div className="grid gap-3 sm:grid-cols-2">
          {values.kind === 'dead_fish' || values.count ? (
            <NumberField
              label={t('observations.count')}
              hint={t('observations.countHint')}
              error={errorText('count')}
              {...register('count')}
            />
          ) : null}
          <TextField
            type="datetime-local"
            label={t('observations.observedAt')}
            error={errorText('observedAt')}
            {...register('observedAt')}
          />
        </div>
        <Button type="submit" variant="accent" size="lg" fullWidth loading={formState.isSubmitting}>
          {t('observations.submit')}
        </Button>
        <p className="text-sm text-muted">{t('observations.saveNote')}</p>
      </form>

      {watched.length ? (
        <section
          aria-labelledby="watch-title"
          className="flex flex-col gap-2 rounded-2xl border-[3px] border-watch bg-watch-soft px-4 py-3"
        >
          <h2 id="watch-title" className="text-xl font-bold text-watch-ink">
            ▲ {t('observations.watchTitle')}
          </h2>
          <ul className="flex flex-col gap-1 text-base">
            {watched.map((u) => (
              <li key={u.id}>
                <strong>
                  {u.code} · {u.name}
                </strong>{' '}
                — {t('observations.until', { day: dayOnly(u.closeWatchUntil!) })}
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      {values.unitId ? (
        <section aria-labelledby="recent-title" className="flex flex-col gap-3">
          <h2 id="recent-title" className="text-2xl font-bold">
            {t('observations.recentTitle', { code: chosen?.code ?? '' })}
          </h2>
          {listQ.isPending ? (
            <Spinner label={t('common.loading')} />
          ) : (listQ.data?.observations.length ?? 0) === 0 ? (
            <p className="text-lg text-muted">{t('observations.none')}</p>
          ) : (
            <ul className="flex flex-col gap-2">
              {listQ.data?.observations.slice(0, 10).map((o) => (
                <li key={o.id} className={cx('gw-card px-4 py-3', dieOffKinds.includes(o.kind) && 'border-act')}>
                  <p className="flex flex-wrap items-baseline gap-x-3">
                    <strong className="text-lg">{t(`observations.kind.${o.kind}`)}</strong>
                    {o.count !== null ? <span>{t('observations.countShort', { count: o.count })}</span> : null}
                    <span className="text-sm text-muted">{when(o.observedAt)}</span>
                  </p>
                  {o.detail ? <p className="text-base">{o.detail}</p> : null}
                </li>
              ))}
            </ul>
          )}
        </section>
      ) : null}
      <p className="text-sm text-muted">{t('cautions.thresholds')}</p>
    </div>
  );
}
