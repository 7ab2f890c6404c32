import type { MeResponse, Role } from '@shared/schemas/auth.schema';
import { useTranslation } from 'react-i18next';
import { NavLink } from 'react-router';
import { Button } from '@/components/ui/button';
import { Sheet } from '@/components/ui/dialog';
import { Icon } from '@/components/ui/icon';
import { navHref, type NavEntry } from '../nav';

export function MoreSheet({
  open,
  onClose,
  entries,
  farmId,
  me,
  role,
  farmName,
  onAbout,
  onSignOut,
  signingOut,
}: {
  open: boolean;
  onClose: () => void;
  entries: readonly NavEntry[];
  farmId: string;
  me: MeResponse;
  role: Role;
  farmName: string;
  onAbout: () => void;
  onSignOut: () => void;
  signingOut: boolean;
}) {
  const { t } = useTranslation();
  return (
    <Sheet open={open} onClose={onClose} side="bottom" title={t('nav.moreTitle')}>
      {entries.length > 0 ? (
        <ul className="mb-5 grid grid-cols-2 gap-2" data-testid="more-nav">
          {entries.map((e) => (
            <li key={e.key}>
              <NavLink
                to={navHref(e, farmId)}
                onClick={onClose}
                data-nav-key={e.key}
                className="flex min-h-14 items-center gap-3 rounded-xl border-2 border-line px-3 text-lg font-bold text-abyss-900 hover:bg-abyss-50"
              >
                <Icon name={e.icon} />
                {t(`nav.${e.key}`)}
              </NavLink>
            </li>
          ))}
        </ul>
      ) : null}
      <div className="mb-5 rounded-xl bg-abyss-50 px-4 py-3">
        <p className="font-bold">{me.user.name}</p>
        <p className="text-muted">
          {t(`roles.${role}`)} · {farmName}
        </p>
      </div>
      <div className="flex flex-col gap-3">
        <Button
          variant="secondary"
          fullWidth
          icon={<Icon name="info" />}
          onClick={() => {
            onClose();
            onAbout();
          }}
        >
          {t('about.open')}
        </Button>
        <Button variant="primary" fullWidth icon={<Icon name="signOut" />} loading={signingOut} onClick={onSignOut}>
          {t('shell.signOut')}
        </Button>
      </div>
    </Sheet>
  );
}
