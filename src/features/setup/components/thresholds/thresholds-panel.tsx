import {
  metricBases,
  metricDirection,
  thresholdMetrics,
  updateThresholdProfileRequestSchema,
  type ThresholdMetric,
  type ThresholdProfileDto,
  type ThresholdRuleDto,
} from '@shared/schemas/thresholds.schema';
import type { UnitDto } from '@shared/schemas/units.schema';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { NumberField, Select, TextField } from '@/components/ui/field';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { useUpdateThresholdProfile } from '../../api/setup-mutations';
import { setupQueries } from '../../api/setup-queries';
import { TextAreaField } from '@/components/ui/text-area-field';
import { numberOrNull, numberText } from '../../lib/form';

interface RuleRow {
  metric: ThresholdMetric;
  watch: string;
  act: string;
  basis: string;
  source: string;
  bySalinity: ThresholdRuleDto['bySalinity'];
}

const toRow = (r: ThresholdRuleDto): RuleRow => ({
  metric: r.metric,
  watch: numberText(r.watch),
  act: numberText(r.act),
  basis: r.basis,
  source: r.source,
  bySalinity: r.bySalinity,
});

function fmtLimit(v: number | null, locale: string) {
  return v === null ? '—' : new Intl.NumberFormat(locale, { maximumFractionDigits: 4 }).format(v);
}

function ProfileCard({
  farmId,
  profile,
  units,
  canEdit,
}: {
  farmId: string;
  profile: ThresholdProfileDto;
  units: readonly UnitDto[];
  canEdit: boolean;
}) {
  const { t, i18n } = useTranslation();
  const update = useUpdateThresholdProfile(farmId);
  const [rows, setRows] = useState<RuleRow[] | null>(null);
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [savedNote, setSavedNote] = useState(false);
  const usedBy = units.filter((u) => profile.unitIds.includes(u.id)).map((u) => u.code);
  const editing = rows !== null;
  const unused = thresholdMetrics.filter((m) => !(rows ?? []).some((r) => r.metric === m));
  const setRow = (i: number, patch: Partial<RuleRow>) => setRows((rs) => (rs ? rs.map((r, j) => (j === i ? { ...r, ...patch } : r)) : rs));

  const save = async () => {
    if (!rows) return;
    const body = {
      rules: rows.map((r) => ({
        metric: r.metric,
        watch: numberOrNull(r.watch),
        act: numberOrNull(r.act),
        basis: r.basis,
        source: r.source.trim(),
        ...(r.bySalinity ? { bySalinity: r.bySalinity } : {}),
      })),
      ...(reason.trim() ? { reason: reason.trim() } : {}),
    };
    const parsed = updateThresholdProfileRequestSchema.safeParse(body);
    if (!parsed.success) {
      const next: Record<string, string> = {};
      for (const issue of parsed.error.issues) {
        const [a, i, f] = issue.path;
        const key = a === 'rules' && typeof i === 'number' ? `${i}.${String(f ?? 'watch')}` : String(a);
        next[key] ??=
          f === 'source'
            ? t('setup.thr.sourceRequired')
            : f === 'watch' && issue.code === 'custom' && issue.message.includes('give')
              ? t('setup.thr.oneLimit')
              : f === 'watch' && issue.code === 'custom'
                ? t('setup.thr.order')
                : a === 'reason'
                  ? t('setup.thr.reasonShort')
                  : t('setup.thr.invalid');
      }
      return setErrors(next);
    }
    setErrors({});
    try {
      await update.mutateAsync({ profileId: profile.id, body: parsed.data });
      setRows(null);
      setReason('');
      setSavedNote(true);
    } catch {
      /* shown below */
    }
  };

  return (
    <li className="gw-card flex flex-col gap-3 p-4" data-testid="threshold-profile">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h3 className="text-lg font-bold">{profile.name}</h3>
          <p className="text-base text-muted">
            {[profile.species.replace(/_/g, ' '), profile.lifeStage].filter(Boolean).join(' · ')}
            {' · '}
            {usedBy.length ? t('setup.thr.usedBy', { units: usedBy.join(', ') }) : t('setup.thr.unused')}
          </p>
        </div>
        {canEdit && !editing ? (
          <Button
            variant="secondary"
            onClick={() => {
              setRows(profile.rules.map(toRow));
              setSavedNote(false);
            }}
          >
            {t('setup.thr.edit')}
          </Button>
        ) : null}
      </div>
      {savedNote ? <Callout tone="success" live title={t('setup.thr.saved')} /> : null}
      {!editing ? (
        <div className="overflow-x-auto">
          <table className="w-full border-collapse text-base">
            <thead className="bg-abyss-50 text-left">
              <tr>
                <th scope="col" className="border-b-2 border-line px-3 py-2">
                  {t('setup.thr.metric')}
                </th>
                <th scope="col" className="whitespace-nowrap border-b-2 border-line px-3 py-2 text-right">
                  <span aria-hidden="true" className="text-watch">
                    ▲{' '}
                  </span>
                  {t('setup.thr.watch')}
                </th>
                <th scope="col" className="whitespace-nowrap border-b-2 border-line px-3 py-2 text-right">
                  <span aria-hidden="true" className="text-act">
                    ◆{' '}
                  </span>
                  {t('setup.thr.act')}
                </th>
                <th scope="col" className="border-b-2 border-line px-3 py-2">
                  {t('setup.thr.source')}
                </th>
              </tr>
            </thead>
            <tbody>
              {profile.rules.map((r) => (
                <tr key={r.metric} className="border-b border-line align-top last:border-b-0">
                  <th scope="row" className="px-3 py-2 text-left">
                    {t(`setup.metric.${r.metric}`)}
                    <span className="block text-sm font-normal text-muted">
                      {r.basis} · {t(metricDirection[r.metric] === 'upper' ? 'setup.thr.upper' : 'setup.thr.lower')}
                    </span>
                  </th>
                  <td className="px-3 py-2 text-right tabular-nums">{fmtLimit(r.watch, i18n.language)}</td>
                  <td className="px-3 py-2 text-right tabular-nums">
                    {fmtLimit(r.act, i18n.language)}
                    {r.bySalinity ? (
                      <span className="block text-sm text-muted">{t('setup.thr.bySalinity', { count: r.bySalinity.length })}</span>
                    ) : null}
                  </td>
                  <td className="px-3 py-2 text-sm" data-testid="threshold-source">
                    {r.source}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : (
        <div className="flex flex-col gap-3" data-testid="threshold-editor">
          {rows.map((r, i) => (
            <fieldset
              key={r.metric}
              className="grid grid-cols-2 gap-3 rounded-xl border-2 border-line bg-paper p-3 sm:grid-cols-[8rem_8rem_12rem_minmax(0,1fr)]"
            >
              <legend className="px-1 text-base font-bold">
                {t(`setup.metric.${r.metric}`)}{' '}
                <span className="font-normal text-muted">
                  ({t(metricDirection[r.metric] === 'upper' ? 'setup.thr.upper' : 'setup.thr.lower')})
                </span>
              </legend>
              <div className="col-span-2 sm:col-span-4">
                <TextAreaField
                  label={t('setup.thr.source')}
                  hint={t('setup.thr.sourceHint')}
                  rows={2}
                  value={r.source}
                  onChange={(e) => setRow(i, { source: e.target.value })}
                  error={errors[`${i}.source`]}
                />
              </div>
              <NumberField
                label={t('setup.thr.watch')}
                value={r.watch}
                onChange={(e) => setRow(i, { watch: e.target.value })}
                error={errors[`${i}.watch`]}
              />
              <NumberField
                label={t('setup.thr.act')}
                value={r.act}
                onChange={(e) => setRow(i, { act: e.target.value })}
                error={errors[`${i}.act`]}
              />
              <Select
                label={t('setup.thr.basis')}
                options={metricBases[r.metric].map((b) => ({ value: b, label: b }))}
                value={r.basis}
                onChange={(e) => setRow(i, { basis: e.target.value })}
                error={errors[`${i}.basis`]}
              />
              <div className="flex items-end justify-end">
                <Button variant="ghost" onClick={() => setRows((rs) => (rs ? rs.filter((_, j) => j !== i) : rs))}>
                  {t('setup.thr.remove')}
                </Button>
              </div>
            </fieldset>
          ))}
          {unused.length > 0 ? (
            <Select
              label={t('setup.thr.addRule')}
              options={[
                { value: '', label: t('setup.thr.pickMetric') },
                ...unused.map((m) => ({ value: m, label: t(`setup.metric.${m}`) })),
              ]}
              value=""
              onChange={(e) => {
                const m = e.target.value as ThresholdMetric;
                if (m)
                  setRows((rs) => [
                    ...(rs ?? []),
                    { metric: m, watch: '', act: '', basis: metricBases[m][0]!, source: '', bySalinity: undefined },
                  ]);
              }}
            />
          ) : null}
          <TextField
            label={t('setup.thr.reason')}
            hint={t('setup.thr.reasonHint')}
            value={reason}
            onChange={(e) => setReason(e.target.value)}
            error={errors.reason}
          />
          {errors.rules ? <p className="font-bold text-act">{t('setup.thr.rulesInvalid')}</p> : null}
          {update.error ? (
            <Callout tone="danger" live title={t('setup.thr.saveFailed')}>
              {requestErrorText(t, update.error)}
            </Callout>
          ) : null}
          <div className="flex flex-wrap justify-end gap-2">
            <Button
              variant="ghost"
              onClick={() => {
                setRows(null);
                setErrors({});
              }}
            >
              {t('setup.cancel')}
            </Button>
            <Button variant="primary" loading={update.isPending} onClick={() => void save()}>
              {t('setup.thr.save')}
            </Button>
          </div>
        </div>
      )}
    </li>
  );
}

/** Threshold profiles: per species, the watch and act limits with where each number comes from. */
export function ThresholdsPanel({ farmId, canEdit }: { farmId: string; canEdit: boolean }) {
  const { t } = useTranslation();
  const q = useQuery(setupQueries.thresholds(farmId));
  const units = useQuery(setupQueries.units(farmId));
  if (q.isPending) return <Spinner label={t('setup.loading')} />;
  if (q.isError)
    return (
      <Callout tone="danger" title={t('setup.loadFailed')}>
        {requestErrorText(t, q.error)}
      </Callout>
    );
  return (
    <div className="flex flex-col gap-4" data-testid="thresholds-panel">
      <Callout tone="caution" title={t('cautions.title')}>
        {t('cautions.thresholds')}
      </Callout>
      <p className="max-w-prose text-base text-muted">{t('setup.thr.intro')}</p>
      <ul className="flex flex-col gap-4">
        {q.data.profiles.map((p) => (
          <ProfileCard key={p.id} farmId={farmId} profile={p} units={units.data ?? []} canEdit={canEdit} />
        ))}
      </ul>
    </div>
  );
}
