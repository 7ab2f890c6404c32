import { useQuery } from '@tanstack/react-query';
import QRCode from 'qrcode';
import { useEffect, useState } from 'react';
import { useTranslation } from 'react-i18next';
import { GillwiseMark } from '@/components/ui/brand';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { Select } from '@/components/ui/field';
import { Icon } from '@/components/ui/icon';
import { Spinner } from '@/components/ui/spinner';
import { pondsideQueries } from '../api/farm-data';

/** On paper only the label sheet is printed: the app around it is hidden, each label keeps together. */
const PRINT_CSS = `
@media print {
  @page { margin: 10mm; }
  html, body { background: #fff !important; }
  body * { visibility: hidden; }
  .gw-print-area, .gw-print-area * { visibility: visible; }
  .gw-print-area { position: absolute; inset: 0 auto auto 0; width: 100%; }
  .gw-no-print { display: none !important; }
  .gw-label { break-inside: avoid; border-color: #000 !important; }
}
`;

const svgSrc = (svg: string) => `data:image/svg+xml;charset=utf-8,${encodeURIComponent(svg)}`;

function LabelCard({ code, name, qr, labelId }: { code: string; name: string; qr: string; labelId: string }) {
  const { t } = useTranslation();
  return (
    <article className="gw-label flex flex-col overflow-hidden rounded-2xl border-[3px] border-abyss-900 bg-white text-black">
      <div className="flex flex-col items-center gap-4 p-4 sm:flex-row sm:items-center">
        <img src={svgSrc(qr)} alt={t('pondside.label.qrAlt', { code })} className="size-48 shrink-0" data-testid="label-qr" />
        <div className="flex min-w-0 flex-1 flex-col gap-2 text-center sm:text-left">
          <p className="text-7xl font-bold leading-none tracking-tight">{code}</p>
          <p className="text-xl font-bold leading-tight">{name}</p>
          <p className="text-base leading-snug">
            <span lang="en" className="block font-bold">
              {t('pondside.label.scan', { lng: 'en' })}
            </span>
            <span lang="es" className="block">
              {t('pondside.label.scan', { lng: 'es' })}
            </span>
          </p>
        </div>
      </div>
      <p className="flex items-center justify-between gap-3 border-t-2 border-black px-4 py-2 text-sm">
        <span className="inline-flex items-center gap-2 font-bold">
          <GillwiseMark size={22} className="shrink-0" />
          Gillwise
        </span>
        <span className="truncate font-mono">{labelId}</span>
      </p>
    </article>
  );
}

/**
 * A printable QR label for a unit: the code the hand reads from across the levee, the name, and the QR
 * that opens the pondside test of this unit. The server draws the QR; if it can't be reached the same
 * address is drawn here with `qrcode`.
 */
export function UnitLabel({ farmId, unitId }: { farmId: string; unitId: string }) {
  const { t } = useTranslation();
  const label = useQuery(pondsideQueries.unitLabel(farmId, unitId));
  const units = useQuery({ ...pondsideQueries.units(farmId), enabled: label.isError });
  const fallbackUnit = units.data?.units.find((u) => u.id === unitId);
  const [localSvg, setLocalSvg] = useState<string | null>(null);
  const [copies, setCopies] = useState('1');

  const fallbackUrl =
    fallbackUnit && typeof window !== 'undefined'
      ? `${window.location.origin}/farms/${farmId}/units/${unitId}/test?label=${encodeURIComponent(fallbackUnit.qrLabelId)}`
      : null;
  useEffect(() => {
    if (!fallbackUrl) return;
    let cancelled = false;
    QRCode.toString(fallbackUrl, { type: 'svg', errorCorrectionLevel: 'M', margin: 4 })
      .then((svg) => {
        if (!cancelled) setLocalSvg(svg);
      })
      .catch(() => undefined);
    return () => {
      cancelled = true;
    };
  }, [fallbackUrl]);

  const data = label.data
    ? { code: label.data.code, name: label.data.name, qr: label.data.svg, labelId: label.data.qrLabelId }
    : fallbackUnit && localSvg
      ? { code: fallbackUnit.code, name: fallbackUnit.name, qr: localSvg, labelId: fallbackUnit.qrLabelId }
      : null;

  return (
    <div className="flex flex-col gap-5">
      <style>{PRINT_CSS}</style>
      <title>{`${t('pondside.label.title')}${data ? ` · ${data.code}` : ''} · Gillwise`}</title>
      <header className="gw-no-print flex flex-col gap-1">
        <h1 className="text-3xl font-bold">{t('pondside.label.title')}</h1>
        <p className="text-lg text-muted">{t('pondside.label.intro')}</p>
      </header>
      {!data ? (
        label.isPending || units.isPending || (fallbackUnit && !localSvg) ? (
          <p className="flex items-center gap-3 text-lg" role="status">
            <Spinner /> {t('common.loading')}
          </p>
        ) : (
          <Callout tone="danger" title={t('pondside.label.failed')}>
            <Button variant="secondary" onClick={() => void label.refetch()}>
              {t('common.retry')}
            </Button>
          </Callout>
        )
      ) : (
        <>
          <div className="gw-no-print flex flex-wrap items-end gap-3">
            <Select
              label={t('pondside.label.copies')}
              value={copies}
              onChange={(e) => setCopies(e.target.value)}
              options={['1', '2', '4', '6'].map((n) => ({ value: n, label: n }))}
              containerClassName="w-32"
            />
            <Button variant="primary" onClick={() => window.print()} icon={<Icon name="report" />}>
              {t('pondside.label.print')}
            </Button>
          </div>
          {!label.data ? (
            <Callout tone="info" className="gw-no-print">
              {t('pondside.label.local')}
            </Callout>
          ) : null}
          <div className="gw-print-area grid gap-4 lg:grid-cols-2 print:grid-cols-2" data-testid="label-sheet">
            {Array.from({ length: Number(copies) }, (_, i) => (
              <LabelCard key={i} {...data} />
            ))}
          </div>
          <p className="gw-no-print text-sm text-muted">{t('pondside.label.tip')}</p>
        </>
      )}
    </div>
  );
}
