import { useTranslation } from 'react-i18next';
import { useAuth } from '@/lib/auth';

/** The reader's language and display preferences (°C/°F, NH3 or NH3-N). */
export function useDisplay() {
  const { i18n } = useTranslation();
  const { me } = useAuth();
  return {
    locale: i18n.language,
    prefs: {
      temperatureUnit: me?.user.prefs.temperatureUnit ?? 'C',
      ammoniaBasis: me?.user.prefs.ammoniaBasis ?? 'nh3',
      concentrationUnit: me?.user.prefs.concentrationUnit ?? 'mg/L',
    },
    userId: me?.user.id ?? null,
  } as const;
}
