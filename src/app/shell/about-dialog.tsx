import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { CautionList } from '@/components/cautions';
import { env } from '@/config/env';

export function AboutDialog({ open, onClose }: { open: boolean; onClose: () => void }) {
  const { t } = useTranslation();
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title={t('about.title')}
      footer={
        <Button variant="primary" onClick={onClose}>
          {t('common.close')}
        </Button>
      }
    >
      <div className="space-y-4 text-base">
        <p>{t('about.body')}</p>
        <h3 className="text-lg font-bold">{t('cautions.title')}</h3>
        <CautionList />
        <p className="text-sm text-muted">{t('about.version', { version: env.VITE_APP_VERSION })}</p>
      </div>
    </Dialog>
  );
}
