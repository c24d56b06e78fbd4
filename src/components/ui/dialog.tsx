import { useEffect, useId, useRef, type ReactNode } from 'react';
import { Button } from './button';

/**
 * A modal on <dialog>: the browser traps focus and returns it to the opener; Escape and the close button call
 * onClose. `actions` are the dialog's own buttons, each saying what it does.
 */
export function Dialog({
  open,
  title,
  children,
  actions,
  onClose,
  closeLabel = 'Close',
}: {
  open: boolean;
  title: ReactNode;
  children?: ReactNode;
  actions?: ReactNode;
  onClose: () => void;
  closeLabel?: string;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
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
      onCancel={(event) => {
        event.preventDefault();
        onClose();
      }}
      className="m-auto w-[min(32rem,calc(100vw-2rem))] rounded-2xl border border-foil-600 bg-night-900 p-0 text-foil-100 shadow-2xl backdrop:bg-night-950/80"
    >
      <div className="space-y-4 p-6">
        <h2 id={titleId} className="text-lg font-bold text-foil-50">
          {title}
        </h2>
        <div className="space-y-3 text-sm text-foil-200">{children}</div>
        <div className="flex flex-wrap justify-end gap-2 pt-2">
          <Button variant="ghost" onClick={onClose}>
            {closeLabel}
          </Button>
          {actions}
        </div>
      </div>
    </dialog>
  );
}
