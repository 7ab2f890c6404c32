import { NH3_PER_NH3_N } from '@shared/chemistry';
import type { DisplayPrefs } from '@shared/schemas/auth.schema';
import type { ThresholdRuleDto } from '@shared/schemas/thresholds.schema';
import type { Analyte } from '@shared/schemas/water-tests.schema';
import { useTranslation } from 'react-i18next';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { StatusBadge } from '@/components/ui/status-badge';
import { formatConcentration, formatNumber, formatTemperature } from '../lib/format';
import { checkAgainstRules, COMMON_PRACTICE_NH3_MGL, worstLevel, type Level, type LevelCheck } from '../lib/levels';

export interface ProfileRules {
  name: string;
  rules: readonly ThresholdRuleDto[];
}

const levelFrame: Record<Level, string> = {
  clear: 'border-clear bg-clear-soft',
  watch: 'border-watch bg-watch-soft',
  act: 'border-act bg-act-soft',
};

/** The limits of one check, in words: "Watch from 0.02 · Act from 0.05 mg/L NH3". */
function LimitsLine({ check }: { check: LevelCheck }) {
  const { t, i18n } = useTranslation();
  const fmt = (v: number) => (check.basis === '°C' ? formatNumber(v, i18n.language, 1) : formatConcentration(v, i18n.language));
  const lower = check.metric.endsWith('_min');
  const parts = [
    check.watch !== null ? t(lower ? 'pondside.levels.watchBelow' : 'pondside.levels.watchFrom', { v: fmt(check.watch) }) : null,
    check.act !== null ? t(lower ? 'pondside.levels.actBelow' : 'pondside.levels.actFrom', { v: fmt(check.act) }) : null,
  ].filter(Boolean);
  return (
    <span>
      {parts.join(' · ')} {check.basis}
    </span>
  );
}

export interface AmmoniaReadoutProps {
  nh3MgL: number;
  tanMgL: number;
  fraction: number;
  salinityPpt: number | null;
  profile: ProfileRules | null;
  prefs: DisplayPrefs;
  /** "Right now on this phone" or "Stored result". */
  caption: string;
  testId?: string;
}

/** The free ammonia, in the user's basis and unit, with where it stands against the unit's limits. */
export function AmmoniaReadout({ nh3MgL, tanMgL, fraction, salinityPpt, profile, prefs, caption, testId }: AmmoniaReadoutProps) {
  const { t, i18n } = useTranslation();
  const lang = i18n.language;
  const asN = prefs.ammoniaBasis === 'nh3-n';
  const shown = asN ? nh3MgL / NH3_PER_NH3_N : nh3MgL;
  const unit = prefs.concentrationUnit === 'ppm' ? 'ppm' : 'mg/L';
  const checks = profile ? checkAgainstRules(profile.rules, { analyte: 'total_ammonia', nh3MgL, tanMgL, salinityPpt }) : [];
  const level = worstLevel(checks);
  const nh3Check = checks.find((c) => c.metric === 'nh3');

  return (
    <div
      data-testid={testId}
      data-level={level ?? 'none'}
      className={cx('flex flex-col gap-3 rounded-2xl border-[3px] p-4', level ? levelFrame[level] : 'border-abyss-700 bg-card')}
    >
      <p className="text-sm font-bold uppercase tracking-wide text-muted">{caption}</p>
      <div className="flex flex-wrap items-end justify-between gap-3">
        <p className="leading-none">
          <span className="block text-base font-bold">{t(asN ? 'pondside.result.freeAmmoniaN' : 'pondside.result.freeAmmonia')}</span>
          <span className="text-5xl font-bold tabular-nums" data-testid={testId ? `${testId}-value` : undefined}>
            {formatConcentration(shown, lang)}
          </span>{' '}
          <span className="text-xl font-bold">
            {unit} {asN ? 'NH3-N' : 'NH3'}
          </span>
        </p>
        {level ? <StatusBadge status={level} size="lg" /> : null}
      </div>
      <p className="text-base">
        {t('pondside.result.tanLine', {
          tan: formatConcentration(tanMgL, lang),
          unit,
          share: formatNumber(fraction * 100, lang, fraction < 0.01 ? 2 : 1),
        })}
      </p>
      {level ? (
        <div className="text-base">
          <p className="font-bold">{t(`pondside.levels.meaning.${level}`)}</p>
          {nh3Check ? (
            <p className="text-sm">
              <LimitsLine check={nh3Check} /> — {profile?.name}
            </p>
          ) : null}
          {checks
            .filter((c) => c.metric !== 'nh3' && c.level !== 'clear')
            .map((c) => (
              <p key={c.metric} className="text-sm">
                {t(`pondside.levels.metric.${c.metric}`)}: {t(`status.${c.level}`)} (<LimitsLine check={c} />)
              </p>
            ))}
        </div>
      ) : (
        <Callout tone={nh3MgL >= COMMON_PRACTICE_NH3_MGL ? 'danger' : 'caution'} title={t('pondside.levels.noProfileTitle')}>
          {t('pondside.levels.commonPractice')}
        </Callout>
      )}
    </div>
  );
}

/** A non-ammonia reading (nitrite, DO, pH …) against the unit's limits, when the profile has a rule for it. */
export function ValueReadout({
  analyte,
  value,
  basis,
  unitLabel,
  profile,
  prefs,
  caption,
}: {
  analyte: Analyte;
  value: number;
  basis: string;
  unitLabel: string;
  profile: ProfileRules | null;
  prefs: DisplayPrefs;
  caption: string;
}) {
  const { t, i18n } = useTranslation();
  const checks = profile ? checkAgainstRules(profile.rules, { analyte, value, basis }) : [];
  const level = worstLevel(checks);
  const text =
    analyte === 'temperature'
      ? formatTemperature(value, prefs.temperatureUnit, i18n.language)
      : `${formatNumber(value, i18n.language, 3)} ${unitLabel}`;
  return (
    <div
      data-level={level ?? 'none'}
      className={cx('flex flex-col gap-2 rounded-2xl border-[3px] p-4', level ? levelFrame[level] : 'border-abyss-700 bg-card')}
    >
      <p className="text-sm font-bold uppercase tracking-wide text-muted">{caption}</p>
      <div className="flex flex-wrap items-end justify-between gap-3">
        <p className="leading-none">
          <span className="block text-base font-bold">{t(`pondside.analyte.${analyte}`)}</span>
          <span className="text-4xl font-bold tabular-nums">{text}</span>
        </p>
        {level ? <StatusBadge status={level} size="lg" /> : null}
      </div>
      {level ? (
        checks.map((c) => (
          <p key={c.metric} className="text-sm">
            {t(`pondside.levels.metric.${c.metric}`)}: <LimitsLine check={c} /> — {profile?.name}
          </p>
        ))
      ) : (
        <p className="text-sm text-muted">{t('pondside.levels.noRule')}</p>
      )}
    </div>
  );
}
