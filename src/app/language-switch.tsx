import { locales, type Locale } from '@shared/schemas/auth.schema';
import { useTranslation } from 'react-i18next';
import { cx } from '@/components/ui/cx';
import { useAuth } from '@/lib/auth';
import { currentLocale, setLocale } from '@/lib/i18n';

/**
 * EN | ES. Signed in, the choice is saved on the user (PATCH /api/me); signed out, on this device.
 */
export function LanguageSwitch({ tone = 'dark', className }: { tone?: 'dark' | 'light'; className?: string }) {
  const { t, i18n } = useTranslation();
  const { me, updateMe } = useAuth();
  const active = currentLocale();

  const choose = async (locale: Locale) => {
    await setLocale(locale);
    if (me && me.user.locale !== locale) {
      // If saving fails the choice still holds on this device; the server keeps the old one.
      updateMe({ locale }).catch(() => undefined);
    }
  };

  return (
    <div
      role="group"
      aria-label={t('language.label')}
      className={cx(
        'inline-flex rounded-xl border-2 p-0.5',
        tone === 'dark' ? 'border-abyss-500' : 'border-abyss-700',
        className,
      )}
      data-lang={i18n.language}
    >
      {locales.map((l) => {
        const pressed = active === l;
        return (
          <button
            key={l}
            type="button"
            lang={l}
            aria-pressed={pressed}
            title={t(`language.${l}`)}
            onClick={() => void choose(l)}
            className={cx(
              'min-h-11 min-w-12 rounded-[0.6rem] px-2 text-base font-bold uppercase',
              pressed
                ? 'bg-ember-400 text-abyss-950'
                : tone === 'dark'
                  ? 'text-white hover:bg-abyss-800'
                  : 'text-abyss-800 hover:bg-abyss-50',
            )}
          >
            <span aria-hidden="true">{l}</span>
            <span className="sr-only">{t(`language.${l}`)}</span>
          </button>
        );
      })}
    </div>
  );
}
