import { importLimits, type ImportUploadResponse } from '@shared/schemas/imports.schema';
import { useRef, useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Icon } from '@/components/ui/icon';
import { isApiError } from '@/lib/api-client';
import { requestErrorText } from '@/lib/form-errors';
import { uploadCsv } from '../api/imports-api';

const TEXT_EXT = ['.csv', '.txt', '.tsv'];
const SHEET_EXT = ['.xlsx', '.xls', '.ods'];
const ext = (name: string) => (name.includes('.') ? name.slice(name.lastIndexOf('.')).toLowerCase() : '');

export function fmtBytes(n: number, locale: string): string {
  const f = (v: number) => new Intl.NumberFormat(locale, { maximumFractionDigits: 1 }).format(v);
  return n >= 1024 * 1024 ? `${f(n / 1024 / 1024)} MB` : n >= 1024 ? `${f(n / 1024)} kB` : `${n} B`;
}

type Problem = { title: string; body: string };

/** Choose or drop a CSV; size and type are checked here first, then by the server. */
export function UploadCard({ farmId, onUploaded }: { farmId: string; onUploaded: (u: ImportUploadResponse) => void }) {
  const { t, i18n } = useTranslation();
  const input = useRef<HTMLInputElement>(null);
  const [over, setOver] = useState(false);
  const [progress, setProgress] = useState<number | null>(null);
  const [problem, setProblem] = useState<Problem | null>(null);
  const [file, setFile] = useState<File | null>(null);

  const send = async (f: File) => {
    setProblem(null);
    setFile(f);
    const e = ext(f.name);
    if (SHEET_EXT.includes(e))
      return setProblem({ title: t('imports.upload.sheetTitle'), body: t('imports.upload.sheetBody', { name: f.name }) });
    if (!TEXT_EXT.includes(e) && !/^text\//.test(f.type))
      return setProblem({ title: t('imports.upload.typeTitle'), body: t('imports.upload.typeBody', { name: f.name }) });
    if (f.size > importLimits.maxBytes)
      return setProblem({
        title: t('imports.upload.sizeTitle'),
        body: t('imports.upload.sizeBody', { size: fmtBytes(f.size, i18n.language), max: fmtBytes(importLimits.maxBytes, i18n.language) }),
      });
    if (f.size === 0) return setProblem({ title: t('imports.upload.emptyTitle'), body: t('imports.upload.emptyBody') });
    setProgress(0);
    try {
      const u = await uploadCsv(farmId, f, setProgress);
      onUploaded(u);
    } catch (err) {
      const code = isApiError(err) ? err.code : '';
      const status = isApiError(err) ? err.status : 0;
      setProblem(
        status === 413
          ? { title: t('imports.upload.sizeTitle'), body: requestErrorText(t, err) }
          : status === 415
            ? {
                title: code === 'spreadsheet_not_csv' ? t('imports.upload.sheetTitle') : t('imports.upload.typeTitle'),
                body: requestErrorText(t, err),
              }
            : { title: t('imports.upload.failed'), body: requestErrorText(t, err) },
      );
    } finally {
      setProgress(null);
      if (input.current) input.current.value = '';
    }
  };

  return (
    <section className="gw-card flex flex-col gap-4 p-4 sm:p-5" aria-labelledby="upload-title" data-testid="upload-card">
      <h2 id="upload-title" className="flex items-center gap-3 text-xl font-bold">
        <span className="grid size-8 shrink-0 place-items-center rounded-full bg-abyss-700 text-base text-white">1</span>
        {t('imports.upload.title')}
      </h2>
      <p className="text-base text-muted">{t('imports.upload.intro', { max: fmtBytes(importLimits.maxBytes, i18n.language) })}</p>
      <div
        onDragOver={(e) => {
          e.preventDefault();
          setOver(true);
        }}
        onDragLeave={() => setOver(false)}
        onDrop={(e) => {
          e.preventDefault();
          setOver(false);
          const f = e.dataTransfer.files[0];
          if (f) void send(f);
        }}
        className={cx(
          'flex flex-col items-center gap-3 rounded-2xl border-2 border-dashed px-4 py-8 text-center',
          over ? 'border-abyss-600 bg-abyss-50' : 'border-line bg-paper',
        )}
      >
        <Icon name="upload" size={36} className="text-abyss-700" />
        <p className="text-lg font-bold">{t('imports.upload.drop')}</p>
        <input
          ref={input}
          id="import-file"
          type="file"
          accept=".csv,.txt,.tsv,text/csv,text/plain"
          className="sr-only"
          onChange={(e) => {
            const f = e.target.files?.[0];
            if (f) void send(f);
          }}
          data-testid="import-file"
        />
        <Button variant="primary" onClick={() => input.current?.click()} loading={progress !== null}>
          {t('imports.upload.choose')}
        </Button>
        {progress !== null && file ? (
          <div className="w-full max-w-md" role="status">
            <p className="text-sm">{t('imports.upload.sending', { name: file.name, pct: Math.round(progress * 100) })}</p>
            <div className="mt-1 h-3 overflow-hidden rounded-full bg-abyss-100" aria-hidden="true">
              <div className="h-full bg-abyss-600 transition-all" style={{ width: `${Math.round(progress * 100)}%` }} />
            </div>
          </div>
        ) : null}
      </div>
      {problem ? (
        <Callout tone="danger" live title={problem.title}>
          {problem.body}
        </Callout>
      ) : null}
    </section>
  );
}
