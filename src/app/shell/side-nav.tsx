import { useTranslation } from 'react-i18next';
import { NavLink } from 'react-router';
import { cx } from '@/components/ui/cx';
import { Icon } from '@/components/ui/icon';
import { navHref, type NavEntry } from '../nav';

/** Desktop: the full list on the left. */
export function SideNav({ entries, farmId, onAbout }: { entries: readonly NavEntry[]; farmId: string; onAbout: () => void }) {
  const { t } = useTranslation();
  return (
    <nav
      aria-label={t('nav.label')}
      className="sticky top-16 hidden h-[calc(100dvh-4rem)] w-64 shrink-0 flex-col gap-1 overflow-y-auto border-r-2 border-line bg-abyss-50 px-3 py-5 lg:flex"
    >
      <ul className="flex flex-col gap-1" data-testid="side-nav">
        {entries.map((e) => (
          <li key={e.key}>
            <NavLink
              to={navHref(e, farmId)}
              end={e.key === 'home'}
              data-nav-key={e.key}
              className={({ isActive }) =>
                cx(
                  'flex min-h-12 items-center gap-3 rounded-xl border-l-[6px] px-3 text-lg font-bold',
                  isActive
                    ? 'border-ember-400 bg-abyss-700 text-white'
                    : 'border-transparent text-abyss-900 hover:bg-abyss-100',
                )
              }
            >
              <Icon name={e.icon} />
              <span>{t(`nav.${e.key}`)}</span>
            </NavLink>
          </li>
        ))}
      </ul>
      <div className="mt-auto pt-6">
        <button
          type="button"
          onClick={onAbout}
          className="flex min-h-12 w-full items-center gap-3 rounded-xl px-3 text-left text-base font-bold text-abyss-800 hover:bg-abyss-100"
        >
          <Icon name="info" />
          {t('about.open')}
        </button>
      </div>
    </nav>
  );
}
