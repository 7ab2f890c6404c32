import { zodResolver } from '@hookform/resolvers/zod';
import { locales, type Role } from '@shared/schemas/auth.schema';
import { inviteRequestSchema, type InviteRequest, type Person } from '@shared/schemas/people.schema';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Select, TextField } from '@/components/ui/field';
import { Icon } from '@/components/ui/icon';
import { Spinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { useAuth } from '@/lib/auth';
import { applyServerFieldErrors, fieldErrorText, requestErrorText } from '@/lib/form-errors';
import { useInvitePerson, useUpdatePerson } from '../../api/setup-mutations';
import { setupQueries } from '../../api/setup-queries';
import { farmDate } from '../../lib/time';

type FarmRole = Person['role'];

/** A manager manages the hands and planners of their farm; an admin manages everyone (as the server rules). */
function rolesFor(actor: Role): FarmRole[] {
  return actor === 'admin' ? ['hand', 'planner', 'manager'] : ['hand', 'planner'];
}

function InviteForm({ farmId, actor, onInvited }: { farmId: string; actor: Role; onInvited: (p: Person) => void }) {
  const { t, i18n } = useTranslation();
  const invite = useInvitePerson(farmId);
  const roles = rolesFor(actor);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors },
  } = useForm<z.input<typeof inviteRequestSchema>, unknown, InviteRequest>({
    resolver: zodResolver(inviteRequestSchema),
    defaultValues: { email: '', name: '', role: 'hand', locale: i18n.language === 'es' ? 'es' : 'en' },
  });
  const submit = handleSubmit(async (body) => {
    try {
      const p = await invite.mutateAsync({ ...body, email: body.email.trim() });
      reset();
      onInvited(p);
    } catch (e) {
      applyServerFieldErrors(e, setError, ['email', 'name', 'role', 'locale']);
    }
  });
  const failure = invite.error;
  const failureText =
    failure && !(isApiError(failure) && Object.keys(failure.fieldErrors).length > 0) ? requestErrorText(t, failure) : null;
  return (
    <form onSubmit={submit} noValidate className="@container gw-card flex flex-col gap-4 self-start p-4" data-testid="invite-form">
      <h2 className="text-xl font-bold">{t('setup.people.inviteTitle')}</h2>
      <p className="text-base text-muted">{t('setup.people.inviteIntro')}</p>
      <div className="grid gap-4 @xl:grid-cols-2">
        <TextField label={t('setup.people.name')} autoComplete="off" error={fieldErrorText(t, errors.name)} {...register('name')} />
        <TextField
          label={t('setup.people.email')}
          type="email"
          inputMode="email"
          autoComplete="off"
          autoCapitalize="none"
          spellCheck={false}
          error={fieldErrorText(t, errors.email, { invalid_format: t('errors.email') })}
          {...register('email')}
        />
        <Select
          label={t('setup.people.role')}
          options={roles.map((r) => ({ value: r, label: t(`roles.${r}`) }))}
          error={fieldErrorText(t, errors.role)}
          {...register('role')}
        />
        <Select
          label={t('setup.people.language')}
          hint={t('setup.people.languageHint')}
          options={locales.map((l) => ({ value: l, label: t(`setup.people.lang.${l}`) }))}
          {...register('locale')}
        />
      </div>
      {failureText ? (
        <Callout tone="danger" live title={t('setup.people.inviteFailed')}>
          {failureText}
        </Callout>
      ) : null}
      <Button type="submit" variant="primary" className="self-start" loading={invite.isPending} icon={<Icon name="mail" />}>
        {t('setup.people.send')}
      </Button>
    </form>
  );
}

/** People on the farm: invite by e-mail, change a role, deactivate (their sessions end at once). */
export function PeoplePanel({
  farmId,
  actor,
  timeZone,
  outboxHref,
}: {
  farmId: string;
  actor: Role;
  timeZone: string;
  outboxHref: string;
}) {
  const { t, i18n } = useTranslation();
  const { me } = useAuth();
  const q = useQuery(setupQueries.people(farmId));
  const update = useUpdatePerson(farmId);
  const [invited, setInvited] = useState<Person | null>(null);
  const manageable = (p: Person) => p.userId !== me?.user.id && (actor === 'admin' || p.role === 'hand' || p.role === 'planner');

  if (q.isPending) return <Spinner label={t('setup.loading')} />;
  if (q.isError)
    return (
      <Callout tone="danger" title={t('setup.loadFailed')}>
        {requestErrorText(t, q.error)}
      </Callout>
    );
  const people = [...q.data].sort((a, b) => Number(b.active) - Number(a.active) || a.name.localeCompare(b.name));

  return (
    <div className="grid gap-5 xl:grid-cols-[minmax(0,1fr)_24rem]" data-testid="people-panel">
      <section className="flex flex-col gap-3" aria-labelledby="people-title">
        <h2 id="people-title" className="text-xl font-bold">
          {t('setup.people.title', { count: people.length })}
        </h2>
        {invited ? (
          <Callout tone="success" live title={t('setup.people.invited', { name: invited.name, email: invited.email })}>
            <Link to={outboxHref} className="gw-link">
              {t('setup.people.seeOutbox')}
            </Link>
          </Callout>
        ) : null}
        {update.error ? (
          <Callout tone="danger" live title={t('setup.people.updateFailed')}>
            {requestErrorText(t, update.error)}
          </Callout>
        ) : null}
        <ul className="flex flex-col gap-2" data-testid="people-list">
          {people.map((p) => (
            <li
              key={p.userId}
              className={cx('gw-card flex flex-wrap items-center gap-3 px-4 py-3', !p.active && 'opacity-70')}
              data-testid="person"
              data-email={p.email}
            >
              <span className="min-w-[14rem] flex-1">
                <span className="block font-bold">
                  {p.name}
                  {p.userId === me?.user.id ? <span className="ml-2 text-sm font-normal text-muted">{t('setup.people.you')}</span> : null}
                </span>
                <span className="block break-all text-sm text-muted">{p.email}</span>
                <span className="block text-sm text-muted">
                  {!p.active
                    ? t('setup.people.deactivated')
                    : p.invited
                      ? t('setup.people.invitePending')
                      : p.lastLoginAt
                        ? t('setup.people.lastLogin', { date: farmDate(p.lastLoginAt, timeZone, i18n.language) })
                        : t('setup.people.neverSignedIn')}
                </span>
              </span>
              {manageable(p) ? (
                <div className="flex flex-wrap items-center gap-2">
                  <Select
                    label={t('setup.people.roleOf', { name: p.name })}
                    hideLabel
                    containerClassName="w-40"
                    options={rolesFor(actor).map((r) => ({ value: r, label: t(`roles.${r}`) }))}
                    value={p.role}
                    onChange={(e) => update.mutate({ userId: p.userId, body: { role: e.target.value as FarmRole } })}
                  />
                  <Button variant="ghost" onClick={() => update.mutate({ userId: p.userId, body: { active: !p.active } })}>
                    {p.active ? t('setup.people.deactivate') : t('setup.people.reactivate')}
                  </Button>
                </div>
              ) : (
                <span className="rounded-full bg-abyss-50 px-3 py-1 text-sm font-bold text-abyss-900">{t(`roles.${p.role}`)}</span>
              )}
            </li>
          ))}
        </ul>
      </section>
      <InviteForm farmId={farmId} actor={actor} onInvited={setInvited} />
    </div>
  );
}
