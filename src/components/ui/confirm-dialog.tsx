import type { ReactNode } from 'react';
import { Button } from './button';
import { Dialog } from './dialog';

/** A question before a step that matters: the dismiss button has the focus, so Enter never confirms by accident. */
export function ConfirmDialog({
  open,
  title,
  children,
  confirmLabel,
  cancelLabel = 'Cancel',
  tone = 'primary',
  pending = false,
  onConfirm,
  onCancel,
}: {
  open: boolean;
  title: ReactNode;
  children?: ReactNode;
  confirmLabel: string;
  /** What the dismiss button says; name what stays as it is when "Cancel" could be read as the action. */
  cancelLabel?: string;
  tone?: 'primary' | 'danger';
  pending?: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  return (
    <Dialog
      open={open}
      title={title}
      onClose={() => !pending && onCancel()}
      closeLabel={cancelLabel}
      closeDisabled={pending}
      closeAutoFocus
      size="narrow"
      actions={
        <Button variant={tone === 'danger' ? 'danger' : 'primary'} onClick={onConfirm} loading={pending}>
          {confirmLabel}
        </Button>
      }
    >
      {children}
    </Dialog>
  );
}
