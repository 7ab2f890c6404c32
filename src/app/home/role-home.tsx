import type { MeFarm, MeResponse, Role } from '@shared/schemas/auth.schema';
import type { ReactNode } from 'react';
import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { CautionsPanel } from '@/components/cautions';
import { StatusBadge, unitStatuses } from '@/components/ui/status-badge';
import { Icon } from '@/components/ui/icon';
import { navHref, plannedFor } from '../nav';

function farmClock(timeZone: string, locale: string): string {
  try {
    return new Intl.DateTimeFormat(locale, {
      timeZone,
      weekday: 'long',
      day: 'numeric',
      month: 'long',
      hour: '2-digit',
      minute: '2-digit',
    }).format(new Date());
  } catch {
    return '';
  }
}

function InfoRow({ label, testId, children }: { label: string; testId?: string; children: ReactNode }) {
  return (
    <div className="flex flex-col sm:flex-row sm:items-baseline sm:gap-6">
      <dt className="text-sm font-bold text-muted sm:w-44 sm:shrink-0 sm:text-base">{label}</dt>
      <dd className="text-lg" data-testid={testId}>
        {children}
      </dd>
    </div>
  );
}

/** The landing screen of a farm: who you are, where, what your role covers, and the cautions. */
export function RoleHome({ me, farm, role }: { me: MeResponse; farm: MeFarm; role: Role }) {
  const { t, i18n } = useTranslation();
  const screens = plannedFor(role).filter((e) => e.key !== 'home');
  const clock = farmClock(farm.timeZone, i18n.language);

  return (
    <div className="flex flex-col gap-6" data-testid={`home-${role}`}>
      <title>{`${t('nav.home')} · ${farm.name} · Gillwise`}</title>
      <header>
        <p className="text-base font-bold uppercase tracking-wide text-abyss-600">{t(`roles.${role}`)}</p>
        <h1 className="text-3xl font-bold leading-tight">{t('home.greeting', { name: me.user.name })}</h1>
        <p className="mt-2 max-w-prose text-lg text-muted">{t(`home.intro.${role}`)}</p>
      </header>

      <section aria-labelledby="who-title" className="gw-card px-5 py-4">
        <h2 id="who-title" className="mb-3 text-xl font-bold">
          {t('home.whoTitle')}
        </h2>
        <dl className="flex flex-col gap-3">
          <InfoRow label={t('home.name')} testId="who-name">
            {me.user.name}
          </InfoRow>
          <InfoRow label={t('auth.email')}>
            <span className="break-all">{me.user.email}</span>
          </InfoRow>
          <InfoRow label={t('home.role')} testId="who-role">
            {t(`roles.${role}`)}
          </InfoRow>
          <InfoRow label={t('home.farm')} testId="who-farm">
            {farm.name}
          </InfoRow>
          <InfoRow label={t('home.farmTime')}>
            {clock} <span className="text-muted">({farm.timeZone})</span>
            <span className="block text-sm text-muted">{t('home.farmDayNote')}</span>
          </InfoRow>
        </dl>
      </section>

      <CautionsPanel />

      <section aria-labelledby="legend-title" className="gw-card px-5 py-4">
        <h2 id="legend-title" className="mb-3 text-xl font-bold">
          {t('home.legendTitle')}
        </h2>
        <ul className="grid gap-3 sm:grid-cols-2">
          {unitStatuses.map((s) => (
            <li key={s} className="flex items-start gap-3">
              <StatusBadge status={s} className="mt-0.5 shrink-0" />
              <span>{t(`status.describe.${s}`)}</span>
            </li>
          ))}
        </ul>
      </section>

      {screens.length > 0 ? (
        <section aria-labelledby="screens-title" className="gw-card px-5 py-4">
          <h2 id="screens-title" className="mb-1 text-xl font-bold">
            {t('home.screensTitle')}
          </h2>
          <p className="mb-3 text-muted">{t('home.screensNote')}</p>
          <ul className="grid gap-2 sm:grid-cols-2" data-testid="role-screens">
            {screens.map((e) => (
              <li key={e.key}>
                {e.ready ? (
                  <Link
                    to={navHref(e, farm.id)}
                    className="flex min-h-12 items-center gap-3 rounded-xl border-2 border-abyss-600 px-3 font-bold text-abyss-900 hover:bg-abyss-50"
                  >
                    <Icon name={e.icon} />
                    <span className="flex-1">{t(`nav.${e.key}`)}</span>
                    <Icon name="arrowRight" />
                  </Link>
                ) : (
                  <div className="flex min-h-12 items-center gap-3 rounded-xl border-2 border-dashed border-line px-3 text-muted">
                    <Icon name={e.icon} />
                    <span className="flex-1 font-bold">{t(`nav.${e.key}`)}</span>
                    <span className="text-sm">{t('home.comingSoon')}</span>
                  </div>
                )}
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </div>
  );
}
