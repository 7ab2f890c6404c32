import {
  createCalibrationRequestSchema,
  type CalibrationDto,
  type CreateCalibrationRequest,
  type ProbeDto,
} from '@shared/schemas/probes.schema';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { Callout } from '@/components/ui/callout';
import { cx } from '@/components/ui/cx';
import { NumberField, Select, TextField } from '@/components/ui/field';
import { Spinner } from '@/components/ui/spinner';
import { requestErrorText } from '@/lib/form-errors';
import { useAddCalibration } from '../../api/setup-mutations';
import { setupQueries } from '../../api/setup-queries';
import { numberOrNull, textOrNull } from '../../lib/form';
import { farmDate, farmLocalToIso } from '../../lib/time';

type Kind = 'ph' | 'standard' | 'check';
const kindOf = (q: string): Kind =>
  q === 'ph' ? 'ph' : q === 'conductivity' || q === 'specific_conductance' || q === 'salinity' ? 'standard' : 'check';
const calibratable = [
  'ph',
  'conductivity',
  'specific_conductance',
  'salinity',
  'dissolved_oxygen',
  'water_temperature',
  'flow',
  'water_level',
];

function summary(c: CalibrationDto, t: (k: string, o?: Record<string, unknown>) => string): string {
  const d = c.details;
  if (typeof d.slopePct === 'number' && typeof d.offsetMv === 'number')
    return t('setup.cal.phSummary', { slope: d.slopePct, offset: d.offsetMv });
  if (typeof d.errorPct === 'number') return t('setup.cal.standardSummary', { error: d.errorPct });
  return c.method;
}

/** Calibration records of one probe, their due dates, and a form to record a new one (pH slope from two buffers). */
export function Calibrations({
  farmId,
  probe,
  timeZone,
  canEdit,
}: {
  farmId: string;
  probe: ProbeDto;
  timeZone: string;
  canEdit: boolean;
}) {
  const { t, i18n } = useTranslation();
  const list = useQuery(setupQueries.calibrations(farmId, probe.id));
  const add = useAddCalibration(farmId, probe.id);
  const options = probe.quantities.filter((q) => calibratable.includes(q));
  const [quantity, setQuantity] = useState(options[0] ?? 'ph');
  const [f, setF] = useState<Record<string, string>>({ b1ph: '7.00', b2ph: '4.01', temp: '25' });
  const [passed, setPassed] = useState(true);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [open, setOpen] = useState(false);
  const set = (k: string) => (e: React.ChangeEvent<HTMLInputElement>) => setF((p) => ({ ...p, [k]: e.target.value }));
  const kind = kindOf(quantity);
  const now = Date.now();

  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    const performedAt = f.performedAt ? (farmLocalToIso(f.performedAt, timeZone) ?? undefined) : undefined;
    const common = { performedAt, note: textOrNull(f.note), method: textOrNull(f.method) ?? undefined };
    const body =
      kind === 'ph'
        ? {
            quantity: 'ph',
            buffers: [
              { pH: numberOrNull(f.b1ph), mV: numberOrNull(f.b1mv) },
              { pH: numberOrNull(f.b2ph), mV: numberOrNull(f.b2mv) },
            ],
            temperatureC: numberOrNull(f.temp) ?? 25,
            ...common,
          }
        : kind === 'standard'
          ? { quantity, standard: numberOrNull(f.standard), reading: numberOrNull(f.reading), ...common }
          : { quantity, passed, details: {}, ...common };
    const parsed = createCalibrationRequestSchema.safeParse(body);
    if (!parsed.success) {
      const next: Record<string, string> = {};
      for (const issue of parsed.error.issues) {
        const [a, b, c] = issue.path;
        const key = a === 'buffers' ? `b${Number(b) + 1}${c === 'pH' ? 'ph' : 'mv'}` : a === 'temperatureC' ? 'temp' : String(a);
        next[key] ??= t('setup.cal.invalid');
      }
      setErrors(next);
      return;
    }
    setErrors({});
    try {
      await add.mutateAsync(parsed.data as CreateCalibrationRequest);
      setOpen(false);
      setF({ b1ph: '7.00', b2ph: '4.01', temp: '25' });
    } catch {
      /* shown below */
    }
  };

  return (
    <section className="flex flex-col gap-3" aria-label={t('setup.cal.title')}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h4 className="text-lg font-bold">{t('setup.cal.title')}</h4>
        {canEdit && options.length > 0 && !open ? (
          <Button variant="secondary" onClick={() => setOpen(true)}>
            {t('setup.cal.add')}
          </Button>
        ) : null}
      </div>
      {list.isPending ? (
        <Spinner label={t('setup.loading')} />
      ) : list.data && list.data.length > 0 ? (
        <ul className="flex flex-col gap-1" data-testid="calibration-list">
          {list.data.map((c) => {
            const overdue = Date.parse(c.nextDueAt) < now;
            return (
              <li
                key={c.id}
                className="flex flex-wrap items-baseline gap-x-3 gap-y-0.5 border-b border-line py-1.5 text-base last:border-b-0"
              >
                <span className="font-bold">{t(`setup.quantity.${c.quantity}`, { defaultValue: c.quantity })}</span>
                <span>{farmDate(c.performedAt, timeZone, i18n.language)}</span>
                <span className={c.passed ? 'text-clear-ink' : 'font-bold text-act'}>
                  <span aria-hidden="true">{c.passed ? '● ' : '◆ '}</span>
                  {c.passed ? t('setup.cal.passed') : t('setup.cal.failed')}
                </span>
                <span className="text-muted">{summary(c, t)}</span>
                <span className={cx('ml-auto', overdue ? 'font-bold text-act' : 'text-muted')}>
                  {t(overdue ? 'setup.cal.overdue' : 'setup.cal.due', { date: farmDate(c.nextDueAt, timeZone, i18n.language) })}
                </span>
              </li>
            );
          })}
        </ul>
      ) : (
        <p className="text-base text-muted">{t('setup.cal.none')}</p>
      )}
      {open ? (
        <form
          onSubmit={(e) => void submit(e)}
          noValidate
          className="flex flex-col gap-3 rounded-xl border-2 border-line bg-paper p-3"
          data-testid="calibration-form"
        >
          <Select
            label={t('setup.cal.quantity')}
            options={options.map((q) => ({ value: q, label: t(`setup.quantity.${q}`) }))}
            value={quantity}
            onChange={(e) => setQuantity(e.target.value as typeof quantity)}
          />
          {kind === 'ph' ? (
            <>
              <p className="text-sm text-muted">{t('setup.cal.phHint')}</p>
              <div className="grid grid-cols-2 gap-3">
                <NumberField label={t('setup.cal.buffer1')} unit="pH" value={f.b1ph ?? ''} onChange={set('b1ph')} error={errors.b1ph} />
                <NumberField label={t('setup.cal.mv')} unit="mV" value={f.b1mv ?? ''} onChange={set('b1mv')} error={errors.b1mv} />
                <NumberField label={t('setup.cal.buffer2')} unit="pH" value={f.b2ph ?? ''} onChange={set('b2ph')} error={errors.b2ph} />
                <NumberField label={t('setup.cal.mv')} unit="mV" value={f.b2mv ?? ''} onChange={set('b2mv')} error={errors.b2mv} />
              </div>
              <NumberField label={t('setup.cal.temperature')} unit="°C" value={f.temp ?? ''} onChange={set('temp')} error={errors.temp} />
              {errors.buffers ? <p className="font-bold text-act">{t('setup.cal.buffersApart')}</p> : null}
            </>
          ) : kind === 'standard' ? (
            <div className="grid grid-cols-2 gap-3">
              <NumberField label={t('setup.cal.standard')} value={f.standard ?? ''} onChange={set('standard')} error={errors.standard} />
              <NumberField label={t('setup.cal.reading')} value={f.reading ?? ''} onChange={set('reading')} error={errors.reading} />
            </div>
          ) : (
            <label className="flex items-center gap-3 text-base">
              <input type="checkbox" className="size-5 accent-abyss-700" checked={passed} onChange={(e) => setPassed(e.target.checked)} />
              {t('setup.cal.passedCheck')}
            </label>
          )}
          <TextField
            label={t('setup.cal.performedAt')}
            hint={t('setup.cal.performedAtHint')}
            type="datetime-local"
            value={f.performedAt ?? ''}
            onChange={set('performedAt')}
          />
          <TextField label={t('setup.cal.note')} value={f.note ?? ''} onChange={set('note')} />
          {add.error ? (
            <Callout tone="danger" live title={t('setup.cal.saveFailed')}>
              {requestErrorText(t, add.error)}
            </Callout>
          ) : null}
          <div className="flex flex-wrap justify-end gap-2">
            <Button variant="ghost" onClick={() => setOpen(false)}>
              {t('setup.cancel')}
            </Button>
            <Button type="submit" variant="primary" loading={add.isPending}>
              {t('setup.cal.save')}
            </Button>
          </div>
        </form>
      ) : null}
    </section>
  );
}
