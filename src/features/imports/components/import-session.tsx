import { analytes, testBases, testMethods } from '@shared/schemas/water-tests.schema';
import { dateOrders, type ImportStatus, type ImportUploadResponse } from '@shared/schemas/imports.schema';
import { useQuery } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Select, TextField } from '@/components/ui/field';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { importQueries, REJECTS_PAGE, useCommitImport, useValidateImport } from '../api/imports-api';
import { checkMapping, draftFrom, usesOf, type Choice, type MappingDraft } from '../lib/mapping';
import { fmtBytes } from './upload-card';

function ColumnSelect({
  label,
  value,
  onChange,
  headers,
  optional,
  error,
  hint,
}: {
  label: string;
  value: string;
  onChange: (v: string) => void;
  headers: readonly string[];
  optional?: boolean;
  error?: string;
  hint?: string;
}) {
  const { t } = useTranslation();
  return (
    <Select
      label={label}
      hint={hint}
      value={value}
      onChange={(e) => onChange(e.target.value)}
      error={error}
      options={[
        { value: '', label: optional ? t('imports.map.notInFile') : t('imports.map.pickColumn') },
        ...headers.map((h) => ({ value: h, label: h })),
      ]}
    />
  );
}

function ChoiceField({
  label,
  value,
  onChange,
  headers,
  options,
  error,
}: {
  label: string;
  value: Choice;
  onChange: (c: Choice) => void;
  headers: readonly string[];
  options: readonly string[];
  error?: string;
}) {
  const { t } = useTranslation();
  return (
    <fieldset className="flex flex-col gap-2 rounded-xl border-2 border-line bg-card p-3">
      <legend className="px-1 text-base font-bold">{label}</legend>
      <div className="flex flex-wrap gap-2" role="radiogroup">
        {(['column', 'fixed'] as const).map((m) => (
          <label
            key={m}
            className={cx(
              'flex min-h-10 items-center gap-2 rounded-lg border-2 px-3 text-sm font-bold',
              value.mode === m ? 'border-abyss-700 bg-abyss-50' : 'border-line',
            )}
          >
            <input type="radio" className="accent-abyss-700" checked={value.mode === m} onChange={() => onChange({ ...value, mode: m })} />
            {t(`imports.map.mode.${m}`)}
          </label>
        ))}
      </div>
      {value.mode === 'column' ? (
        <ColumnSelect
          label={t('imports.map.column')}
          value={value.column}
          onChange={(column) => onChange({ ...value, column })}
          headers={headers}
          error={error}
        />
      ) : (
        <Select
          label={t('imports.map.everyRow')}
          value={value.fixed}
          onChange={(e) => onChange({ ...value, fixed: e.target.value })}
          error={error}
          options={[
            { value: '', label: t('imports.map.pickValue') },
            ...options.map((o) => ({ value: o, label: t(`imports.value.${o}`, { defaultValue: o }) })),
          ]}
        />
      )}
    </fieldset>
  );
}

function Progress({ status }: { status: ImportStatus }) {
  const { t, i18n } = useTranslation();
  const pct = status.totalRows ? Math.min(100, Math.round((status.processedRows / status.totalRows) * 100)) : 0;
  const n = (v: number) => new Intl.NumberFormat(i18n.language).format(v);
  return (
    <div role="status" className="flex flex-col gap-1" data-testid="import-progress">
      <p className="text-base font-bold">
        {t(status.state === 'committing' ? 'imports.progress.committing' : 'imports.progress.validating', {
          done: n(status.processedRows),
          total: n(status.totalRows),
          pct,
        })}
      </p>
      <div className="h-3 overflow-hidden rounded-full bg-abyss-100" aria-hidden="true">
        <div className="h-full bg-abyss-600 transition-all" style={{ width: `${pct}%` }} />
      </div>
    </div>
  );
}

function Count({ label, value, tone }: { label: string; value: number; tone?: 'ok' | 'bad' }) {
  const { i18n } = useTranslation();
  return (
    <li
      className={cx(
        'rounded-xl border-2 px-3 py-2',
        tone === 'bad' && value > 0
          ? 'border-act bg-act-soft text-act-ink'
          : tone === 'ok'
            ? 'border-clear bg-clear-soft text-clear-ink'
            : 'border-line bg-card',
      )}
    >
      <span className="block text-sm font-bold">{label}</span>
      <span className="block text-2xl font-bold tabular-nums">
        {tone === 'bad' && value > 0 ? <span aria-hidden="true">◆ </span> : null}
        {new Intl.NumberFormat(i18n.language).format(value)}
      </span>
    </li>
  );
}

function Section({ title, step, children, testId }: { title: string; step: number; children: ReactNode; testId?: string }) {
  return (
    <section className="gw-card flex flex-col gap-4 p-4 sm:p-5" data-testid={testId}>
      <h2 className="flex items-center gap-3 text-xl font-bold">
        <span className="grid size-8 shrink-0 place-items-center rounded-full bg-abyss-700 text-base text-white">{step}</span>
        {title}
      </h2>
      {children}
    </section>
  );
}

/** One uploaded file: map its columns, check every row, read why rows are refused, then store. */
export function ImportSession({ farmId, upload, onDone }: { farmId: string; upload: ImportUploadResponse; onDone: () => void }) {
  const { t, i18n } = useTranslation();
  const [draft, setDraft] = useState<MappingDraft>(() => draftFrom(upload.suggestedMapping));
  const [missing, setMissing] = useState<string[]>([]);
  const [offset, setOffset] = useState(0);
  const [skipRejected, setSkipRejected] = useState(false);
  const [checkedKey, setCheckedKey] = useState<string | null>(null);
  const validate = useValidateImport(farmId);
  const commit = useCommitImport(farmId);
  const started = checkedKey !== null || upload.state !== 'uploaded';
  const status = useQuery({ ...importQueries.status(farmId, upload.importId, offset), enabled: started });
  const s = status.data;
  const set = <K extends keyof MappingDraft>(k: K, v: MappingDraft[K]) => setDraft((d) => ({ ...d, [k]: v }));
  const uses = usesOf(draft);
  const headers = upload.headers;
  const err = (k: string) => (missing.includes(k) ? t('imports.map.required') : undefined);
  const draftKey = JSON.stringify(draft);
  const stale = checkedKey !== null && checkedKey !== draftKey;
  const running = s?.state === 'validating' || s?.state === 'committing';
  const n = (v: number) => new Intl.NumberFormat(i18n.language).format(v);

  const run = () => {
    const check = checkMapping(draft);
    if (!check.ok) return setMissing(check.missing);
    setMissing([]);
    setOffset(0);
    setCheckedKey(draftKey);
    validate.mutate({ importId: upload.importId, mapping: check.mapping });
  };
  const store = () => {
    const check = checkMapping(draft);
    if (!check.ok) return setMissing(check.missing);
    commit.mutate({ importId: upload.importId, mapping: check.mapping, skipRejected });
  };

  return (
    <div className="flex flex-col gap-5" data-testid="import-session" data-state={s?.state ?? upload.state}>
      <div className="flex flex-wrap items-center justify-between gap-3 rounded-xl border-2 border-abyss-600 bg-abyss-50 px-4 py-3">
        <p className="text-base">
          <span className="font-bold">{upload.fileName}</span> · {fmtBytes(upload.sizeBytes, i18n.language)} ·{' '}
          {t('imports.file.rows', { count: upload.totalRows, n: n(upload.totalRows) })} ·{' '}
          {t('imports.file.delimiter', { d: upload.delimiter === '\t' ? t('imports.file.tab') : upload.delimiter })}
        </p>
        <Button variant="ghost" onClick={onDone}>
          {t('imports.file.another')}
        </Button>
      </div>
      {upload.existing ? <Callout tone="info" title={t('imports.file.existing')} /> : null}
      {upload.warnings.length ? (
        <Callout tone="caution" title={t('imports.file.warnings')}>
          <ul className="list-disc pl-5">
            {upload.warnings.map((w) => (
              <li key={w.code + w.message}>{w.message}</li>
            ))}
          </ul>
        </Callout>
      ) : null}

      <Section step={2} title={t('imports.map.title')} testId="mapping">
        <p className="text-base text-muted">{t('imports.map.intro')}</p>
        <div className="grid gap-4 md:grid-cols-2 2xl:grid-cols-3">
          <ColumnSelect
            label={t('imports.field.unitCode')}
            value={draft.unitCode}
            onChange={(v) => set('unitCode', v)}
            headers={headers}
            error={err('unitCode')}
          />
          <ColumnSelect
            label={t('imports.field.value')}
            value={draft.value}
            onChange={(v) => set('value', v)}
            headers={headers}
            error={err('value')}
          />
          <fieldset className="flex flex-col gap-2 rounded-xl border-2 border-line bg-card p-3 md:col-span-2 2xl:col-span-1">
            <legend className="px-1 text-base font-bold">{t('imports.field.sampledAt')}</legend>
            <div className="flex flex-wrap gap-2" role="radiogroup">
              {(['single', 'split'] as const).map((m) => (
                <label
                  key={m}
                  className={cx(
                    'flex min-h-10 items-center gap-2 rounded-lg border-2 px-3 text-sm font-bold',
                    draft.sampledMode === m ? 'border-abyss-700 bg-abyss-50' : 'border-line',
                  )}
                >
                  <input
                    type="radio"
                    className="accent-abyss-700"
                    checked={draft.sampledMode === m}
                    onChange={() => set('sampledMode', m)}
                  />
                  {t(`imports.map.time.${m}`)}
                </label>
              ))}
            </div>
            {draft.sampledMode === 'single' ? (
              <ColumnSelect
                label={t('imports.map.column')}
                value={draft.sampledAt}
                onChange={(v) => set('sampledAt', v)}
                headers={headers}
                error={err('sampledAt')}
              />
            ) : (
              <div className="grid grid-cols-2 gap-2">
                <ColumnSelect
                  label={t('imports.map.dateColumn')}
                  value={draft.dateColumn}
                  onChange={(v) => set('dateColumn', v)}
                  headers={headers}
                  error={err('sampledAt')}
                />
                <ColumnSelect
                  label={t('imports.map.timeColumn')}
                  value={draft.timeColumn}
                  onChange={(v) => set('timeColumn', v)}
                  headers={headers}
                  error={err('sampledAt')}
                />
              </div>
            )}
            <div className="grid grid-cols-2 gap-2">
              <Select
                label={t('imports.map.dateOrder')}
                value={draft.dateOrder}
                onChange={(e) => set('dateOrder', e.target.value as MappingDraft['dateOrder'])}
                options={dateOrders.map((o) => ({ value: o, label: t(`imports.map.order.${o}`) }))}
              />
              <TextField
                label={t('imports.map.timeZone')}
                value={draft.timeZone}
                onChange={(e) => set('timeZone', e.target.value)}
                error={err('timeZone')}
              />
            </div>
          </fieldset>
          <ChoiceField
            label={t('imports.field.analyte')}
            value={draft.analyte}
            onChange={(c) => set('analyte', c)}
            headers={headers}
            options={analytes}
            error={err('analyte')}
          />
          <ChoiceField
            label={t('imports.field.method')}
            value={draft.method}
            onChange={(c) => set('method', c)}
            headers={headers}
            options={testMethods}
            error={err('method')}
          />
          <ChoiceField
            label={t('imports.field.basis')}
            value={draft.basis}
            onChange={(c) => set('basis', c)}
            headers={headers}
            options={testBases}
            error={err('basis')}
          />
          <ColumnSelect
            label={t('imports.field.handheldPh')}
            value={draft.handheldPh}
            onChange={(v) => set('handheldPh', v)}
            headers={headers}
            optional
          />
          <div className="grid grid-cols-[minmax(0,1fr)_7rem] gap-2">
            <ColumnSelect
              label={t('imports.field.handheldTemperature')}
              value={draft.temperatureColumn}
              onChange={(v) => set('temperatureColumn', v)}
              headers={headers}
              optional
            />
            <Select
              label={t('imports.map.tempUnit')}
              value={draft.temperatureUnit}
              onChange={(e) => set('temperatureUnit', e.target.value as 'c' | 'f')}
              options={[
                { value: 'c', label: '°C' },
                { value: 'f', label: '°F' },
              ]}
            />
          </div>
          <ColumnSelect
            label={t('imports.field.handheldSalinityPpt')}
            value={draft.handheldSalinityPpt}
            onChange={(v) => set('handheldSalinityPpt', v)}
            headers={headers}
            optional
          />
          <ColumnSelect label={t('imports.field.note')} value={draft.note} onChange={(v) => set('note', v)} headers={headers} optional />
        </div>
        {!upload.suggestedMapping.basis ? <p className="text-sm text-muted">{t('imports.map.basisHint')}</p> : null}
        {missing.length ? (
          <Callout tone="danger" live title={t('imports.map.incomplete')}>
            {missing.map((m) => t(`imports.field.${m}`, { defaultValue: m })).join(', ')}
          </Callout>
        ) : null}

        <h3 className="text-lg font-bold">{t('imports.preview.title', { count: upload.preview.length })}</h3>
        <div className="max-h-[26rem] overflow-auto rounded-xl border-2 border-line" data-testid="import-preview">
          <table className="w-full border-collapse text-sm">
            <thead className="sticky top-0 bg-abyss-50 text-left">
              <tr>
                <th scope="col" className="border-b-2 border-line px-2 py-2 text-right">
                  {t('imports.preview.line')}
                </th>
                {headers.map((h) => (
                  <th
                    key={h}
                    scope="col"
                    className={cx('whitespace-nowrap border-b-2 border-line px-2 py-2 align-bottom', uses.has(h) && 'bg-ember-100')}
                  >
                    {uses.has(h) ? (
                      <span className="block text-xs font-bold uppercase tracking-wide text-ember-700">
                        {uses
                          .get(h)!
                          .map((f) => t(`imports.field.${f}`, { defaultValue: f }))
                          .join(' + ')}
                      </span>
                    ) : (
                      <span className="block text-xs text-muted">{t('imports.preview.unused')}</span>
                    )}
                    {h}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {upload.preview.map((r) => (
                <tr key={r.line} className="border-b border-line last:border-b-0 even:bg-paper">
                  <td className="px-2 py-1.5 text-right tabular-nums text-muted">{r.line}</td>
                  {headers.map((h, i) => (
                    <td key={h} className={cx('max-w-64 truncate px-2 py-1.5', uses.has(h) && 'bg-ember-50')} title={r.cells[i] ?? ''}>
                      {r.cells[i] ?? ''}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <div className="flex flex-wrap items-center gap-3">
          <Button variant="primary" onClick={run} loading={validate.isPending} disabled={running}>
            {checkedKey ? t('imports.check.again') : t('imports.check.button', { count: upload.totalRows, n: n(upload.totalRows) })}
          </Button>
          {stale ? <p className="text-base font-bold text-watch-ink">{t('imports.check.stale')}</p> : null}
        </div>
        {validate.error ? (
          <Callout tone="danger" live title={t('imports.check.failed')}>
            {requestErrorText(t, validate.error)}
          </Callout>
        ) : null}
      </Section>

      {started ? (
        <Section step={3} title={t('imports.report.title')} testId="import-report">
          {!s ? (
            <Spinner label={t('imports.loading')} />
          ) : (
            <>
              {running ? <Progress status={s} /> : null}
              <ul className="grid grid-cols-3 gap-3">
                <Count label={t('imports.report.total')} value={s.totalRows} />
                <Count label={t('imports.report.accepted')} value={s.acceptedRows} tone="ok" />
                <Count label={t('imports.report.rejected')} value={s.rejectedRows} tone="bad" />
              </ul>
              {s.error && s.state !== 'committed' ? (
                <Callout tone="danger" live title={t('imports.report.error')}>
                  {s.error.message}
                </Callout>
              ) : null}
              {s.rejectsPage.total > 0 ? (
                <>
                  <h3 className="text-lg font-bold">{t('imports.report.rejectsTitle', { count: s.rejectsPage.total })}</h3>
                  <div className="overflow-x-auto rounded-xl border-2 border-line">
                    <table className="w-full border-collapse text-base" data-testid="rejects">
                      <thead className="bg-act-soft text-left text-act-ink">
                        <tr>
                          <th scope="col" className="border-b-2 border-line px-3 py-2 text-right">
                            {t('imports.preview.line')}
                          </th>
                          <th scope="col" className="border-b-2 border-line px-3 py-2">
                            {t('imports.report.why')}
                          </th>
                        </tr>
                      </thead>
                      <tbody>
                        {s.rejects.map((r) => (
                          <tr key={r.line} className="border-b border-line align-top last:border-b-0" data-line={r.line}>
                            <th scope="row" className="px-3 py-2 text-right tabular-nums">
                              {r.line}
                            </th>
                            <td className="px-3 py-2">
                              <ul className="flex flex-col gap-0.5">
                                {r.reasons.map((why) => (
                                  <li key={why} className="flex gap-2">
                                    <span aria-hidden="true" className="text-act">
                                      ◆
                                    </span>
                                    {why}
                                  </li>
                                ))}
                              </ul>
                            </td>
                          </tr>
                        ))}
                      </tbody>
                    </table>
                  </div>
                  {s.rejectsPage.total > REJECTS_PAGE ? (
                    <div className="flex flex-wrap items-center gap-2">
                      <Button variant="secondary" disabled={offset === 0} onClick={() => setOffset((o) => Math.max(0, o - REJECTS_PAGE))}>
                        {t('imports.report.prev')}
                      </Button>
                      <p className="text-base">
                        {t('imports.report.page', {
                          from: offset + 1,
                          to: Math.min(offset + REJECTS_PAGE, s.rejectsPage.total),
                          total: s.rejectsPage.total,
                        })}
                      </p>
                      <Button
                        variant="secondary"
                        disabled={offset + REJECTS_PAGE >= s.rejectsPage.total}
                        onClick={() => setOffset((o) => o + REJECTS_PAGE)}
                      >
                        {t('imports.report.next')}
                      </Button>
                    </div>
                  ) : null}
                </>
              ) : s.state === 'validated' ? (
                <Callout tone="success" title={t('imports.report.allGood')} />
              ) : null}
            </>
          )}
        </Section>
      ) : null}

      {s && (s.state === 'validated' || s.state === 'committing' || s.state === 'committed') ? (
        <Section step={4} title={t('imports.commit.title')} testId="import-commit">
          {s.state === 'committed' && s.commit ? (
            <Callout tone="success" live title={t('imports.commit.done', { count: s.commit.storedRows, n: n(s.commit.storedRows) })}>
              <ul className="list-disc pl-5">
                {s.commit.alreadyStoredRows ? <li>{t('imports.commit.already', { count: s.commit.alreadyStoredRows })}</li> : null}
                {s.commit.skippedRows ? <li>{t('imports.commit.skipped', { count: s.commit.skippedRows })}</li> : null}
                {s.commit.queuedResults ? <li>{t('imports.commit.queued', { count: s.commit.queuedResults })}</li> : null}
              </ul>
            </Callout>
          ) : s.state === 'committing' ? (
            <Progress status={s} />
          ) : (
            <>
              <p className="text-base">{t('imports.commit.intro', { count: s.acceptedRows, n: n(s.acceptedRows) })}</p>
              {s.rejectedRows > 0 ? (
                <label className="flex items-start gap-3 rounded-xl border-2 border-line px-3 py-3 text-base">
                  <input
                    type="checkbox"
                    className="mt-1 size-5 accent-abyss-700"
                    checked={skipRejected}
                    onChange={(e) => setSkipRejected(e.target.checked)}
                  />
                  <span>{t('imports.commit.skip', { count: s.rejectedRows })}</span>
                </label>
              ) : null}
              {stale ? <Callout tone="caution" title={t('imports.check.stale')} /> : null}
              <Button
                variant="primary"
                className="self-start"
                onClick={store}
                loading={commit.isPending}
                disabled={stale || s.acceptedRows === 0 || (s.rejectedRows > 0 && !skipRejected)}
              >
                {t('imports.commit.button', { count: s.acceptedRows, n: n(s.acceptedRows) })}
              </Button>
            </>
          )}
          {commit.error ? (
            <Callout tone="danger" live title={t('imports.commit.failed')}>
              {requestErrorText(t, commit.error)}
            </Callout>
          ) : null}
        </Section>
      ) : null}
    </div>
  );
}
