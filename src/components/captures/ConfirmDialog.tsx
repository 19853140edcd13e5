import type { ReactNode } from 'react';
import { DialogShell } from '../DialogShell';

export interface ConfirmDialogProps {
  open: boolean;
  title: string;
  children: ReactNode;
  /** Text of the confirming button, e.g. "Delete 3 captures". */
  confirmLabel: string;
  busy?: boolean;
  /** A problem to show inside the dialog (the dialog stays open). */
  error?: string | null;
  onConfirm: () => void;
  onCancel: () => void;
}

/** A narrow modal confirming a destructive action; Cancel has the first focus so Enter does no harm. */
export function ConfirmDialog({ open, title, children, confirmLabel, busy, error, onConfirm, onCancel }: ConfirmDialogProps) {
  return (
    <DialogShell
      open={open}
      title={title}
      confirmLabel={confirmLabel}
      busyLabel="Deleting…"
      tone="danger"
      width="narrow"
      busy={busy}
      error={error}
      onConfirm={onConfirm}
      onClose={onCancel}
    >
      <div className="space-y-2 text-sm text-muted">{children}</div>
    </DialogShell>
  );
}
