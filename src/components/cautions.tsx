import { useTranslation } from 'react-i18next';
import { Callout } from '@/components/ui/callout';

export const cautionKeys = ['thresholds', 'recommendations', 'nessler'] as const;

/** The cautions from the product brief, as a list. */
export function CautionList({ className }: { className?: string }) {
  const { t } = useTranslation();
  return (
    <ul className={className ?? 'list-disc space-y-2 pl-5'}>
      {cautionKeys.map((k) => (
        <li key={k}>{t(`cautions.${k}`)}</li>
      ))}
    </ul>
  );
}

/** The cautions as a boxed panel (home screens, about). */
export function CautionsPanel({ className }: { className?: string }) {
  const { t } = useTranslation();
  return (
    <Callout tone="caution" title={t('cautions.title')} className={className}>
      <CautionList />
    </Callout>
  );
}
