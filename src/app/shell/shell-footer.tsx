import { useTranslation } from 'react-i18next';

/** A short reminder of the cautions at the end of every screen, and the way to the full text. */
export function ShellFooter({ onAbout }: { onAbout: () => void }) {
  const { t } = useTranslation();
  return (
    <footer className="mt-12 flex flex-col items-start gap-1 border-t-2 border-line pt-4 text-sm text-muted">
      <p>{t('cautions.short')}</p>
      <button type="button" onClick={onAbout} className="gw-link inline-flex min-h-12 items-center">
        {t('about.open')}
      </button>
    </footer>
  );
}
