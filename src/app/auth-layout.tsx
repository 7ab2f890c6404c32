import type { ReactNode } from 'react';
import { useTranslation } from 'react-i18next';
import { Wordmark } from '@/components/ui/brand';
import { CautionList } from '@/components/cautions';
import { LanguageSwitch } from './language-switch';

/** The frame around sign-in, forgot-password and reset-password. */
export function AuthLayout({ title, intro, children }: { title: string; intro?: ReactNode; children: ReactNode }) {
  const { t } = useTranslation();
  return (
    <div className="gw-ripples flex min-h-dvh flex-col bg-abyss-900 text-white">
      <title>{`${title} · Gillwise`}</title>
      <header className="mx-auto flex w-full max-w-5xl items-center justify-between gap-3 px-4 py-4">
        <Wordmark />
        <LanguageSwitch tone="dark" />
      </header>
      <main id="main" className="flex flex-1 flex-col items-center px-4 pb-10 pt-4 sm:pt-10">
        <p className="mb-5 max-w-md text-center text-lg text-abyss-100">{t('app.tagline')}</p>
        <section
          aria-labelledby="auth-title"
          className="w-full max-w-md rounded-2xl bg-card px-5 py-6 text-ink shadow-xl sm:px-8 sm:py-8"
        >
          <h1 id="auth-title" className="text-2xl font-bold">
            {title}
          </h1>
          {intro ? <p className="mt-2 text-base text-muted">{intro}</p> : null}
          <div className="mt-6">{children}</div>
        </section>
      </main>
      <footer className="mx-auto w-full max-w-2xl px-5 pb-8 text-sm text-abyss-100">
        <h2 className="mb-2 font-bold text-white">{t('cautions.title')}</h2>
        <CautionList className="list-disc space-y-1 pl-5" />
      </footer>
    </div>
  );
}
