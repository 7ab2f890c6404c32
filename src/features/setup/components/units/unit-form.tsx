import {
  createFlowRequestSchema,
  createUnitRequestSchema,
  unitKinds,
  unitStates,
  waterTypes,
  type UnitDto,
} from '@shared/schemas/units.schema';
import type { ThresholdProfileDto } from '@shared/schemas/thresholds.schema';
import { useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { NumberField, Select, TextField } from '@/components/ui/field';
import { isApiError } from '@/lib/api-client';
import { applyServerFieldErrors, fieldErrorText, requestErrorText } from '@/lib/form-errors';
import { useAddFlow, useCreateUnit, useUpdateUnit } from '../../api/setup-mutations';
import { numberOrNull, numberText, schemaResolver, textOrNull } from '../../lib/form';
import type { Polygon } from '../../lib/polygon';

export interface UnitFormValues {
  code: string;
  name: string;
  kind: string;
  waterType: string;
  defaultSalinityPpt: string;
  volumeM3: string;
  areaM2: string;
  species: string;
  lifeStage: string;
  state: string;
  testFrequencyDays: string;
  thresholdProfileId: string;
  feedProteinPct: string;
}

const unitFormSchema = createUnitRequestSchema.omit({ outline: true, walkOrder: true });
type UnitFormBody = ReturnType<typeof unitFormSchema.parse>;

export function toUnitBody(v: UnitFormValues): Record<string, unknown> {
  const protein = numberOrNull(v.feedProteinPct);
  return {
    code: v.code.trim(),
    name: v.name.trim(),
    kind: v.kind,
    waterType: v.waterType,
    defaultSalinityPpt: numberOrNull(v.defaultSalinityPpt) ?? 0,
    volumeM3: numberOrNull(v.volumeM3),
    areaM2: numberOrNull(v.areaM2),
    species: textOrNull(v.species),
    lifeStage: textOrNull(v.lifeStage),
    state: v.state,
    testFrequencyDays: numberOrNull(v.testFrequencyDays),
    thresholdProfileId: v.thresholdProfileId || null,
    feedProteinFraction: protein === null ? 0.32 : protein / 100,
  };
}

const bodyField: Record<string, keyof UnitFormValues> = { feedProteinFraction: 'feedProteinPct' };

function valuesOf(unit: UnitDto | null): UnitFormValues {
  return {
    code: unit?.code ?? '',
    name: unit?.name ?? '',
    kind: unit?.kind ?? 'pond',
    waterType: unit?.waterType ?? 'fresh',
    defaultSalinityPpt: numberText(unit?.defaultSalinityPpt ?? 0),
    volumeM3: numberText(unit?.volumeM3),
    areaM2: '',
    species: unit?.species ?? '',
    lifeStage: unit?.lifeStage ?? '',
    state: unit?.state ?? 'active',
    testFrequencyDays: numberText(unit?.testFrequencyDays),
    thresholdProfileId: unit?.thresholdProfileId ?? '',
    feedProteinPct: numberText(unit ? Math.round(unit.feedProteinFraction * 1000) / 10 : 32),
  };
}

export interface UnitFormProps {
  farmId: string;
  /** null: a new unit. */
  unit: UnitDto | null;
  /** The outline from the map (null: none drawn). */
  outline: Polygon | null;
  outlineChanged: boolean;
  /** The design flow now on record (raceways and tanks). */
  designFlowLpm: number | null;
  profiles: readonly ThresholdProfileDto[];
  speciesSuggestions: readonly string[];
  onSaved: (unit: UnitDto) => void;
  onCancel: () => void;
}

/** Create or change a unit: what it is, its water, what lives in it, whether its biofilter is still cycling, how often it is tested. */
export function UnitForm({
  farmId,
  unit,
  outline,
  outlineChanged,
  designFlowLpm,
  profiles,
  speciesSuggestions,
  onSaved,
  onCancel,
}: UnitFormProps) {
  const { t } = useTranslation();
  const create = useCreateUnit(farmId);
  const update = useUpdateUnit(farmId);
  const addFlow = useAddFlow(farmId);
  const [designFlow, setDesignFlow] = useState(numberText(designFlowLpm));
  const [flowError, setFlowError] = useState<string | null>(null);
  const [nothing, setNothing] = useState(false);
  const resolver = useMemo(
    () =>
      schemaResolver<UnitFormValues, UnitFormBody>(unitFormSchema, toUnitBody, (p) =>
        typeof p[0] === 'string' ? (bodyField[p[0]] ?? p[0]) : null,
      ),
    [],
  );
  const {
    register,
    handleSubmit,
    setError,
    watch,
    formState: { errors },
  } = useForm<UnitFormValues, unknown, UnitFormBody>({ resolver, defaultValues: valuesOf(unit) });
  const kind = watch('kind');
  const waterType = watch('waterType');
  const state = watch('state');
  const flowKind = kind === 'raceway' || kind === 'tank';
  const mutation = unit ? update : create;

  const onSubmit = handleSubmit(async (body) => {
    setNothing(false);
    setFlowError(null);
    let flowLpm: number | null = null;
    if (flowKind && designFlow.trim()) {
      const parsed = createFlowRequestSchema.safeParse({ flowLpm: numberOrNull(designFlow), source: 'design' });
      if (!parsed.success) return setFlowError(t('setup.unit.flowInvalid'));
      flowLpm = parsed.data.flowLpm;
    }
    const flowChanged = flowLpm !== null && flowLpm !== designFlowLpm;
    try {
      let saved: UnitDto;
      if (unit) {
        const patch: Record<string, unknown> = {};
        for (const [k, v] of Object.entries(body)) {
          if (k === 'areaM2' && v === null) continue;
          if (v !== (unit as Record<string, unknown>)[k]) patch[k] = v;
        }
        if (outlineChanged && outline) patch.outline = outline;
        if (Object.keys(patch).length === 0) {
          if (!flowChanged) return setNothing(true);
          saved = unit;
        } else {
          saved = await update.mutateAsync({ unitId: unit.id, body: patch });
        }
      } else {
        saved = await create.mutateAsync({ ...body, ...(outline ? { outline } : {}) } as Parameters<typeof create.mutateAsync>[0]);
      }
      if (flowChanged && flowLpm !== null) {
        await addFlow.mutateAsync({ unitId: saved.id, body: { flowLpm, source: 'design', note: t('setup.unit.flowNote') } });
      }
      onSaved(saved);
    } catch (e) {
      applyServerFieldErrors(e, setError, [
        'code',
        'name',
        'kind',
        'volumeM3',
        'areaM2',
        'defaultSalinityPpt',
        'species',
        'lifeStage',
        'state',
        'testFrequencyDays',
        'thresholdProfileId',
      ]);
    }
  });

  const failure = mutation.error ?? addFlow.error;
  const failureText =
    failure && !(isApiError(failure) && Object.keys(failure.fieldErrors).length > 0) ? requestErrorText(t, failure) : null;
  const err = (field: keyof UnitFormValues, overrides: Partial<Record<string, string>> = {}) => fieldErrorText(t, errors[field], overrides);
  const listId = `species-${unit?.id ?? 'new'}`;

  return (
    <form onSubmit={onSubmit} noValidate className="@container flex flex-col gap-4" data-testid="unit-form">
      <div className="grid gap-4 @sm:grid-cols-[8rem_minmax(0,1fr)]">
        <TextField
          label={t('setup.unit.code')}
          hint={t('setup.unit.codeHint')}
          autoComplete="off"
          error={err('code', { invalid_format: t('setup.unit.codeFormat'), too_big: t('setup.unit.codeFormat') })}
          {...register('code')}
        />
        <TextField label={t('setup.unit.name')} autoComplete="off" error={err('name')} {...register('name')} />
      </div>
      <div className="grid gap-4 @md:grid-cols-2">
        <Select
          label={t('setup.unit.kind')}
          options={unitKinds.map((k) => ({ value: k, label: t(`setup.kind.${k}`) }))}
          error={err('kind')}
          {...register('kind')}
        />
        <Select
          label={t('setup.unit.state')}
          hint={t(`setup.unit.stateHint.${state}`, { defaultValue: '' })}
          options={unitStates.map((s) => ({ value: s, label: t(`setup.state.${s}`) }))}
          error={err('state')}
          {...register('state')}
        />
      </div>
      <div className="grid gap-4 @md:grid-cols-2">
        <Select
          label={t('setup.unit.waterType')}
          options={waterTypes.map((w) => ({ value: w, label: t(`setup.water.${w}`) }))}
          error={err('waterType')}
          {...register('waterType')}
        />
        <NumberField
          label={t('setup.unit.salinity')}
          hint={waterType === 'fresh' ? t('setup.unit.salinityFreshHint') : t('setup.unit.salinityHint')}
          unit="‰"
          error={err('defaultSalinityPpt', { too_big: t('setup.unit.salinityRange'), too_small: t('setup.unit.salinityRange') })}
          {...register('defaultSalinityPpt')}
        />
      </div>
      <div className="grid gap-4 @md:grid-cols-2">
        <NumberField
          label={t('setup.unit.volume')}
          unit="m³"
          error={err('volumeM3', { too_small: t('setup.unit.positive') })}
          {...register('volumeM3')}
        />
        <NumberField
          label={t('setup.unit.area')}
          hint={t('setup.unit.areaHint')}
          unit="m²"
          error={err('areaM2', { too_small: t('setup.unit.positive') })}
          {...register('areaM2')}
        />
      </div>
      {flowKind ? (
        <NumberField
          label={t('setup.unit.designFlow')}
          hint={t('setup.unit.designFlowHint')}
          unit="L/min"
          value={designFlow}
          onChange={(e) => setDesignFlow(e.target.value)}
          error={flowError ?? undefined}
        />
      ) : null}
      <div className="grid gap-4 @md:grid-cols-2">
        <TextField
          label={t('setup.unit.species')}
          hint={t('setup.unit.speciesHint')}
          list={listId}
          autoComplete="off"
          error={err('species')}
          {...register('species')}
        />
        <TextField label={t('setup.unit.lifeStage')} autoComplete="off" error={err('lifeStage')} {...register('lifeStage')} />
        <datalist id={listId}>
          {speciesSuggestions.map((s) => (
            <option key={s} value={s} />
          ))}
        </datalist>
      </div>
      <div className="grid gap-4 @md:grid-cols-2">
        <NumberField
          label={t('setup.unit.testEvery')}
          hint={t('setup.unit.testEveryHint')}
          unit={t('setup.unit.days')}
          error={err('testFrequencyDays', {
            invalid_type: t('setup.unit.wholeDays'),
            too_small: t('setup.unit.wholeDays'),
            too_big: t('setup.unit.wholeDays'),
          })}
          {...register('testFrequencyDays')}
        />
        <NumberField
          label={t('setup.unit.protein')}
          hint={t('setup.unit.proteinHint')}
          unit="%"
          error={err('feedProteinPct', {
            too_small: t('setup.unit.proteinRange'),
            too_big: t('setup.unit.proteinRange'),
            invalid_type: t('setup.unit.proteinRange'),
          })}
          {...register('feedProteinPct')}
        />
      </div>
      <Select
        label={t('setup.unit.profile')}
        hint={t('setup.unit.profileHint')}
        options={[{ value: '', label: t('setup.unit.noProfile') }, ...profiles.map((p) => ({ value: p.id, label: p.name }))]}
        error={err('thresholdProfileId')}
        {...register('thresholdProfileId')}
      />
      {!unit && !outline ? <Callout tone="info">{t('setup.unit.noOutline')}</Callout> : null}
      {nothing ? (
        <Callout tone="info" live>
          {t('setup.unit.nothingChanged')}
        </Callout>
      ) : null}
      {failureText ? (
        <Callout tone="danger" live title={t('setup.unit.saveFailed')}>
          {failureText}
        </Callout>
      ) : null}
      <div className="flex flex-wrap justify-end gap-3">
        <Button variant="ghost" onClick={onCancel}>
          {t('setup.cancel')}
        </Button>
        <Button type="submit" variant="primary" loading={mutation.isPending || addFlow.isPending}>
          {unit ? t('setup.unit.save') : t('setup.unit.create')}
        </Button>
      </div>
    </form>
  );
}
