import { quantities, type Quantity } from '@shared/schemas/mqtt.schema';
import { createProbeRequestSchema, updateProbeRequestSchema, type CreateProbeRequest, type ProbeDto } from '@shared/schemas/probes.schema';
import type { UnitDto } from '@shared/schemas/units.schema';
import { useMemo } from 'react';
import { useForm } from 'react-hook-form';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { NumberField, Select, TextField } from '@/components/ui/field';
import { isApiError } from '@/lib/api-client';
import { applyServerFieldErrors, fieldErrorText, requestErrorText } from '@/lib/form-errors';
import { numberOrNull, schemaResolver, textOrNull } from '../../lib/form';

export interface ProbeFormValues {
  label: string;
  unitId: string;
  quantities: string[];
  intervalSeconds: string;
  model: string;
}

export function toProbeBody(v: ProbeFormValues): Record<string, unknown> {
  return {
    label: v.label.trim(),
    unitId: v.unitId || null,
    quantities: Array.isArray(v.quantities) ? v.quantities : [],
    intervalSeconds: numberOrNull(v.intervalSeconds) ?? 60,
    model: textOrNull(v.model),
  };
}

export interface ProbeFormProps {
  units: readonly UnitDto[];
  probe?: ProbeDto;
  /** Save the body; throw the API error to show it. */
  onSubmit: (body: CreateProbeRequest) => Promise<unknown>;
  pending: boolean;
  error: unknown;
  onCancel: () => void;
  submitLabel: string;
}

/** What a probe measures, where it sits and how often it reports. */
export function ProbeForm({ units, probe, onSubmit, pending, error, onCancel, submitLabel }: ProbeFormProps) {
  const { t } = useTranslation();
  const resolver = useMemo(() => schemaResolver<ProbeFormValues, CreateProbeRequest>(createProbeRequestSchema, toProbeBody), []);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<ProbeFormValues, unknown, CreateProbeRequest>({
    resolver,
    defaultValues: {
      label: probe?.label ?? '',
      unitId: probe?.unitId ?? '',
      quantities: probe?.quantities ?? ['water_temperature', 'dissolved_oxygen', 'ph'],
      intervalSeconds: String(probe?.intervalSeconds ?? 60),
      model: probe?.model ?? '',
    },
  });

  const submit = handleSubmit(async (body) => {
    if (probe) {
      const check = updateProbeRequestSchema.safeParse(body);
      if (!check.success) return;
    }
    try {
      await onSubmit(body);
    } catch (e) {
      applyServerFieldErrors(e, setError, ['label', 'unitId', 'quantities', 'intervalSeconds', 'model']);
    }
  });
  const failureText = error && !(isApiError(error) && Object.keys(error.fieldErrors).length > 0) ? requestErrorText(t, error) : null;
  const quantityError = fieldErrorText(t, errors.quantities as Parameters<typeof fieldErrorText>[1], {
    too_small: t('setup.probe.pickQuantity'),
  });

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" data-testid="probe-form">
      <TextField
        label={t('setup.probe.label')}
        hint={t('setup.probe.labelHint')}
        autoComplete="off"
        error={fieldErrorText(t, errors.label)}
        {...register('label')}
      />
      <Select
        label={t('setup.probe.unit')}
        options={[{ value: '', label: t('setup.probe.noUnit') }, ...units.map((u) => ({ value: u.id, label: `${u.code} — ${u.name}` }))]}
        error={fieldErrorText(t, errors.unitId)}
        {...register('unitId')}
      />
      <fieldset className="flex flex-col gap-2" aria-describedby={quantityError ? 'probe-quantities-error' : undefined}>
        <legend className="mb-1 text-base font-bold">{t('setup.probe.quantities')}</legend>
        <div className="grid grid-cols-1 gap-2 sm:grid-cols-2">
          {(quantities as readonly Quantity[]).map((q) => (
            <label key={q} className="flex min-h-11 items-center gap-3 rounded-xl border-2 border-line bg-card px-3 text-base">
              <input type="checkbox" value={q} className="size-5 accent-abyss-700" {...register('quantities')} />
              {t(`setup.quantity.${q}`)}
            </label>
          ))}
        </div>
        {quantityError ? (
          <p id="probe-quantities-error" className="flex items-start gap-1.5 text-base font-bold text-act">
            <span aria-hidden="true">◆</span>
            {quantityError}
          </p>
        ) : null}
      </fieldset>
      <div className="grid gap-4 sm:grid-cols-2">
        <NumberField
          label={t('setup.probe.interval')}
          hint={t('setup.probe.intervalHint')}
          unit="s"
          error={fieldErrorText(t, errors.intervalSeconds, {
            too_small: t('setup.probe.intervalRange'),
            too_big: t('setup.probe.intervalRange'),
            invalid_type: t('setup.probe.intervalRange'),
          })}
          {...register('intervalSeconds')}
        />
        <TextField label={t('setup.probe.model')} autoComplete="off" error={fieldErrorText(t, errors.model)} {...register('model')} />
      </div>
      {failureText ? (
        <Callout tone="danger" live title={t('setup.probe.saveFailed')}>
          {failureText}
        </Callout>
      ) : null}
      <div className="flex flex-wrap justify-end gap-3">
        <Button variant="ghost" onClick={onCancel}>
          {t('setup.cancel')}
        </Button>
        <Button type="submit" variant="primary" loading={pending}>
          {submitLabel}
        </Button>
      </div>
    </form>
  );
}
