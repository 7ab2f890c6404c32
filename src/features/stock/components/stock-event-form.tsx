import { createStockEventSchema, type CreateStockEvent, type StockEventKind } from '@shared/schemas/stock.schema';
import { useMemo, useRef, useState } from 'react';
import { useForm, type FieldError } from 'react-hook-form';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { NumberField, Select, TextField } from '@/components/ui/field';
import { isApiError } from '@/lib/api-client';
import { applyServerFieldErrors, fieldErrorText, requestErrorText } from '@/lib/form-errors';
import { useCreateStockEvent } from '../api/stock-queries';
import { farmDate } from '../lib/format';
import { farmLocalToIso, nowFarmLocal, numberOrNull, schemaResolver } from '../lib/form';

export const formKinds = [
  'stocking',
  'transfer_out',
  'mortality',
  'sample_weighing',
  'harvest',
] as const satisfies readonly StockEventKind[];
type FormKind = (typeof formKinds)[number];

export interface StockFormValues {
  at: string;
  count: string;
  totalWeightKg: string;
  meanWeightG: string;
  sampleSize: string;
  sampleSdG: string;
  meanLengthCm: string;
  relatedUnitId: string;
  note: string;
}
type Field = Exclude<keyof StockFormValues, 'at' | 'note'>;

/** The fields each kind of event asks for, in order. */
const fieldsOf: Record<FormKind, readonly Field[]> = {
  stocking: ['count', 'meanWeightG', 'totalWeightKg', 'meanLengthCm'],
  transfer_out: ['relatedUnitId', 'count', 'meanWeightG'],
  mortality: ['count', 'totalWeightKg'],
  sample_weighing: ['sampleSize', 'meanWeightG', 'totalWeightKg', 'sampleSdG', 'meanLengthCm'],
  harvest: ['count', 'totalWeightKg'],
};

const units: Record<Exclude<Field, 'relatedUnitId'>, string> = {
  count: '',
  totalWeightKg: 'kg',
  meanWeightG: 'g',
  sampleSize: '',
  sampleSdG: 'g',
  meanLengthCm: 'cm',
};

export function toStockBody(kind: FormKind, v: StockFormValues, timeZone: string): Record<string, unknown> {
  const shown = new Set<string>(fieldsOf[kind]);
  const num = (f: Field) => (shown.has(f) ? numberOrNull(v[f]) : null);
  return {
    kind,
    at: farmLocalToIso(v.at, timeZone),
    count: num('count'),
    totalWeightKg: num('totalWeightKg'),
    meanWeightG: num('meanWeightG'),
    sampleSize: num('sampleSize'),
    sampleSdG: num('sampleSdG'),
    meanLengthCm: num('meanLengthCm'),
    relatedUnitId: shown.has('relatedUnitId') && v.relatedUnitId ? v.relatedUnitId : null,
    note: v.note.trim() || null,
  };
}

const empty = (timeZone: string): StockFormValues => ({
  at: nowFarmLocal(timeZone),
  count: '',
  totalWeightKg: '',
  meanWeightG: '',
  sampleSize: '',
  sampleSdG: '',
  meanLengthCm: '',
  relatedUnitId: '',
  note: '',
});

interface Withdrawal {
  endsAt: string | null;
  reason: string | null;
}

function withdrawalOf(e: unknown): Withdrawal | null {
  if (!isApiError(e) || e.code !== 'in_withdrawal') return null;
  const w = (e.details as { withdrawal?: Withdrawal } | undefined)?.withdrawal;
  return { endsAt: w?.endsAt ?? null, reason: w?.reason ?? null };
}

export interface StockEventFormProps {
  farmId: string;
  unit: { id: string; code: string };
  /** Other units of the farm (where a transfer can go). */
  otherUnits: ReadonlyArray<{ id: string; code: string; name: string }>;
  timeZone: string;
  onSaved: (kind: FormKind) => void;
}

/** Record what happened to the fish of a unit: stocked, moved, died, weighed or harvested. */
export function StockEventForm({ farmId, unit, otherUnits, timeZone, onSaved }: StockEventFormProps) {
  const { t, i18n } = useTranslation();
  const [kind, setKind] = useState<FormKind>('sample_weighing');
  const create = useCreateStockEvent(farmId, unit.id);
  // The resolver reads the chosen kind through a ref, so it is made once.
  const kindRef = useRef(kind);
  kindRef.current = kind;
  const resolver = useMemo(
    () => schemaResolver<StockFormValues, CreateStockEvent>(createStockEventSchema, (v) => toStockBody(kindRef.current, v, timeZone)),
    [timeZone],
  );
  const {
    register,
    handleSubmit,
    setError,
    reset,
    clearErrors,
    formState: { errors },
  } = useForm<StockFormValues, unknown, CreateStockEvent>({ resolver, defaultValues: empty(timeZone) });

  const submit = handleSubmit(async (body) => {
    try {
      await create.mutateAsync(body);
      reset(empty(timeZone));
      onSaved(kind);
    } catch (e) {
      applyServerFieldErrors(e, setError, [
        'count',
        'totalWeightKg',
        'meanWeightG',
        'sampleSize',
        'sampleSdG',
        'meanLengthCm',
        'relatedUnitId',
        'at',
        'note',
      ]);
    }
  });

  /** Words for a field's problem: the schema's own rule for this kind of event, in the reader's language. */
  const err = (field: keyof StockFormValues) => {
    const e = errors[field] as FieldError | undefined;
    if (!e) return undefined;
    if (e.type === 'custom') return t([`stock.form.err.${kind}.${field}`, `stock.form.err.${field}`], { defaultValue: e.message });
    if (e.type === 'invalid_type') return t('stock.form.err.number');
    return fieldErrorText(t, e, {
      too_small: t('stock.form.err.tooSmall'),
      too_big: t('stock.form.err.tooBig'),
      invalid_format: t('stock.form.err.at'),
    });
  };

  const failure = create.error;
  const withdrawal = withdrawalOf(failure);
  const notEnough =
    isApiError(failure) && failure.code === 'not_enough_fish'
      ? ((failure.details as { onRecord?: number } | undefined)?.onRecord ?? 0)
      : null;
  const failureText =
    failure && !withdrawal && notEnough === null && !(isApiError(failure) && Object.keys(failure.fieldErrors).length > 0)
      ? requestErrorText(t, failure)
      : null;

  return (
    <form onSubmit={submit} noValidate className="@container flex flex-col gap-4" data-testid="stock-form">
      <fieldset>
        <legend className="mb-2 text-base font-bold">{t('stock.form.what')}</legend>
        <div className="flex flex-wrap gap-2" role="radiogroup">
          {formKinds.map((k) => (
            <label
              key={k}
              className={cx(
                'flex min-h-11 cursor-pointer items-center rounded-xl border-2 px-3 text-base font-bold',
                kind === k ? 'border-abyss-700 bg-abyss-700 text-white' : 'border-line bg-card text-abyss-900 hover:border-abyss-500',
              )}
            >
              <input
                type="radio"
                name="stock-kind"
                value={k}
                checked={kind === k}
                onChange={() => {
                  setKind(k);
                  clearErrors();
                  create.reset();
                }}
                className="sr-only"
              />
              {t(`stock.kind.${k}`)}
            </label>
          ))}
        </div>
      </fieldset>
      <p className="text-base text-muted">{t(`stock.form.hint.${kind}`)}</p>
      <div className="grid gap-4 @md:grid-cols-2">
        {fieldsOf[kind].map((f) =>
          f === 'relatedUnitId' ? (
            <Select
              key={f}
              label={t('stock.form.field.relatedUnitId')}
              placeholder={t('stock.form.pickUnit')}
              options={otherUnits.map((u) => ({ value: u.id, label: `${u.code} — ${u.name}` }))}
              error={err(f)}
              {...register(f)}
            />
          ) : (
            <NumberField key={f} label={t(`stock.form.field.${f}`)} unit={units[f] || undefined} error={err(f)} {...register(f)} />
          ),
        )}
        <TextField
          label={t('stock.form.field.at')}
          hint={t('stock.form.atHint', { tz: timeZone })}
          type="datetime-local"
          error={err('at')}
          {...register('at')}
        />
      </div>
      <TextField label={t('stock.form.field.note')} error={err('note')} {...register('note')} />
      {withdrawal ? (
        <Callout tone="danger" live title={t('stock.form.refused', { kind: t(`stock.kind.${kind}`) })}>
          <p>
            {withdrawal.endsAt
              ? t('stock.form.inWithdrawalUntil', { unit: unit.code, date: farmDate(withdrawal.endsAt, timeZone, i18n.language) })
              : t('stock.form.inWithdrawal', { unit: unit.code })}
          </p>
          {withdrawal.reason ? <p className="mt-1">{withdrawal.reason}</p> : null}
        </Callout>
      ) : null}
      {notEnough !== null ? (
        <Callout tone="danger" live title={t('stock.form.refused', { kind: t(`stock.kind.${kind}`) })}>
          {t('stock.form.notEnough', { unit: unit.code, count: notEnough })}
        </Callout>
      ) : null}
      {failureText ? (
        <Callout tone="danger" live title={t('stock.form.failed')}>
          {failureText}
        </Callout>
      ) : null}
      <Button type="submit" variant="primary" className="self-start" loading={create.isPending}>
        {t('stock.form.save')}
      </Button>
    </form>
  );
}
