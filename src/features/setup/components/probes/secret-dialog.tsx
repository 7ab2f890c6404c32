import type { ProbeCredentialResponse } from '@shared/schemas/probes.schema';
import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { Dialog } from '@/components/ui/dialog';
import { Icon } from '@/components/ui/icon';

export interface SecretDialogProps {
  /** The answer of create or rotate; null closes the dialog. The secret exists nowhere else in the client. */
  credential: ProbeCredentialResponse | null;
  reason: 'created' | 'rotated';
  onClose: () => void;
}

function CopyRow({ label, value, testId, big }: { label: string; value: string; testId: string; big?: boolean }) {
  const { t } = useTranslation();
  const [copied, setCopied] = useState<'yes' | 'no' | null>(null);
  const copy = async () => {
    try {
      await navigator.clipboard.writeText(value);
      setCopied('yes');
    } catch {
      setCopied('no');
    }
  };
  return (
    <div className="flex flex-col gap-1">
      <span className="text-sm font-bold text-muted">{label}</span>
      <div className="flex items-stretch gap-2">
        <code
          data-testid={testId}
          className={`min-w-0 flex-1 select-all break-all rounded-xl border-2 border-line bg-paper px-3 py-2 font-mono ${big ? 'text-lg font-bold' : 'text-base'}`}
        >
          {value}
        </code>
        <Button variant="secondary" onClick={() => void copy()} aria-label={t('setup.secret.copyLabel', { what: label })}>
          {t('setup.secret.copy')}
        </Button>
      </div>
      <p className="min-h-5 text-sm" role="status">
        {copied === 'yes' ? t('setup.secret.copied') : copied === 'no' ? t('setup.secret.copyFailed') : ''}
      </p>
    </div>
  );
}

/**
 * The probe's MQTT secret, shown this once: Gillwise stores only a hash of it. Closing the dialog
 * drops it from the page; a lost secret is replaced by rotating the credential.
 */
export function SecretDialog({ credential, reason, onClose }: SecretDialogProps) {
  const { t } = useTranslation();
  const [stored, setStored] = useState(false);
  const close = () => {
    setStored(false);
    onClose();
  };
  return (
    <Dialog
      open={credential !== null}
      onClose={close}
      title={
        credential
          ? t(reason === 'created' ? 'setup.secret.titleCreated' : 'setup.secret.titleRotated', { label: credential.probe.label })
          : ''
      }
      footer={
        <Button variant="primary" onClick={close} disabled={!stored} icon={<Icon name="check" />}>
          {t('setup.secret.done')}
        </Button>
      }
    >
      {credential ? (
        <div className="flex flex-col gap-3" data-testid="probe-secret">
          <Callout tone="danger" title={t('setup.secret.onceTitle')}>
            {t('setup.secret.onceBody')}
          </Callout>
          <CopyRow label={t('setup.secret.username')} value={credential.credential.username} testId="secret-username" />
          <CopyRow label={t('setup.secret.secret')} value={credential.credential.secret} testId="secret-value" big />
          <CopyRow label={t('setup.secret.topic')} value={credential.credential.topic} testId="secret-topic" />
          <p className="text-base text-muted">{t('setup.secret.howTo')}</p>
          <label className="flex items-start gap-3 rounded-xl border-2 border-line px-3 py-3 text-base">
            <input
              type="checkbox"
              className="mt-1 size-5 accent-abyss-700"
              checked={stored}
              onChange={(e) => setStored(e.target.checked)}
            />
            <span>{t('setup.secret.stored')}</span>
          </label>
        </div>
      ) : null}
    </Dialog>
  );
}
