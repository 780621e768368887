import { useEffect, useId, useRef, type ReactNode } from 'react';
import { cn } from '@/lib/cn';

export interface DialogProps {
  open: boolean;
  onClose: () => void;
  title: ReactNode;
  description?: ReactNode;
  children: ReactNode;
  /** Buttons along the bottom; put the main action last. */
  footer?: ReactNode;
  className?: string;
}

/**
 * A modal built on the native <dialog>: the browser traps focus, closes on Escape and
 * returns focus to whatever opened it, so we do not re-implement any of that.
 */
export function Dialog({ open, onClose, title, description, children, footer, className }: DialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  const descriptionId = useId();

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (open && !dialog.open) dialog.showModal();
    if (!open && dialog.open) dialog.close();
  }, [open]);

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      aria-describedby={description ? descriptionId : undefined}
      onClose={onClose}
      onCancel={(event) => {
        event.preventDefault();
        onClose();
      }}
      onClick={(event) => {
        // A click on the backdrop lands on the <dialog> element itself.
        if (event.target === ref.current) onClose();
      }}
      className={cn(
        // text-left: a dialog opened from a right-aligned table cell must not inherit its alignment.
        'm-auto w-[min(32rem,calc(100vw-2rem))] rounded-panel border border-ink-hairline bg-paper-raised p-0 text-left text-ink shadow-lift',
        'backdrop:bg-ink-strong/50',
        className,
      )}
    >
      {open ? (
        <div className="flex flex-col">
          <div className="flex items-start justify-between gap-4 border-b border-ink-hairline px-5 py-4">
            <div>
              <h2 id={titleId} className="text-lg font-semibold text-ink-strong">
                {title}
              </h2>
              {description ? (
                <p id={descriptionId} className="mt-1 text-sm text-ink-muted">
                  {description}
                </p>
              ) : null}
            </div>
            <button type="button" onClick={onClose} className="focus-ring -m-1 rounded-control p-1.5 text-ink-muted hover:bg-paper-sunken" aria-label="Close">
              <svg aria-hidden="true" viewBox="0 0 20 20" className="size-5" fill="none" stroke="currentColor" strokeWidth="2">
                <path d="M5 5l10 10M15 5L5 15" strokeLinecap="round" />
              </svg>
            </button>
          </div>
          <div className="px-5 py-4">{children}</div>
          {footer ? <div className="flex justify-end gap-2 border-t border-ink-hairline px-5 py-3">{footer}</div> : null}
        </div>
      ) : null}
    </dialog>
  );
}
