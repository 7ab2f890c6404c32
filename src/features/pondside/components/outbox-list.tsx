import { analyteRules, analytes, type Analyte } from '@shared/schemas/water-tests.schema';
import { useTranslation } from 'react-i18next';
import { Button } from '@/components/ui/button';
import { cx } from '@/components/ui/cx';
import { Icon } from '@/components/ui/icon';
import { farmDateTime, formatNumber } from '../lib/format';
import { outbox, type OutboxEntry } from '../lib/outbox';
import { entryErrorText } from './test-result';

const isAnalyte = (v: unknown): v is Analyte => typeof v === 'string' && (analytes as readonly string[]).includes(v);

function EntryText({ entry }: { entry: OutboxEntry }) {
  const { t, i18n } = useTranslation();
  const b = entry.body;
  if (entry.kind === 'water-test' && isAnalyte(b.analyte) && typeof b.value === 'number') {
    return (
      <>
        {t(`pondside.analyte.${b.analyte}`)} {formatNumber(b.value, i18n.language, 3)} {analyteRules[b.analyte].unit}
        {b.aeratorOn === true ? ` · ${t('pondside.outbox.aeratorOn')}` : ''}
      </>
    );
  }
  if (entry.kind === 'observation' && typeof b.kind === 'string') return <>{t(`observations.kind.${b.kind}`, { defaultValue: b.kind })}</>;
  return <>{entry.kind}</>;
}

const stateStyle = {
  waiting: { glyph: '◔', cls: 'border-ember-600 bg-ember-50 text-ink' },
  'signed-out': { glyph: '◔', cls: 'border-ember-600 bg-ember-50 text-ink' },
  rejected: { glyph: '◆', cls: 'border-act bg-act-soft text-act-ink' },
} as const;

export interface OutboxListProps {
  entries: readonly OutboxEntry[];
  timeZone: string;
  /** Offer "Fix" for refused kit results (the pondside form opens with the entry). */
  onFix?: ((entry: OutboxEntry) => void) | undefined;
  title?: string;
  className?: string;
}

/** Entries still on this phone: waiting for a signal, for a sign-in, or refused and waiting to be fixed. */
export function OutboxList({ entries, timeZone, onFix, title, className }: OutboxListProps) {
  const { t, i18n } = useTranslation();
  if (!entries.length) return null;
  const waiting = entries.filter((e) => e.state !== 'rejected').length;
  return (
    <section
      aria-labelledby="outbox-title"
      className={cx('gw-card flex flex-col gap-3 border-ember-600 px-4 py-3', className)}
      data-testid="outbox"
    >
      <h2 id="outbox-title" className="flex items-center gap-2 text-lg font-bold">
        <Icon name="upload" />
        {title ?? t('pondside.outbox.title', { count: entries.length })}
      </h2>
      {waiting ? <p className="text-base">{t('pondside.outbox.explain')}</p> : null}
      {!outbox.persistent ? <p className="text-base font-bold text-act">{t('pondside.outbox.notPersistent')}</p> : null}
      <ul className="flex flex-col gap-2">
        {entries.map((e) => {
          const s = stateStyle[e.state];
          return (
            <li key={e.id} className={cx('flex flex-col gap-2 rounded-xl border-2 px-3 py-2', s.cls)} data-outbox-state={e.state}>
              <div className="flex flex-wrap items-baseline gap-x-3">
                <span className="text-lg font-bold">{e.unitCode}</span>
                <span className="text-base">
                  <EntryText entry={e} />
                </span>
                <span className="text-sm text-muted">{farmDateTime(e.createdAt, timeZone, i18n.language)}</span>
              </div>
              <p className="flex items-start gap-2 text-base font-bold">
                <span aria-hidden="true">{s.glyph}</span>
                <span>
                  {e.state === 'waiting'
                    ? t('pondside.outbox.waiting')
                    : e.state === 'signed-out'
                      ? t('pondside.outbox.signedOut')
                      : `${t('pondside.outbox.refused')} ${entryErrorText(t, e)}`}
                </span>
              </p>
              {e.state === 'rejected' ? (
                <div className="flex flex-wrap gap-2">
                  {onFix && e.kind === 'water-test' ? (
                    <Button variant="primary" onClick={() => onFix(e)}>
                      {t('pondside.outbox.fix')}
                    </Button>
                  ) : null}
                  <Button variant="secondary" onClick={() => void outbox.discard(e.id)}>
                    {t('pondside.outbox.discard')}
                  </Button>
                </div>
              ) : null}
            </li>
          );
        })}
      </ul>
    </section>
  );
}
