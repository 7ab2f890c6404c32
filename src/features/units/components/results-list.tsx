import type { WaterTestDto } from '@shared/schemas/water-tests.schema';
import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { useDisplay } from '../hooks/use-display';
import { formatConcentration, formatFarmTime, formatNumber, formatQuantity } from '../lib/format';
import { describeFlag, describeProvenance } from '../lib/provenance';

const PAGE = 12;

function valueText(test: WaterTestDto, locale: string, t: (k: string) => string, temperatureUnit: 'C' | 'F'): string {
  if (test.analyte === 'ph') return formatNumber(test.value, 2, locale);
  if (test.analyte === 'temperature') return formatQuantity('water_temperature', test.value, locale, { temperatureUnit });
  return `${formatConcentration(test.value, locale)} ${t(`units.basis.${test.basis}`)}`;
}

/** Kit and meter results, newest first: the value as read, the computed free ammonia, where every input came from, and any flags. */
export function ResultsList({ tests, timeZone }: { tests: readonly WaterTestDto[]; timeZone: string }) {
  const { t } = useTranslation();
  const { locale, prefs } = useDisplay();
  const [shown, setShown] = useState(PAGE);
  const sorted = [...tests].sort((a, b) => Date.parse(b.sampledAt) - Date.parse(a.sampledAt));
  if (sorted.length === 0) return <p className="text-muted">{t('units.results.none')}</p>;
  const asN = prefs.ammoniaBasis === 'nh3-n';

  return (
    <div className="flex flex-col gap-3">
      <ol className="flex flex-col gap-3" data-testid="results-list">
        {sorted.slice(0, shown).map((test) => {
          const r = test.result;
          const nh3 = r ? (asN ? r.nh3NMgL : r.nh3MgL) : null;
          return (
            <li key={test.id} className="gw-card px-4 py-3" data-test-id={test.id}>
              <div className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1">
                <p className="text-lg">
                  <span className="font-bold">{t(`units.analyte.${test.analyte}`)}</span>{' '}
                  <span className="tabular-nums">{valueText(test, locale, t, prefs.temperatureUnit)}</span>
                  <span className="text-muted"> · {t(`units.method.${test.method}`)}</span>
                </p>
                <p className="text-base text-muted">
                  <time dateTime={test.sampledAt}>{formatFarmTime(test.sampledAt, timeZone, locale)}</time>
                  {test.version > 1 ? ` · ${t('units.results.edited', { version: test.version })}` : ''}
                </p>
              </div>
              {r ? (
                <div className="mt-1 flex flex-col gap-1">
                  {r.status === 'ok' && nh3 !== null ? (
                    <p className="text-base font-bold">
                      {t('units.results.nh3', {
                        value: formatConcentration(nh3, locale),
                        unit: asN ? t('units.unit.nh3n') : t('units.unit.nh3'),
                        percent: r.fraction === null ? '—' : formatNumber(r.fraction * 100, 2, locale),
                      })}
                    </p>
                  ) : (
                    <p className="text-base font-bold text-watch-ink">
                      <span aria-hidden="true">▲ </span>
                      {t(`units.nh3.status.${r.status}`)}
                    </p>
                  )}
                  <ul className="list-disc space-y-0.5 pl-5 text-base">
                    {r.provenance.values.map((v) => (
                      <li key={v.quantity}>{describeProvenance(v, { t, locale, timeZone, prefs, sampledAt: r.sampledAt })}</li>
                    ))}
                    {r.provenance.missing.map((q) => (
                      <li key={q}>
                        {t('units.provenance.missing', { quantity: t(`units.quantity.${q}`), minutes: r.provenance.windowMinutes })}
                      </li>
                    ))}
                  </ul>
                  {r.method ? (
                    <p className="text-sm text-muted">
                      {t('units.results.method', { method: t(`units.ammoniaMethod.${r.method}`, { defaultValue: r.method }) })}
                    </p>
                  ) : null}
                  {r.flags.map((f) => (
                    <Callout key={f.code} tone="caution" className="mt-1">
                      {describeFlag(f, t)}
                    </Callout>
                  ))}
                </div>
              ) : test.analyte === 'total_ammonia' ? (
                <p className="mt-1 text-base text-muted">{t('units.results.computing')}</p>
              ) : null}
              {test.note ? <p className="mt-1 text-base italic">“{test.note}”</p> : null}
            </li>
          );
        })}
      </ol>
      {sorted.length > shown ? (
        <Button variant="secondary" className="self-start" onClick={() => setShown((n) => n + PAGE)}>
          {t('units.results.more', { count: sorted.length - shown })}
        </Button>
      ) : null}
    </div>
  );
}
