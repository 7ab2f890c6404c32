import { useTranslation } from 'react-i18next';
import { useParams } from 'react-router';
import { OutboxScreen } from '@/features/outbox';
import { useAuth } from '@/lib/auth';
import { useCurrentFarm } from '@/lib/current-farm';

/** Outbox: the e-mails the product sent, as the local mail catcher received them. */
export default function OutboxRoute() {
  const { t } = useTranslation();
  const { farmId = '' } = useParams();
  const current = useCurrentFarm();
  const { me } = useAuth();
  return (
    <div className="flex flex-col gap-5" data-testid="outbox-screen">
      <title>{`${t('nav.outbox')} · ${current?.farm.name ?? ''} · Gillwise`}</title>
      <header>
        <h1 className="text-3xl font-bold leading-tight">{t('outbox.title')}</h1>
        <p className="mt-1 max-w-prose text-base text-muted sm:text-lg">{t('outbox.intro')}</p>
      </header>
      <OutboxScreen farmId={farmId} timeZone={current?.farm.timeZone ?? 'UTC'} isAdmin={me?.user.isAdmin ?? false} />
    </div>
  );
}
