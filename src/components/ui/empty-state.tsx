import type { ReactNode } from 'react';
import { cx } from './cx';
import { Icon, type IconName } from './icon';

export interface EmptyStateProps {
  title: ReactNode;
  children?: ReactNode;
  icon?: IconName;
  action?: ReactNode;
  className?: string;
}

export function EmptyState({ title, children, icon = 'info', action, className }: EmptyStateProps) {
  return (
    <div
      className={cx(
        'flex flex-col items-center gap-3 rounded-2xl border-2 border-dashed border-line bg-card px-6 py-10 text-center',
        className,
      )}
    >
      <span className="grid size-16 place-items-center rounded-full bg-abyss-50 text-abyss-700">
        <Icon name={icon} size={32} />
      </span>
      <h2 className="text-xl font-bold text-ink">{title}</h2>
      {children ? <div className="max-w-prose text-base text-muted">{children}</div> : null}
      {action ? <div className="mt-2">{action}</div> : null}
    </div>
  );
}
