import { createTreatmentSchema, treatmentProducts, type CreateTreatment, type treatmentSchema } from '@shared/schemas/treatments.schema';
import type { UnitDto } from '@shared/schemas/units.schema';
import { useQuery } from '@tanstack/react-query';
import type { z } from 'zod';
import { useEffect, useMemo } from 'react';
import { useForm, type FieldErrors, type Resolver } from 'react-hook-form';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { NumberField, parseDecimal, Select, TextField } from '@/components/ui/field';
import { Spinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { requestErrorText } from '@/lib/form-errors';
import { treatmentQueries, useLogTreatment } from '../api/treatments';
import { ChoiceGroup } from '@/components/ui/choice-group';

type Product = (typeof treatmentProducts)[number];
type Treatment = z.infer<typeof treatmentSchema>;

export interface TreatmentFormValues {
  unitId: string;
  product: Product | '';
  productName: string;
  dose: string;
  doseUnit: string;
  startsAt: string;
  endsAt: string;
  withdrawalBasis: 'none' | 'days' | 'degree_days';
  withdrawal: string;
  note: string;
}

const doseUnits = ['mg/L', 'g/L', 'ppm', 'g/m³', 'kg', 'L'] as const;
/** Formalin, copper and ammonia binders make Nessler kits read high (the worker flags such tests). */
const NESSLER_INTERFERING: readonly Product[] = ['formalin', 'copper', 'ammonia_binder'];

function localInput(d: Date): string {
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())}T${p(d.getHours())}:${p(d.getMinutes())}`;
}
const isoFromLocal = (v: string) => (v ? new Date(v).toISOString() : undefined);

const emptyForm = (unitId = ''): TreatmentFormValues => ({
  unitId,
  product: '',
  productName: '',
  dose: '',
  doseUnit: 'mg/L',
  startsAt: localInput(new Date()),
  endsAt: '',
  withdrawalBasis: 'none',
  withdrawal: '',
  note: '',
});

const number = (v: string) => (v.trim() ? (parseDecimal(v) ?? Number.NaN) : null);

/** The form → createTreatmentSchema's body. */
export function toTreatmentBody(v: TreatmentFormValues): Record<string, unknown> {
  const withdrawal = number(v.withdrawal);
  return {
    product: v.product || undefined,
    productName: v.productName.trim() || null,
    dose: number(v.dose),
    doseUnit: v.dose.trim() ? v.doseUnit : null,
    startsAt: isoFromLocal(v.startsAt),
    endsAt: isoFromLocal(v.endsAt) ?? null,
    withdrawalDays: v.withdrawalBasis === 'days' ? withdrawal : null,
    withdrawalDegreeDays: v.withdrawalBasis === 'degree_days' ? withdrawal : null,
    note: v.note.trim() || null,
  };
}

const formField: Record<string, keyof TreatmentFormValues> = {
  product: 'product',
  productName: 'productName',
  dose: 'dose',
  doseUnit: 'doseUnit',
  startsAt: 'startsAt',
  endsAt: 'endsAt',
  withdrawalDays: 'withdrawal',
  withdrawalDegreeDays: 'withdrawal',
  note: 'note',
};

const resolver: Resolver<TreatmentFormValues> = (values) => {
  const errors: FieldErrors<TreatmentFormValues> = {};
  if (!values.unitId) errors.unitId = { type: 'required', message: '' };
  if (values.withdrawalBasis !== 'none' && !values.withdrawal.trim()) errors.withdrawal = { type: 'required', message: '' };
  if (values.product === 'other' && !values.productName.trim()) errors.productName = { type: 'required', message: '' };
  const parsed = createTreatmentSchema.safeParse(toTreatmentBody(values));
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const field = formField[String(issue.path[0] ?? '')];
      if (field && !errors[field]) errors[field] = { type: issue.code, message: issue.message };
    }
  }
  return Object.keys(errors).length ? { values: {}, errors } : { values, errors: {} };
};

const draftKey = (farmId: string) => `gillwise.treatment.draft.${farmId}`;

function WithdrawalLine({ tr, timeZone }: { tr: Treatment; timeZone: string }) {
  const { t, i18n } = useTranslation();
  const w = tr.withdrawal;
  const day = (iso: string) =>
    new Intl.DateTimeFormat(i18n.language, {
      timeZone,
      weekday: 'short',
      day: 'numeric',
      month: 'short',
      hour: '2-digit',
      minute: '2-digit',
      hourCycle: 'h23',
    }).format(new Date(iso));
  if (w.basis === 'none') return <p className="text-base text-muted">{t('treatments.withdrawal.none')}</p>;
  if (w.inWithdrawal) {
    return (
      <p className="flex flex-wrap items-center gap-2 text-base font-bold text-act-ink" data-withdrawal="in">
        <span className="inline-flex items-center gap-1 rounded-full border-2 border-act bg-act-soft px-2 py-0.5 text-sm uppercase">
          <span aria-hidden="true">◆</span> {t('treatments.withdrawal.in')}
        </span>
        {w.endsAt
          ? t(w.estimate === 'projected' ? 'treatments.withdrawal.projected' : 'treatments.withdrawal.until', { when: day(w.endsAt) })
          : w.basis === 'degree_days' && tr.withdrawalDegreeDays !== null
            ? t('treatments.withdrawal.afterDegreeDays', { of: tr.withdrawalDegreeDays })
            : t('treatments.withdrawal.unknownEnd')}
        {w.basis === 'degree_days' && w.degreeDaysSoFar !== null && tr.withdrawalDegreeDays !== null ? (
          <span className="font-normal">
            {t('treatments.withdrawal.degreeDays', {
              so: new Intl.NumberFormat(i18n.language, { maximumFractionDigits: 0 }).format(w.degreeDaysSoFar),
              of: tr.withdrawalDegreeDays,
            })}
          </span>
        ) : null}
      </p>
    );
  }
  return (
    <p className="flex items-center gap-2 text-base font-bold text-clear-ink" data-withdrawal="over">
      <span aria-hidden="true">●</span>
      {w.endsAt ? t('treatments.withdrawal.ended', { when: day(w.endsAt) }) : t('treatments.withdrawal.over')}
    </p>
  );
}

export interface TreatmentsScreenProps {
  farmId: string;
  timeZone: string;
}

/** Log a treatment (product, dose, withdrawal) and see when each unit's withdrawal ends. */
export function TreatmentsScreen({ farmId, timeZone }: TreatmentsScreenProps) {
  const { t, i18n } = useTranslation();
  const lang = i18n.language;
  const unitsQ = useQuery(treatmentQueries.units(farmId));
  const listQ = useQuery(treatmentQueries.farm(farmId));
  const log = useLogTreatment(farmId);
  const units = useMemo(() => [...(unitsQ.data?.units ?? [])].sort((a, b) => a.walkOrder - b.walkOrder), [unitsQ.data]);
  const unitById = useMemo(() => new Map(units.map((u) => [u.id, u])), [units]);

  const initial = useMemo(() => {
    try {
      const raw = globalThis.localStorage?.getItem(draftKey(farmId));
      if (raw) return { ...emptyForm(), ...(JSON.parse(raw) as Partial<TreatmentFormValues>) };
    } catch {
      /* ignore */
    }
    return emptyForm();
  }, [farmId]);
  const { register, handleSubmit, setValue, watch, reset, setError, formState } = useForm<TreatmentFormValues>({
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

  const errorText = (field: keyof TreatmentFormValues): string | undefined => {
    const e = formState.errors[field];
    if (!e) return undefined;
    if (e.type === 'server') return e.message;
    switch (field) {
      case 'unitId':
        return t('treatments.errors.unit');
      case 'product':
        return t('treatments.errors.product');
      case 'productName':
        return e.type === 'too_big' ? t('errors.tooLong') : t('treatments.errors.productName');
      case 'dose':
        return e.type === 'invalid_type' ? t('treatments.errors.number') : t('treatments.errors.dose');
      case 'startsAt':
        return t('treatments.errors.startsAt');
      case 'endsAt':
        return t('treatments.errors.endsAt');
      case 'withdrawal':
        return e.type === 'invalid_type' ? t('treatments.errors.number') : t('treatments.errors.withdrawal');
      default:
        return t('errors.invalid');
    }
  };

  const onSubmit = handleSubmit(async (v) => {
    const body = createTreatmentSchema.parse(toTreatmentBody(v)) as CreateTreatment;
    try {
      await log.mutateAsync({ unitId: v.unitId, body });
      reset(emptyForm(v.unitId));
    } catch (e) {
      if (!isApiError(e)) return;
      for (const [name, messages] of Object.entries(e.fieldErrors)) {
        const field = formField[name];
        if (field && messages[0]) setError(field, { type: 'server', message: messages[0] });
      }
    }
  });

  const failure = log.error;
  const failureText = !failure
    ? null
    : isApiError(failure) && failure.status === 0
      ? t('treatments.offline')
      : isApiError(failure) && Object.keys(failure.fieldErrors).length
        ? null
        : requestErrorText(t, failure);

  const treatments = [...(listQ.data?.treatments ?? [])].sort((a, b) => b.startsAt.localeCompare(a.startsAt));
  const inWithdrawal = treatments.filter((x) => x.withdrawal.inWithdrawal);
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
  const unitLabel = (id: string) => {
    const u: UnitDto | undefined = unitById.get(id);
    return u ? `${u.code} · ${u.name}` : '';
  };

  return (
    <div className="flex flex-col gap-8" data-testid="treatments">
      <title>{`${t('nav.treatments')} · Gillwise`}</title>
      <header className="flex flex-col gap-1">
        <h1 className="text-3xl font-bold leading-tight">{t('treatments.title')}</h1>
        <p className="text-lg text-muted">{t('treatments.intro')}</p>
      </header>

      {inWithdrawal.length ? (
        <section
          aria-labelledby="wd-title"
          className="flex flex-col gap-2 rounded-2xl border-[3px] border-act bg-act-soft px-4 py-3"
          data-testid="withdrawal-now"
        >
          <h2 id="wd-title" className="text-xl font-bold text-act-ink">
            ◆ {t('treatments.nowTitle', { count: inWithdrawal.length })}
          </h2>
          <ul className="flex flex-col gap-1 text-base">
            {inWithdrawal.map((x) => (
              <li key={x.id}>
                <strong>{unitLabel(x.unitId)}</strong> — {t(`treatments.product.${x.product}`)}
                {x.withdrawal.endsAt
                  ? `: ${t(x.withdrawal.estimate === 'projected' ? 'treatments.withdrawal.projected' : 'treatments.withdrawal.until', { when: when(x.withdrawal.endsAt) })}`
                  : x.withdrawalDegreeDays !== null
                    ? `: ${t('treatments.withdrawal.afterDegreeDays', { of: x.withdrawalDegreeDays })}`
                    : ''}
              </li>
            ))}
          </ul>
          <p className="text-sm">{t('treatments.noHarvest')}</p>
        </section>
      ) : null}

      <form
        onSubmit={(e) => void onSubmit(e)}
        noValidate
        className="gw-card flex flex-col gap-5 px-4 py-5 sm:px-6"
        aria-labelledby="log-title"
      >
        <h2 id="log-title" className="text-2xl font-bold">
          {t('treatments.logTitle')}
        </h2>
        {unitsQ.isPending ? (
          <Spinner label={t('common.loading')} />
        ) : (
          <Select
            label={t('treatments.unit')}
            placeholder={t('treatments.chooseUnit')}
            options={units.map((u) => ({ value: u.id, label: `${u.code} · ${u.name}` }))}
            error={errorText('unitId')}
            {...register('unitId')}
          />
        )}
        <ChoiceGroup
          legend={t('treatments.productLabel')}
          name="product"
          value={values.product}
          columns={3}
          choices={treatmentProducts.map((p) => ({ value: p, label: t(`treatments.product.${p}`) }))}
          onChange={(p) => setValue('product', p, { shouldValidate: formState.isSubmitted })}
          error={errorText('product')}
        />
        {values.product && NESSLER_INTERFERING.includes(values.product) ? (
          <Callout tone="caution" title={t('treatments.nesslerTitle')}>
            {t('treatments.nessler')}
          </Callout>
        ) : null}
        <TextField
          label={values.product === 'other' ? t('treatments.productNameRequired') : t('treatments.productName')}
          hint={t('treatments.productNameHint')}
          error={errorText('productName')}
          {...register('productName')}
        />
        <div className="grid grid-cols-[1fr_auto] gap-3">
          <NumberField label={t('treatments.dose')} error={errorText('dose')} {...register('dose')} />
          <Select
            label={t('treatments.doseUnit')}
            options={doseUnits.map((u) => ({ value: u, label: u }))}
            containerClassName="w-32"
            {...register('doseUnit')}
          />
        </div>
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField type="datetime-local" label={t('treatments.startsAt')} error={errorText('startsAt')} {...register('startsAt')} />
          <TextField
            type="datetime-local"
            label={t('treatments.endsAt')}
            hint={t('treatments.endsAtHint')}
            error={errorText('endsAt')}
            {...register('endsAt')}
          />
        </div>
        <ChoiceGroup
          legend={t('treatments.withdrawalLabel')}
          hint={t('treatments.withdrawalHint')}
          name="withdrawalBasis"
          value={values.withdrawalBasis}
          columns={3}
          choices={[
            { value: 'none' as const, label: t('treatments.basis.none') },
            { value: 'days' as const, label: t('treatments.basis.days') },
            { value: 'degree_days' as const, label: t('treatments.basis.degree_days'), description: t('treatments.basis.degreeDaysHint') },
          ]}
          onChange={(b) => setValue('withdrawalBasis', b, { shouldValidate: formState.isSubmitted })}
        />
        {values.withdrawalBasis !== 'none' ? (
          <NumberField
            label={values.withdrawalBasis === 'days' ? t('treatments.withdrawalDays') : t('treatments.withdrawalDegreeDays')}
            unit={values.withdrawalBasis === 'days' ? t('treatments.daysUnit') : '°C·d'}
            error={errorText('withdrawal')}
            containerClassName="max-w-xs"
            {...register('withdrawal')}
          />
        ) : null}
        <div className="flex flex-col gap-1.5">
          <label htmlFor="treatment-note" className="text-base font-bold">
            {t('treatments.note')}
          </label>
          <textarea
            id="treatment-note"
            rows={3}
            className="block w-full rounded-xl border-2 border-line bg-card px-4 py-3 text-lg hover:border-abyss-500"
            {...register('note')}
          />
        </div>
        {failureText ? (
          <Callout tone="danger" live title={t('treatments.failedTitle')}>
            {failureText}
          </Callout>
        ) : null}
        {log.isSuccess && !formState.isDirty ? (
          <Callout tone="success" live title={t('treatments.savedTitle')}>
            {log.data.withdrawal.inWithdrawal && log.data.withdrawal.endsAt
              ? t('treatments.savedWithdrawal', { when: when(log.data.withdrawal.endsAt) })
              : t('treatments.saved')}
          </Callout>
        ) : null}
        <Button type="submit" variant="accent" size="lg" fullWidth loading={log.isPending}>
          {t('treatments.submit')}
        </Button>
        <p className="text-sm text-muted">{t('cautions.thresholds')}</p>
      </form>

      <section aria-labelledby="list-title" className="flex flex-col gap-3">
        <h2 id="list-title" className="text-2xl font-bold">
          {t('treatments.listTitle')}
        </h2>
        {listQ.isPending ? (
          <Spinner label={t('common.loading')} />
        ) : treatments.length === 0 ? (
          <p className="text-lg text-muted">{t('treatments.empty')}</p>
        ) : (
          <ul className="flex flex-col gap-2">
            {treatments.map((x) => (
              <li
                key={x.id}
                className={cx('gw-card flex flex-col gap-1 px-4 py-3', x.withdrawal.inWithdrawal && 'border-act')}
                data-treatment={x.product}
              >
                <p className="flex flex-wrap items-baseline gap-x-3">
                  <span className="text-lg font-bold">{unitLabel(x.unitId)}</span>
                  <span className="text-sm text-muted">{when(x.startsAt)}</span>
                </p>
                <p className="text-base">
                  <strong>{t(`treatments.product.${x.product}`)}</strong>
                  {x.productName ? ` (${x.productName})` : ''}
                  {x.dose !== null
                    ? ` · ${new Intl.NumberFormat(lang, { maximumFractionDigits: 3 }).format(x.dose)} ${x.doseUnit ?? ''}`
                    : ''}
                </p>
                <WithdrawalLine tr={x} timeZone={timeZone} />
                {x.note ? <p className="text-sm text-muted">{x.note}</p> : null}
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
