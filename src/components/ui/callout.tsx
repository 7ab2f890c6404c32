import type { ReactNode } from 'react';
import { cx } from './cx';
import { Icon, type IconName } from './icon';

export type CalloutTone = 'info' | 'caution' | 'danger' | 'success';

const tones: Record<CalloutTone, { box: string; icon: IconName }> = {
  info: { box: 'border-abyss-600 bg-abyss-50 text-ink', icon: 'info' },
  caution: { box: 'border-ember-600 bg-ember-50 text-ink', icon: 'caution' },
  danger: { box: 'border-act bg-act-soft text-act-ink', icon: 'caution' },
  success: { box: 'border-clear bg-clear-soft text-clear-ink', icon: 'check' },
};

export interface CalloutProps {
  tone?: CalloutTone;
  title?: ReactNode;
  children?: ReactNode;
  /** Announce when it appears (form errors, results). Static cautions leave this off. */
  live?: boolean;
  className?: string;
  id?: string;
}

/** A boxed message: cautions, form-level errors, confirmations. */
export function Callout({ tone = 'info', title, children, live, className, id }: CalloutProps) {
  const { box, icon } = tones[tone];
  return (
    <div
      id={id}
      role={live ? (tone === 'danger' ? 'alert' : 'status') : undefined}
      className={cx('flex gap-3 rounded-xl border-2 border-l-8 px-4 py-3', box, className)}
    >
      <Icon name={icon} size={26} className="mt-0.5 shrink-0" />
      <div className="min-w-0 flex-1 space-y-1">
        {title ? <p className="text-lg font-bold">{title}</p> : null}
        {children ? <div className="text-base leading-relaxed">{children}</div> : null}
      </div>
    </div>
  );
}

export { Callout as Alert };
