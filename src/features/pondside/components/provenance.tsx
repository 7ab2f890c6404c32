import type { DisplayPrefs } from '@shared/schemas/auth.schema';
import type { FreeAmmoniaResultDto } from '@shared/schemas/water-tests.schema';
import type { TFunction } from 'i18next';
import { useTranslation } from 'react-i18next';
import { Icon, type IconName } from '@/components/ui/icon';
import { farmClock, formatNumber, formatTemperature } from '../lib/format';
import type { WaterValue } from '../lib/instant-result';

type Quantity = 'ph' | 'water_temperature' | 'salinity';

function what(t: TFunction, quantity: Quantity, value: number, prefs: DisplayPrefs, lang: string): string {
  if (quantity === 'ph') return t('pondside.prov.ph', { v: formatNumber(value, lang, 2) });
  if (quantity === 'water_temperature') return formatTemperature(value, prefs.temperatureUnit, lang);
  return t('pondside.prov.salinity', { v: formatNumber(value, lang, 1) });
}

const icons: Record<string, IconName> = { probe: 'chart', probe_interpolated: 'chart', handheld: 'tube', unit_default: 'sliders' };

function Line({ icon, children, testId }: { icon: IconName; children: React.ReactNode; testId?: string }) {
  return (
    <li className="flex items-start gap-3" data-testid={testId}>
      <Icon name={icon} size={22} className="mt-0.5 shrink-0 text-abyss-700" />
      <span>{children}</span>
    </li>
  );
}

/** Where the phone's quick result took pH, temperature and salinity from. */
export function InstantValues({
  values,
  timeZone,
  prefs,
}: {
  values: Array<{ quantity: Quantity; value: WaterValue | null }>;
  timeZone: string;
  prefs: DisplayPrefs;
}) {
  const { t, i18n } = useTranslation();
  const lang = i18n.language;
  return (
    <ul className="flex flex-col gap-2 text-base">
      {values.map(({ quantity, value }) =>
        value ? (
          <Line key={quantity} icon={icons[value.source] ?? 'info'}>
            {value.source === 'probe'
              ? t('pondside.prov.instantProbe', {
                  what: what(t, quantity, value.value, prefs, lang),
                  time: value.at ? farmClock(value.at, timeZone, lang) : '',
                })
              : value.source === 'handheld'
                ? t('pondside.prov.handheld', { what: what(t, quantity, value.value, prefs, lang) })
                : t('pondside.prov.unitDefault', { what: what(t, quantity, value.value, prefs, lang) })}
          </Line>
        ) : (
          <Line key={quantity} icon="caution">
            <strong>{t(`pondside.prov.instantMissing.${quantity}`)}</strong>
          </Line>
        ),
      )}
    </ul>
  );
}

/** The stored result's provenance in words: "pH 8.12 from probe P1 sonde at 06:58, interpolated …". */
export function StoredProvenance({ result, timeZone, prefs }: { result: FreeAmmoniaResultDto; timeZone: string; prefs: DisplayPrefs }) {
  const { t, i18n } = useTranslation();
  const lang = i18n.language;
  const clock = (at: string) => farmClock(at, timeZone, lang);
  const { values, missing, windowMinutes } = result.provenance;
  return (
    <ul className="flex flex-col gap-2 text-base" data-testid="stored-provenance">
      {values.map((v) => {
        const q = (['ph', 'water_temperature', 'salinity'] as const).find((x) => x === v.quantity) ?? 'ph';
        const w = what(t, q, v.value, prefs, lang);
        const probe = v.probeLabel ?? t('pondside.prov.aProbe');
        const first = v.readings[0];
        const second = v.readings[1];
        const text =
          v.source === 'probe_interpolated' && first && second
            ? t('pondside.prov.interpolated', {
                what: w,
                probe,
                time: clock(result.sampledAt),
                from: clock(first.at),
                to: clock(second.at),
              })
            : v.source === 'probe' || v.source === 'probe_interpolated'
              ? t('pondside.prov.probe', { what: w, probe, time: clock(first?.at ?? result.sampledAt) })
              : v.source === 'handheld'
                ? t('pondside.prov.handheld', { what: w })
                : t('pondside.prov.unitDefault', { what: w });
        return (
          <Line key={v.quantity} icon={icons[v.source] ?? 'info'} testId={`prov-${v.quantity}`}>
            {text}
          </Line>
        );
      })}
      {missing.map((m) => (
        <Line key={m} icon="caution">
          <strong>{t(`pondside.prov.missing.${m === 'ph' ? 'ph' : 'water_temperature'}`, { minutes: windowMinutes })}</strong>
        </Line>
      ))}
      {result.method ? (
        <Line icon="info">
          <span className="text-sm text-muted">
            {t('pondside.prov.method', {
              method: t(`pondside.methodName.${result.method}`, { defaultValue: result.method }),
              window: windowMinutes,
            })}
          </span>
        </Line>
      ) : null}
    </ul>
  );
}
