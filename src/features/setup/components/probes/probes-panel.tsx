import type { ProbeCredentialResponse, ProbeDto, ProbeFinding } from '@shared/schemas/probes.schema';
import type { UnitDto } from '@shared/schemas/units.schema';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { Dialog } from '@/components/ui/dialog';
import { EmptyState } from '@/components/ui/empty-state';
import { Icon } from '@/components/ui/icon';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { useCreateProbe, useDeactivateProbe, useRotateCredential, useUpdateProbe } from '../../api/setup-mutations';
import { setupQueries } from '../../api/setup-queries';
import { farmDate, farmDateTime } from '../../lib/time';
import { Calibrations } from './calibrations';
import { Maintenance } from './maintenance';
import { ProbeForm } from './probe-form';
import { SecretDialog } from './secret-dialog';

const stateLook: Record<ProbeDto['health']['state'], { glyph: string; className: string }> = {
  ok: { glyph: '●', className: 'border-clear bg-clear-soft text-clear-ink' },
  attention: { glyph: '▲', className: 'border-watch bg-watch-soft text-watch-ink' },
  silent: { glyph: '○', className: 'border-dashed border-silent bg-silent-soft text-silent-ink' },
  maintenance: { glyph: '◐', className: 'border-abyss-600 bg-abyss-50 text-abyss-900' },
  inactive: { glyph: '–', className: 'border-line bg-paper text-muted' },
};

function Finding({ f, timeZone }: { f: ProbeFinding; timeZone: string }) {
  const { t, i18n } = useTranslation();
  const l = i18n.language;
  const q = 'quantity' in f ? t(`setup.quantity.${f.quantity}`) : '';
  switch (f.kind) {
    case 'silent':
      return (
        <>
          {f.lastReadingAt
            ? t('setup.finding.silent', { time: farmDateTime(f.lastReadingAt, timeZone, l) })
            : t('setup.finding.neverReported')}
        </>
      );
    case 'maintenance':
      return <>{t('setup.finding.maintenance', { reason: f.reason, time: farmDateTime(f.endsAt, timeZone, l) })}</>;
    case 'flatline':
      return <>{t('setup.finding.flatline', { quantity: q, value: f.value, minutes: Math.round(f.minutes) })}</>;
    case 'spike':
      return <>{t('setup.finding.spike', { quantity: q, count: f.suspectCount })}</>;
    case 'drift':
      return <>{t('setup.finding.drift', { quantity: q, diff: Math.round(f.meanDifference * 100) / 100, pairs: f.pairs })}</>;
    case 'calibration_due':
      return (
        <>
          {f.nextDueAt
            ? t('setup.finding.calibrationDue', { quantity: q, date: farmDate(f.nextDueAt, timeZone, l) })
            : t('setup.finding.neverCalibrated', { quantity: q })}
        </>
      );
  }
}

function ProbeCard({
  farmId,
  probe,
  unit,
  units,
  timeZone,
  canEdit,
  onCredential,
}: {
  farmId: string;
  probe: ProbeDto;
  unit: UnitDto | undefined;
  units: readonly UnitDto[];
  timeZone: string;
  canEdit: boolean;
  onCredential: (c: ProbeCredentialResponse) => void;
}) {
  const { t, i18n } = useTranslation();
  const [expanded, setExpanded] = useState(false);
  const [editing, setEditing] = useState(false);
  const [confirm, setConfirm] = useState<'rotate' | 'deactivate' | null>(null);
  const rotate = useRotateCredential(farmId);
  const deactivate = useDeactivateProbe(farmId);
  const update = useUpdateProbe(farmId);
  const look = stateLook[probe.health.state];
  const pending = rotate.isPending || deactivate.isPending;

  return (
    <li
      className={cx('gw-card flex flex-col gap-3 p-4', expanded && 'lg:col-span-2')}
      data-testid="probe-card"
      data-probe-key={probe.probeKey}
    >
      <div className="flex flex-wrap items-start gap-3">
        <div className="min-w-0 flex-1">
          <h3 className="text-lg font-bold leading-tight">{probe.label}</h3>
          <p className="text-base text-muted">
            {unit ? `${unit.code} — ${unit.name}` : t('setup.probe.noUnit')}
            {probe.model ? ` · ${probe.model}` : ''}
          </p>
          <p className="font-mono text-sm text-muted">{probe.probeKey}</p>
        </div>
        <span
          className={cx(
            'inline-flex items-center gap-1.5 rounded-full border-2 px-3 py-1 text-sm font-bold uppercase tracking-wide',
            look.className,
          )}
          data-testid="probe-state"
        >
          <span aria-hidden="true">{look.glyph}</span>
          {t(`setup.probe.state.${probe.health.state}`)}
        </span>
      </div>
      <div className="flex flex-wrap gap-1.5">
        {probe.quantities.map((q) => (
          <span key={q} className="rounded-full bg-abyss-50 px-2.5 py-0.5 text-sm font-bold text-abyss-900">
            {t(`setup.quantity.${q}`)}
          </span>
        ))}
      </div>
      <p className="text-sm text-muted">
        {t('setup.probe.every', { seconds: probe.intervalSeconds })}
        {' · '}
        {(probe.lastSeenAt ?? probe.health.lastReadingAt)
          ? t('setup.probe.lastSeen', { time: farmDateTime((probe.lastSeenAt ?? probe.health.lastReadingAt)!, timeZone, i18n.language) })
          : t('setup.probe.neverSeen')}
        {probe.batteryPct !== null ? ` · ${t('setup.probe.battery', { pct: Math.round(probe.batteryPct) })}` : ''}
        {' · '}
        {t('setup.probe.secretSince', { date: farmDate(probe.secretRotatedAt, timeZone, i18n.language) })}
      </p>
      {probe.health.findings.length > 0 ? (
        <ul className="flex flex-col gap-1 rounded-xl border-2 border-watch bg-watch-soft px-3 py-2 text-base text-watch-ink">
          {probe.health.findings.map((f, i) => (
            <li key={`${f.kind}-${i}`} className="flex gap-2">
              <span aria-hidden="true">▲</span>
              <span>
                <Finding f={f} timeZone={timeZone} />
              </span>
            </li>
          ))}
        </ul>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button variant="secondary" onClick={() => setExpanded((v) => !v)} aria-expanded={expanded}>
          {t('setup.probe.calMaint')}
        </Button>
        {canEdit ? (
          <>
            <Button variant="ghost" onClick={() => setEditing(true)}>
              {t('setup.probe.edit')}
            </Button>
            {probe.active ? (
              <>
                <Button variant="ghost" onClick={() => setConfirm('rotate')} loading={rotate.isPending}>
                  {t('setup.probe.rotate')}
                </Button>
                <Button variant="ghost" onClick={() => setConfirm('deactivate')} loading={deactivate.isPending}>
                  {t('setup.probe.deactivate')}
                </Button>
              </>
            ) : (
              <Button
                variant="ghost"
                loading={update.isPending}
                onClick={() => update.mutate({ probeId: probe.id, body: { active: true } })}
              >
                {t('setup.probe.reactivate')}
              </Button>
            )}
          </>
        ) : null}
      </div>
      {rotate.error || deactivate.error || update.error ? (
        <Callout tone="danger" live title={t('setup.probe.actionFailed')}>
          {requestErrorText(t, rotate.error ?? deactivate.error ?? update.error)}
        </Callout>
      ) : null}
      {expanded ? (
        <div className="grid gap-4 border-t-2 border-line pt-3 lg:grid-cols-2">
          <Calibrations farmId={farmId} probe={probe} timeZone={timeZone} canEdit={canEdit} />
          <Maintenance farmId={farmId} probe={probe} timeZone={timeZone} canEdit={canEdit} />
        </div>
      ) : null}

      <Dialog open={editing} onClose={() => setEditing(false)} title={t('setup.probe.editTitle', { label: probe.label })}>
        {editing ? (
          <ProbeForm
            units={units}
            probe={probe}
            pending={update.isPending}
            error={update.error}
            submitLabel={t('setup.probe.save')}
            onCancel={() => setEditing(false)}
            onSubmit={async (body) => {
              await update.mutateAsync({ probeId: probe.id, body });
              setEditing(false);
            }}
          />
        ) : null}
      </Dialog>

      <Dialog
        open={confirm !== null}
        onClose={() => setConfirm(null)}
        title={
          confirm === 'rotate'
            ? t('setup.probe.rotateTitle', { label: probe.label })
            : t('setup.probe.deactivateTitle', { label: probe.label })
        }
        description={confirm === 'rotate' ? t('setup.probe.rotateBody') : t('setup.probe.deactivateBody')}
        footer={
          <>
            <Button variant="ghost" onClick={() => setConfirm(null)}>
              {t('setup.cancel')}
            </Button>
            <Button
              variant="danger"
              loading={pending}
              onClick={() => {
                const which = confirm;
                setConfirm(null);
                if (which === 'rotate')
                  rotate.mutate(
                    { probeId: probe.id },
                    {
                      onSuccess: (c) => {
                        onCredential(c);
                        rotate.reset();
                      },
                    },
                  );
                else deactivate.mutate({ probeId: probe.id });
              }}
            >
              {confirm === 'rotate' ? t('setup.probe.rotateConfirm') : t('setup.probe.deactivateConfirm')}
            </Button>
          </>
        }
      />
    </li>
  );
}

/** Probes: what each measures and where; new ones get a key and a secret shown once. */
export function ProbesPanel({ farmId, timeZone, canEdit }: { farmId: string; timeZone: string; canEdit: boolean }) {
  const { t } = useTranslation();
  const probes = useQuery(setupQueries.probes(farmId));
  const units = useQuery(setupQueries.units(farmId));
  const create = useCreateProbe(farmId);
  const [adding, setAdding] = useState(false);
  const [credential, setCredential] = useState<{ value: ProbeCredentialResponse; reason: 'created' | 'rotated' } | null>(null);
  const unitList = [...(units.data ?? [])].sort((a, b) => a.walkOrder - b.walkOrder);
  const byId = new Map(unitList.map((u) => [u.id, u]));

  if (probes.isPending || units.isPending) return <Spinner label={t('setup.loading')} />;
  if (probes.isError)
    return (
      <Callout tone="danger" title={t('setup.loadFailed')}>
        {requestErrorText(t, probes.error)}
      </Callout>
    );

  const list = [...probes.data].sort(
    (a, b) =>
      Number(b.active) - Number(a.active) ||
      (byId.get(a.unitId ?? '')?.walkOrder ?? 1e9) - (byId.get(b.unitId ?? '')?.walkOrder ?? 1e9) ||
      a.label.localeCompare(b.label),
  );

  return (
    <div className="flex flex-col gap-4" data-testid="probes-panel">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <p className="max-w-prose text-base text-muted">{t('setup.probe.intro')}</p>
        {canEdit && !adding ? (
          <Button variant="accent" onClick={() => setAdding(true)} icon={<Icon name="tube" />}>
            {t('setup.probe.add')}
          </Button>
        ) : null}
      </div>
      {adding ? (
        <div className="gw-card p-4">
          <h2 className="mb-3 text-xl font-bold">{t('setup.probe.newTitle')}</h2>
          <ProbeForm
            units={unitList}
            pending={create.isPending}
            error={create.error}
            submitLabel={t('setup.probe.create')}
            onCancel={() => setAdding(false)}
            onSubmit={async (body) => {
              const answer = await create.mutateAsync(body);
              setAdding(false);
              create.reset();
              setCredential({ value: answer, reason: 'created' });
            }}
          />
        </div>
      ) : null}
      {list.length === 0 ? (
        <EmptyState icon="tube" title={t('setup.probe.emptyTitle')}>
          {t('setup.probe.emptyBody')}
        </EmptyState>
      ) : (
        <ul className="grid gap-3 lg:grid-cols-2" data-testid="probe-list">
          {list.map((p) => (
            <ProbeCard
              key={p.id}
              farmId={farmId}
              probe={p}
              unit={p.unitId ? byId.get(p.unitId) : undefined}
              units={unitList}
              timeZone={timeZone}
              canEdit={canEdit}
              onCredential={(c) => setCredential({ value: c, reason: 'rotated' })}
            />
          ))}
        </ul>
      )}
      <SecretDialog credential={credential?.value ?? null} reason={credential?.reason ?? 'created'} onClose={() => setCredential(null)} />
    </div>
  );
}
