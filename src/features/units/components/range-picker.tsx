import { useTranslation } from 'react-i18next';
import { cx } from '@/components/ui/cx';
import { chartRanges, type ChartRange } from '../lib/ranges';

/** 24 h / 7 d / 30 d / 90 d, as a group of toggle buttons. */
export function RangePicker({ value, onChange }: { value: ChartRange; onChange: (r: ChartRange) => void }) {
  const { t } = useTranslation();
  return (
    <div
      role="group"
      aria-label={t('units.range.label')}
      className="inline-flex rounded-xl border-2 border-abyss-700 bg-card p-0.5"
      data-testid="range-picker"
    >
      {chartRanges.map((r) => (
        <button
          key={r}
          type="button"
          aria-pressed={value === r}
          onClick={() => onChange(r)}
          className={cx(
            'min-h-11 min-w-14 rounded-lg px-3 text-base font-bold',
            value === r ? 'bg-abyss-700 text-white' : 'text-abyss-900 hover:bg-abyss-50',
          )}
        >
          <span aria-hidden="true">{t(`units.range.short.${r}`)}</span>
          <span className="sr-only">{t(`units.range.long.${r}`)}</span>
        </button>
      ))}
    </div>
  );
}
