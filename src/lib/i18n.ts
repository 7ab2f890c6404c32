import { locales, type Locale } from '@shared/schemas/auth.schema';
import i18n from 'i18next';
import { initReactI18next } from 'react-i18next';
import en from '@/locales/en.json';
import es from '@/locales/es.json';

const STORAGE_KEY = 'gillwise.locale';

export const supportedLocales = locales;

export function isLocale(value: unknown): value is Locale {
  return typeof value === 'string' && (locales as readonly string[]).includes(value);
}

/** Best guess before we know the user: last choice on this device, then the browser's languages. */
export function detectLocale(): Locale {
  try {
    const stored = globalThis.localStorage?.getItem(STORAGE_KEY);
    if (isLocale(stored)) return stored;
  } catch {
    /* storage may be blocked */
  }
  const nav = globalThis.navigator;
  const wanted = nav?.languages?.length ? nav.languages : nav?.language ? [nav.language] : [];
  for (const tag of wanted) {
    const base = tag.toLowerCase().split('-')[0];
    if (isLocale(base)) return base;
  }
  return 'en';
}

function applyDocumentLanguage(lng: string) {
  if (typeof document !== 'undefined') document.documentElement.lang = lng;
}

void i18n.use(initReactI18next).init({
  resources: { en: { translation: en }, es: { translation: es } },
  lng: detectLocale(),
  fallbackLng: 'en',
  supportedLngs: [...locales],
  interpolation: { escapeValue: false },
  returnNull: false,
  initAsync: false,
});
applyDocumentLanguage(i18n.language);

i18n.on('languageChanged', (lng) => {
  applyDocumentLanguage(lng);
  try {
    globalThis.localStorage?.setItem(STORAGE_KEY, lng);
  } catch {
    /* ignore */
  }
});

export async function setLocale(locale: Locale): Promise<void> {
  if (i18n.language !== locale) await i18n.changeLanguage(locale);
}

export function currentLocale(): Locale {
  return isLocale(i18n.language) ? i18n.language : 'en';
}

export { i18n };
