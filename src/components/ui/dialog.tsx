import { useEffect, useId, useRef, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { Button } from './button';

/**
 * A modal on <dialog>: the browser traps focus and returns it to the opener; Escape and the close button call
 * onClose. `actions` are the dialog's own buttons, each saying what it does. The body describes the dialog to
 * screen readers.
 */
export function Dialog({
  open,
  title,
  children,
  actions,
  onClose,
  closeLabel = 'Close',
  closeDisabled = false,
  closeAutoFocus = false,
  size = 'wide',
}: {
  open: boolean;
  title: ReactNode;
  children?: ReactNode;
  actions?: ReactNode;
  onClose: () => void;
  closeLabel?: string;
  closeDisabled?: boolean;
  /** Focus the close button on opening (for a question whose other answer should not be one key press away). */
  closeAutoFocus?: boolean;
  size?: 'narrow' | 'wide';
}) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  const bodyId = useId();
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
      aria-describedby={bodyId}
      onCancel={(event) => {
        event.preventDefault();
        onClose();
      }}
      className={cn(
        'm-auto rounded-2xl border border-foil-600 bg-night-900 p-0 text-foil-100 shadow-2xl backdrop:bg-night-950/80',
        size === 'narrow' ? 'w-[min(28rem,calc(100vw-2rem))]' : 'w-[min(32rem,calc(100vw-2rem))]',
      )}
    >
      <div className="space-y-4 p-6">
        <h2 id={titleId} className="text-lg font-bold text-foil-50">
          {title}
        </h2>
        <div id={bodyId} className="space-y-3 text-sm text-foil-200">
          {children}
        </div>
        <div className="flex flex-wrap justify-end gap-2 pt-2">
          <Button variant="ghost" onClick={onClose} disabled={closeDisabled} autoFocus={closeAutoFocus}>
            {closeLabel}
          </Button>
          {actions}
        </div>
      </div>
    </dialog>
  );
}
