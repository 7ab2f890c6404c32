import { useEffect, useId, useRef, type ReactNode } from 'react';
import { useTranslation } from 'react-i18next';
import { Button } from './button';
import { cx } from './cx';
import { Icon } from './icon';

type Placement = 'center' | 'bottom' | 'right' | 'left';

interface ModalProps {
  open: boolean;
  onClose: () => void;
  title: ReactNode;
  /** Optional line under the title. */
  description?: ReactNode;
  children?: ReactNode;
  /** Buttons along the bottom edge. */
  footer?: ReactNode;
  className?: string;
}

const placements: Record<Placement, string> = {
  center: 'm-auto w-[min(36rem,calc(100vw-2rem))] max-h-[calc(100dvh-2rem)] rounded-2xl',
  bottom:
    'mt-auto mb-0 mx-0 w-full max-w-none max-h-[85dvh] rounded-t-2xl pb-[env(safe-area-inset-bottom)] sm:mx-auto sm:max-w-xl',
  right: 'ml-auto mr-0 my-0 h-dvh max-h-none w-[min(24rem,100vw)] rounded-l-2xl',
  left: 'mr-auto ml-0 my-0 h-dvh max-h-none w-[min(24rem,100vw)] rounded-r-2xl',
};

/**
 * Built on the native <dialog> element: showModal() gives focus trapping, Escape to close and an
 * inert page behind it; focus returns to the opener on close.
 */
function Modal({ open, onClose, title, description, children, footer, className, placement }: ModalProps & { placement: Placement }) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  const descId = useId();
  const { t } = useTranslation();

  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    if (open && !el.open) {
      if (typeof el.showModal === 'function') el.showModal();
      else el.setAttribute('open', '');
    } else if (!open && el.open) {
      if (typeof el.close === 'function') el.close();
      else el.removeAttribute('open');
    }
  }, [open]);

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      aria-describedby={description ? descId : undefined}
      onCancel={(e) => {
        e.preventDefault();
        onClose();
      }}
      onClick={(e) => {
        // A click on the backdrop lands on the <dialog> itself.
        if (e.target === e.currentTarget) onClose();
      }}
      className={cx(
        'gw-modal flex-col overflow-hidden border-0 bg-card p-0 text-ink shadow-2xl open:flex',
        placements[placement],
        className,
      )}
    >
      <div className="flex items-start gap-3 border-b-2 border-line px-5 py-4">
        <div className="min-w-0 flex-1">
          <h2 id={titleId} className="text-xl font-bold">
            {title}
          </h2>
          {description ? (
            <p id={descId} className="mt-1 text-base text-muted">
              {description}
            </p>
          ) : null}
        </div>
        <Button variant="ghost" size="icon" onClick={onClose} aria-label={t('common.close')}>
          <Icon name="close" />
        </Button>
      </div>
      <div className="flex-1 overflow-y-auto px-5 py-4">{children}</div>
      {footer ? <div className="flex flex-wrap justify-end gap-3 border-t-2 border-line px-5 py-4">{footer}</div> : null}
    </dialog>
  );
}

export type DialogProps = ModalProps;

export function Dialog(props: DialogProps) {
  return <Modal {...props} placement="center" />;
}

export interface SheetProps extends ModalProps {
  /** Where the sheet slides from; phones usually want 'bottom'. */
  side?: 'bottom' | 'right' | 'left';
}

export function Sheet({ side = 'bottom', ...props }: SheetProps) {
  return <Modal {...props} placement={side} />;
}
