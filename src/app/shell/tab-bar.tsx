import { useTranslation } from 'react-i18next';
import { NavLink } from 'react-router';
import { cx } from '@/components/ui/cx';
import { Icon } from '@/components/ui/icon';
import { navHref, splitForTabBar, type NavEntry } from '../nav';

export const TAB_MAX = 5;

const tabClass = (active: boolean) =>
  cx(
    'relative flex min-h-16 flex-1 flex-col items-center justify-center gap-0.5 px-1 text-[0.8rem] font-bold leading-tight',
    active ? 'text-abyss-900' : 'text-muted',
  );

/** Phones: big tabs along the bottom edge, thumb-reachable; the rest under "More". */
export function TabBar({
  entries,
  farmId,
  moreOpen,
  onMore,
}: {
  entries: readonly NavEntry[];
  farmId: string;
  moreOpen: boolean;
  onMore: () => void;
}) {
  const { t } = useTranslation();
  // One slot is always kept for "More" (overflow screens, who you are, cautions, sign out).
  const { tabs } = splitForTabBar(entries, TAB_MAX - 1);
  return (
    <nav
      aria-label={t('nav.label')}
      className="fixed inset-x-0 bottom-0 z-30 border-t-2 border-line bg-card pb-[env(safe-area-inset-bottom)] lg:hidden"
    >
      <ul className="mx-auto flex max-w-xl" data-testid="tab-bar">
        {tabs.map((e) => (
          <li key={e.key} className="flex flex-1">
            <NavLink to={navHref(e, farmId)} end={e.key === 'home'} data-nav-key={e.key} className={({ isActive }) => tabClass(isActive)}>
              {({ isActive }) => (
                <>
                  <span
                    aria-hidden="true"
                    className={cx('absolute inset-x-3 top-0 h-1.5 rounded-b-full', isActive ? 'bg-ember-400' : 'bg-transparent')}
                  />
                  <Icon name={e.icon} size={28} strokeWidth={isActive ? 2.4 : 2} />
                  <span>{t(`nav.${e.key}`)}</span>
                </>
              )}
            </NavLink>
          </li>
        ))}
        <li className="flex flex-1">
          <button type="button" onClick={onMore} aria-haspopup="dialog" aria-expanded={moreOpen} className={tabClass(moreOpen)}>
            <Icon name="more" size={28} strokeWidth={3} />
            <span>{t('nav.more')}</span>
          </button>
        </li>
      </ul>
    </nav>
  );
}

/** What goes in the "More" sheet: the screens that did not fit in the tab bar. */
export function overflowEntries(entries: readonly NavEntry[]): NavEntry[] {
  return splitForTabBar(entries, TAB_MAX - 1).more;
}
