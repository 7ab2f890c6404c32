import { zodResolver } from '@hookform/resolvers/zod';
import { overrideRecommendationSchema, type OverrideRecommendation } from '@shared/schemas/feed.schema';
import { useForm } from 'react-hook-form';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { NumberField, parseDecimal } from '@/components/ui/field';
import { isApiError } from '@/lib/api-client';
import { applyServerFieldErrors, fieldErrorText, requestErrorText } from '@/lib/form-errors';
import { useOverrideRecommendation } from '../api/ration-mutations';
import { fmtKg } from '../lib/format';
import { TextAreaField } from '@/components/ui/text-area-field';

export interface OverrideTarget {
  recommendationId: string;
  unitCode: string;
  unitName: string;
  recommendedKg: number;
  plannedKg: number;
}

export interface OverrideFormProps {
  farmId: string;
  target: OverrideTarget;
  onDone: () => void;
  onCancel: () => void;
}

/**
 * Set another ration than the recommended one. The note is required (the shared schema says so and the
 * server checks again); the decision is audited with before and after.
 */
export function OverrideForm({ farmId, target, onDone, onCancel }: OverrideFormProps) {
  const { t, i18n } = useTranslation();
  const override = useOverrideRecommendation(farmId);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<OverrideRecommendation>({
    resolver: zodResolver(overrideRecommendationSchema),
    defaultValues: { approvedKg: target.recommendedKg, note: '' },
  });

  const onSubmit = handleSubmit(async (values) => {
    try {
      await override.mutateAsync({ recommendationId: target.recommendationId, ...values });
      onDone();
    } catch (e) {
      applyServerFieldErrors(e, setError, ['approvedKg', 'note']);
    }
  });

  const failure = override.error;
  const failureText =
    failure && !(isApiError(failure) && Object.keys(failure.fieldErrors).length > 0) ? requestErrorText(t, failure) : null;

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-5" data-testid="override-form">
      <p className="text-base text-muted">
        {t('rations.override.context', {
          recommended: fmtKg(target.recommendedKg, i18n.language),
          planned: fmtKg(target.plannedKg, i18n.language),
        })}
      </p>
      <NumberField
        label={t('rations.override.amount')}
        unit="kg"
        hint={t('rations.override.amountHint')}
        error={fieldErrorText(t, errors.approvedKg, {
          invalid_type: t('rations.override.amountRequired'),
          too_small: t('rations.override.amountNegative'),
          too_big: t('rations.override.amountTooBig'),
        })}
        {...register('approvedKg', { setValueAs: (v: unknown) => (typeof v === 'string' ? parseDecimal(v) : v) })}
      />
      <TextAreaField
        label={t('rations.override.note')}
        hint={t('rations.override.noteHint')}
        required
        error={fieldErrorText(t, errors.note, { too_small: t('rations.override.noteRequired'), too_big: t('errors.tooLong') })}
        {...register('note')}
      />
      {failureText ? (
        <Callout tone="danger" live title={t('rations.override.failed')}>
          {failureText}
        </Callout>
      ) : null}
      <div className="flex flex-wrap justify-end gap-3">
        <Button variant="ghost" onClick={onCancel}>
          {t('rations.cancel')}
        </Button>
        <Button type="submit" variant="primary" loading={override.isPending}>
          {t('rations.override.submit')}
        </Button>
      </div>
    </form>
  );
}
