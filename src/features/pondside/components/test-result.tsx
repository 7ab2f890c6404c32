import { NH3_PER_NH3_N } from '@shared/chemistry';
import type { DisplayPrefs } from '@shared/schemas/auth.schema';
import { analyteRules, waterTestSchema, type CreateWaterTest, type FreeAmmoniaResultDto } from '@shared/schemas/water-tests.schema';
import { useQuery } from '@tanstack/react-query';
import { useTranslation } from 'react-i18next';
import { CautionList } from '@/components/cautions';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { Spinner } from '@/components/ui/spinner';
import { StatusBadge } from '@/components/ui/status-badge';
import { waterTestQueries } from '../api/water-tests';
import { useOutboxEntries, useSentRecord } from '../hooks/use-outbox';
import { farmClock, formatConcentration, formatNumber } from '../lib/format';
import type { InstantResult } from '../lib/instant-result';
import { checkAgainstRules, worstLevel } from '../lib/levels';
import { outbox, type OutboxEntry } from '../lib/outbox';
import { AmmoniaReadout, ValueReadout, type ProfileRules } from './ammonia-readout';
import { InstantValues, StoredProvenance } from './provenance';

/** A test the hand has saved: what they typed and what the phone worked out at that moment. */
export interface SavedTest {
  clientId: string;
  farmId: string;
  unitId: string;
  unitCode: string;
  unitName: string;
  body: CreateWaterTest;
  instant: InstantResult | null;
  savedAt: string;
  hasPhoto?: boolean;
}

export function entryErrorText(t: (k: string, o?: Record<string, unknown>) => string, entry: OutboxEntry): string {
  const fields = Object.entries(entry.error?.fieldErrors ?? {}).map(
    ([f, m]) => `${t(`pondside.fieldName.${f}`, { defaultValue: f })}: ${m.join(', ')}`,
  );
  if (fields.length) return fields.join(' · ');
  return entry.error?.message || t('pondside.outbox.refusedGeneric', { status: entry.error?.status ?? '' });
}

function SendState({
  entry,
  sentAt,
  computing,
  timeZone,
}: {
  entry: OutboxEntry | undefined;
  sentAt: string | null;
  computing: boolean;
  timeZone: string;
}) {
  const { t, i18n } = useTranslation();
  if (entry?.state === 'waiting') {
    return (
      <Callout tone="caution" live title={t('pondside.send.waitingTitle')}>
        <span data-testid="send-state" data-state="waiting">
          {entry.attempts > 0 ? t('pondside.send.waitingRetry') : t('pondside.send.waiting')}
        </span>
      </Callout>
    );
  }
  if (entry?.state === 'signed-out') {
    return (
      <Callout tone="caution" live title={t('pondside.send.signedOutTitle')}>
        <span data-testid="send-state" data-state="signed-out">
          {t('pondside.send.signedOut')}
        </span>
      </Callout>
    );
  }
  if (entry?.state === 'rejected') {
    return (
      <Callout tone="danger" live title={t('pondside.send.rejectedTitle')}>
        <span data-testid="send-state" data-state="rejected">
          {entryErrorText(t, entry)}
        </span>
      </Callout>
    );
  }
  if (computing) {
    return (
      <p
        className="flex items-center gap-3 rounded-xl bg-abyss-50 px-4 py-3 text-base font-bold text-abyss-800"
        role="status"
        data-testid="send-state"
        data-state="computing"
      >
        <Spinner size={22} />
        {t('pondside.send.computing')}
      </p>
    );
  }
  if (sentAt) {
    return (
      <Callout tone="success" live title={t('pondside.send.storedTitle')}>
        <span data-testid="send-state" data-state="stored">
          {t('pondside.send.stored', { time: farmClock(sentAt, timeZone, i18n.language) })}
        </span>
      </Callout>
    );
  }
  return null;
}

function Flags({ result }: { result: FreeAmmoniaResultDto }) {
  const { t } = useTranslation();
  if (!result.flags.length) return null;
  return (
    <>
      {result.flags.map((f) => (
        <Callout key={f.code} tone="danger" title={t(`pondside.flags.${f.code}.title`, { defaultValue: t('pondside.flags.otherTitle') })}>
          <span data-testid={`flag-${f.code}`}>{t(`pondside.flags.${f.code}.body`, { defaultValue: f.message })}</span>
        </Callout>
      ))}
    </>
  );
}

function Forecast({
  result,
  prefs,
  timeZone,
  profile,
}: {
  result: FreeAmmoniaResultDto;
  prefs: DisplayPrefs;
  timeZone: string;
  profile: ProfileRules | null;
}) {
  const { t, i18n } = useTranslation();
  const peak = result.forecastPeak;
  if (!peak) return null;
  const lang = i18n.language;
  const asN = prefs.ammoniaBasis === 'nh3-n';
  const unit = `${prefs.concentrationUnit === 'ppm' ? 'ppm' : 'mg/L'} ${asN ? 'NH3-N' : 'NH3'}`;
  const measured = result.nh3MgL ?? 0;
  const ratio = measured > 0 ? peak.nh3MgL / measured : null;
  const level = profile
    ? worstLevel(
        checkAgainstRules(profile.rules, {
          analyte: 'total_ammonia',
          nh3MgL: peak.nh3MgL,
          tanMgL: result.tanMgL ?? undefined,
          salinityPpt: result.salinityPpt,
        }).filter((c) => c.metric === 'nh3'),
      )
    : null;
  return (
    <section aria-labelledby="peak-title" className="gw-card flex flex-col gap-2 px-4 py-3" data-testid="forecast-peak">
      <h3 id="peak-title" className="flex flex-wrap items-center justify-between gap-2 text-lg font-bold">
        {t('pondside.peak.title')}
        {level ? <StatusBadge status={level} size="sm" /> : null}
      </h3>
      <p className="text-base">
        {t('pondside.peak.body', {
          value: formatConcentration(asN ? peak.nh3NMgL : peak.nh3MgL, lang),
          unit,
          time: peak.localTime,
          hours: peak.basedOnHours,
        })}
      </p>
      {peak.morningTestNote ? (
        <Callout tone="caution" title={t('pondside.peak.morningTitle')}>
          {t('pondside.peak.morning', {
            tested: farmClock(result.sampledAt, timeZone, lang),
            ratio: ratio ? formatNumber(ratio, lang, 1) : '',
            time: peak.localTime,
          })}
        </Callout>
      ) : null}
    </section>
  );
}

export interface TestResultProps {
  saved: SavedTest;
  timeZone: string;
  prefs: DisplayPrefs;
  profile: ProfileRules | null;
  windowMinutes: number;
  onNewTest: () => void;
  onAgain: () => void;
  onFix: (entry: OutboxEntry) => void;
}

/** After "Save": the phone's result at once, then the server's stored result with its provenance. */
export function TestResult({ saved, timeZone, prefs, profile, windowMinutes, onNewTest, onAgain, onFix }: TestResultProps) {
  const { t, i18n } = useTranslation();
  const lang = i18n.language;
  const entries = useOutboxEntries();
  const entry = entries.find((e) => e.id === saved.clientId);
  const sent = useSentRecord(saved.clientId);
  const sentTest = sent ? waterTestSchema.safeParse(sent.body) : null;
  const isAmmonia = saved.body.analyte === 'total_ammonia';

  // After a reload the outbox no longer knows the answer: find the stored test by its client id.
  const lookup = useQuery({
    ...waterTestQueries.list(saved.farmId, saved.unitId, saved.body.analyte, 20),
    enabled: !entry && !sentTest?.success,
  });
  const found = lookup.data?.tests.find((x) => x.clientId === saved.clientId);
  const testId = sentTest?.success ? sentTest.data.id : (found?.id ?? null);
  const detail = useQuery({ ...waterTestQueries.detail(saved.farmId, testId ?? 'none'), enabled: Boolean(testId) });
  const stored = detail.data ?? (sentTest?.success ? sentTest.data : null) ?? found ?? null;
  const result = stored?.result ?? null;
  const computing = Boolean(stored && isAmmonia && !result);

  const instant = saved.instant;
  const unitLabel = analyteRules[saved.body.analyte].unit;

  return (
    <div className="flex flex-col gap-5" data-testid="test-result">
      <header className="flex flex-col gap-1">
        <p className="text-base font-bold uppercase tracking-wide text-abyss-600">{t('pondside.result.kicker')}</p>
        <h1 className="text-3xl font-bold leading-tight">
          {saved.unitCode} · {saved.unitName}
        </h1>
        <p className="text-lg text-muted">
          {t('pondside.result.what', {
            analyte: t(`pondside.analyte.${saved.body.analyte}`),
            method: t(`pondside.method.${saved.body.method}`),
            value: formatNumber(saved.body.value, lang, 3),
            unit: unitLabel,
            basis: t(`pondside.basisShort.${saved.body.basis}`),
            time: farmClock(saved.body.sampledAt ?? saved.savedAt, timeZone, lang),
          })}
        </p>
      </header>

      <SendState entry={entry} sentAt={stored ? (stored.createdAt ?? null) : null} computing={computing} timeZone={timeZone} />
      {saved.hasPhoto && (entry || (sent && sent.photo !== 'none')) ? (
        <p className="flex items-center gap-2 text-base font-bold" data-testid="photo-state">
          <span aria-hidden="true">{entry ? '◔' : sent?.photo === 'attached' ? '●' : '◆'}</span>
          {t(entry ? 'pondside.photo.waiting' : `pondside.photo.${sent?.photo === 'attached' ? 'attached' : 'refused'}`)}
        </p>
      ) : null}
      {entry?.state === 'rejected' ? (
        <div className="flex flex-wrap gap-3">
          <Button variant="primary" onClick={() => onFix(entry)}>
            {t('pondside.outbox.fix')}
          </Button>
          <Button variant="secondary" onClick={() => void outbox.discard(entry.id)}>
            {t('pondside.outbox.discard')}
          </Button>
        </div>
      ) : null}

      {isAmmonia ? (
        result && result.status === 'ok' && result.nh3MgL !== null && result.tanMgL !== null && result.fraction !== null ? (
          <>
            <AmmoniaReadout
              testId="stored-result"
              caption={t('pondside.result.storedCaption')}
              nh3MgL={result.nh3MgL}
              tanMgL={result.tanMgL}
              fraction={result.fraction}
              salinityPpt={result.salinityPpt}
              profile={profile}
              prefs={prefs}
            />
            <section aria-labelledby="prov-title" className="gw-card flex flex-col gap-2 px-4 py-3">
              <h3 id="prov-title" className="text-lg font-bold">
                {t('pondside.prov.title')}
              </h3>
              <StoredProvenance result={result} timeZone={timeZone} prefs={prefs} />
            </section>
            <Flags result={result} />
            <Forecast result={result} prefs={prefs} timeZone={timeZone} profile={profile} />
            {instant?.status === 'ok' && Math.abs(instant.nh3MgL - result.nh3MgL) > 0.0005 ? (
              <p className="text-sm text-muted">
                {t('pondside.result.replaced', {
                  value: formatConcentration(prefs.ammoniaBasis === 'nh3-n' ? instant.nh3MgL / NH3_PER_NH3_N : instant.nh3MgL, lang),
                })}
              </p>
            ) : null}
          </>
        ) : (
          <>
            {result && result.status !== 'ok' ? (
              <>
                <Callout tone="danger" title={t('pondside.result.noResultTitle')}>
                  <span data-testid="stored-status">
                    {t(`pondside.result.status.${result.status}`, { minutes: result.provenance.windowMinutes })}
                  </span>
                </Callout>
                <Flags result={result} />
              </>
            ) : null}
            {instant?.status === 'ok' ? (
              <>
                <AmmoniaReadout
                  testId="instant-result"
                  caption={t('pondside.result.instantCaption')}
                  nh3MgL={instant.nh3MgL}
                  tanMgL={instant.tanMgL}
                  fraction={instant.fraction}
                  salinityPpt={instant.salinity.value}
                  profile={profile}
                  prefs={prefs}
                />
                <InstantValues
                  timeZone={timeZone}
                  prefs={prefs}
                  values={[
                    { quantity: 'ph', value: instant.pH },
                    { quantity: 'water_temperature', value: instant.temperature },
                    { quantity: 'salinity', value: instant.salinity },
                  ]}
                />
              </>
            ) : instant && (instant.status === 'needs_ph' || instant.status === 'needs_temperature') && !result ? (
              <Callout tone="caution" title={t('pondside.instant.needsTitle')}>
                {t(`pondside.instant.${instant.status}`, { minutes: windowMinutes })}
              </Callout>
            ) : null}
          </>
        )
      ) : (
        <ValueReadout
          analyte={saved.body.analyte}
          value={saved.body.value}
          basis={saved.body.basis}
          unitLabel={unitLabel}
          profile={profile}
          prefs={prefs}
          caption={t(stored ? 'pondside.result.storedValueCaption' : 'pondside.result.savedValueCaption')}
        />
      )}

      {saved.body.method === 'nessler' ? (
        <Callout tone="caution" title={t('pondside.nessler.title')}>
          {t('cautions.nessler')}
        </Callout>
      ) : null}
      <Callout tone="info" title={t('cautions.title')}>
        <CautionList className="list-disc space-y-1 pl-5" />
      </Callout>

      <div className="flex flex-col gap-3 sm:flex-row">
        <Button variant="accent" size="lg" onClick={onNewTest} className="sm:flex-1">
          {t('pondside.result.another')}
        </Button>
        <Button variant="secondary" size="lg" onClick={onAgain} className="sm:flex-1">
          {t('pondside.result.again', { code: saved.unitCode })}
        </Button>
      </div>
    </div>
  );
}
