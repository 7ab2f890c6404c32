import type { AlertDto } from '@shared/schemas/alerts.schema';
import { resolveAlertRequestSchema } from '@shared/schemas/alerts.schema';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { Dialog } from '@/components/ui/dialog';
import { Select } from '@/components/ui/field';
import { alertQueries } from '../api/alert-queries';
import { useAssignAlert, useResolveAlert } from '../api/alert-mutations';
import { useActionError } from '../hooks/use-action-error';
import { NoteField } from './note-field';

interface DialogBase {
  farmId: string;
  alert: AlertDto;
  open: boolean;
  onClose: () => void;
  /** After the action went through (the dialog closes itself). */
  onDone?: () => void;
  title: string;
}

/** Resolve with a note: what was done (the note is required, as the API asks). */
export function ResolveDialog({ farmId, alert, open, onClose, onDone, title }: DialogBase) {
  const { t } = useTranslation();
  const resolve = useResolveAlert(farmId, onDone);
  const [note, setNote] = useState('');
  const [fieldError, setFieldError] = useState<string | undefined>();
  const error = useActionError(resolve.error);

  const submit = () => {
    const parsed = resolveAlertRequestSchema.safeParse({ note });
    if (!parsed.success) {
      setFieldError(t('alerts.resolve.noteRequired'));
      return;
    }
    setFieldError(undefined);
    resolve.mutate({ alertId: alert.id, note: parsed.data.note }, { onSuccess: onClose });
  };

  return (
    <Dialog
      open={open}
      onClose={onClose}
      title={t('alerts.resolve.title')}
      description={title}
      footer={
        <>
          <Button variant="secondary" onClick={onClose}>
            {t('alerts.cancel')}
          </Button>
          <Button variant="primary" onClick={submit} loading={resolve.isPending}>
            {t('alerts.resolve.submit')}
          </Button>
        </>
      }
    >
      <form
        className="flex flex-col gap-4"
        onSubmit={(e) => {
          e.preventDefault();
          submit();
        }}
      >
        <NoteField
          label={t('alerts.resolve.note')}
          hint={t('alerts.resolve.noteHint')}
          value={note}
          onChange={setNote}
          error={fieldError}
          required
          autoFocus
        />
        <p className="text-sm text-muted">{t('alerts.resolve.reopens')}</p>
        {error ? (
          <Callout tone="danger" live>
            {error}
          </Callout>
        ) : null}
      </form>
    </Dialog>
  );
}

/** Give the alert to a person of the farm (the caller first). */
export function AssignDialog({
  farmId,
  alert,
  open,
  onClose,
  onDone,
  title,
  me,
}: DialogBase & { me: { id: string; name: string } | null }) {
  const { t } = useTranslation();
  const assign = useAssignAlert(farmId, onDone);
  const people = useQuery({ ...alertQueries.people(farmId), enabled: open });
  const [userId, setUserId] = useState(alert.assignedTo?.id ?? '');
  const [note, setNote] = useState('');
  const [fieldError, setFieldError] = useState<string | undefined>();
  const error = useActionError(assign.error);

  const options = new Map<string, string>();
  if (me) options.set(me.id, t('alerts.assign.me', { name: me.name }));
  for (const p of people.data ?? []) if (!options.has(p.id)) options.set(p.id, `${p.name} (${t(`roles.${p.role}`)})`);
  if (alert.assignedTo && !options.has(alert.assignedTo.id)) options.set(alert.assignedTo.id, alert.assignedTo.name);

  const submit = () => {
    if (!userId) {
      setFieldError(t('alerts.assign.pick'));
      return;
    }
    setFieldError(undefined);
    assign.mutate({ alertId: alert.id, userId, note: note.trim() || undefined }, { onSuccess: onClose });
  };

  return (
    <Dialog
      open={open}
      onClose={onClose}
      title={t('alerts.assign.title')}
      description={title}
      footer={
        <>
          <Button variant="secondary" onClick={onClose}>
            {t('alerts.cancel')}
          </Button>
          <Button variant="primary" onClick={submit} loading={assign.isPending}>
            {t('alerts.assign.submit')}
          </Button>
        </>
      }
    >
      <form
        className="flex flex-col gap-4"
        onSubmit={(e) => {
          e.preventDefault();
          submit();
        }}
      >
        <Select
          label={t('alerts.assign.person')}
          hint={t('alerts.assign.personHint')}
          placeholder={t('alerts.assign.placeholder')}
          value={userId}
          onChange={(e) => setUserId(e.target.value)}
          error={fieldError}
          options={[...options].map(([value, label]) => ({ value, label }))}
        />
        <NoteField label={t('alerts.assign.note')} value={note} onChange={setNote} />
        {error ? (
          <Callout tone="danger" live>
            {error}
          </Callout>
        ) : null}
      </form>
    </Dialog>
  );
}
