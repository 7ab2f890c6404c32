import type { UnitDto } from '@shared/schemas/units.schema';
import { useQuery } from '@tanstack/react-query';
import { useTranslation } from 'react-i18next';
import { Link } from 'react-router';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { Icon } from '@/components/ui/icon';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { setupQueries } from '../../api/setup-queries';

/** On paper only the labels are printed, each kept whole. */
const printCss = `
@media print {
  @page { margin: 10mm; }
  html, body { background: #fff !important; }
  header, nav, footer, .gw-no-print { display: none !important; }
  main { padding: 0 !important; margin: 0 !important; max-width: none !important; }
  .gw-labels { display: grid !important; grid-template-columns: repeat(2, 1fr) !important; gap: 8mm !important; }
  .gw-label { break-inside: avoid; border: 1.5px solid #000 !important; box-shadow: none !important; }
}
`;

function LabelCard({ farmId, unit, labelPageHref }: { farmId: string; unit: UnitDto; labelPageHref: string | null }) {
  const { t } = useTranslation();
  const label = useQuery(setupQueries.label(farmId, unit.id));
  return (
    <li className="gw-label gw-card flex items-center gap-4 p-4" data-testid="unit-label" data-unit-code={unit.code}>
      <div className="grid size-32 shrink-0 place-items-center rounded-lg bg-white">
        {label.isPending ? (
          <Spinner label={t('setup.labels.loading')} />
        ) : label.data ? (
          <img
            src={`data:image/svg+xml;charset=utf-8,${encodeURIComponent(label.data.svg)}`}
            alt={t('setup.labels.qrAlt', { code: unit.code })}
            className="size-32"
          />
        ) : (
          <span className="text-sm text-act">{t('setup.labels.failed')}</span>
        )}
      </div>
      <div className="min-w-0 flex-1">
        <p className="text-4xl font-bold leading-none">{unit.code}</p>
        <p className="mt-1 text-lg">{unit.name}</p>
        <p className="mt-1 text-sm text-muted">{t('setup.labels.scan')}</p>
        {labelPageHref ? (
          <Link to={labelPageHref} className="gw-link gw-no-print mt-2 inline-block text-base">
            {t('setup.labels.open')}
          </Link>
        ) : null}
      </div>
    </li>
  );
}

/** QR labels for the units: scanning one opens the pondside test of that unit. */
export function LabelsPanel({ farmId, labelPageHref }: { farmId: string; labelPageHref: (unitId: string) => string | null }) {
  const { t } = useTranslation();
  const units = useQuery(setupQueries.units(farmId));
  if (units.isPending) return <Spinner label={t('setup.loading')} />;
  if (units.isError)
    return (
      <Callout tone="danger" title={t('setup.loadFailed')}>
        {requestErrorText(t, units.error)}
      </Callout>
    );
  const list = [...units.data].sort((a, b) => a.walkOrder - b.walkOrder || a.code.localeCompare(b.code));
  return (
    <div className="flex flex-col gap-4" data-testid="labels-panel">
      <style>{printCss}</style>
      <div className="gw-no-print flex flex-wrap items-center gap-3">
        <p className="max-w-prose flex-1 text-base text-muted">{t('setup.labels.intro')}</p>
        <Button variant="primary" onClick={() => window.print()} icon={<Icon name="report" />}>
          {t('setup.labels.print')}
        </Button>
      </div>
      <ul className="gw-labels grid gap-3 md:grid-cols-2 2xl:grid-cols-3">
        {list.map((u) => (
          <LabelCard key={u.id} farmId={farmId} unit={u} labelPageHref={labelPageHref(u.id)} />
        ))}
      </ul>
    </div>
  );
}
