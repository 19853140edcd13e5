import { useEffect, useId, useRef, type ReactNode } from 'react';
import { buttonSecondary } from '../ui';

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

const buttonDanger =
  'inline-flex items-center justify-center gap-2 rounded-md bg-danger px-3.5 py-2 text-sm font-medium text-panel hover:bg-danger/90 disabled:cursor-not-allowed disabled:opacity-60';

/**
 * A modal confirmation for destructive actions, on the native <dialog> element: focus is trapped,
 * Escape cancels, and focus returns to the button that opened it.
 */
export function ConfirmDialog({ open, title, children, confirmLabel, busy, error, onConfirm, onCancel }: ConfirmDialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  // Two dialogs on one page (capture and annotation delete) must not share a title id.
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
        if (!busy) onCancel();
      }}
      className="m-auto w-[min(32rem,calc(100vw-2rem))] rounded-lg border border-line bg-panel p-0 text-ink shadow-xl backdrop:bg-black/50"
    >
      <div className="p-5">
        <h2 id={titleId} className="text-lg font-semibold">
          {title}
        </h2>
        <div className="mt-2 space-y-2 text-sm text-muted">{children}</div>
        {error && (
          <p role="alert" className="mt-3 rounded-md border border-danger/40 bg-danger/10 px-3 py-2 text-sm text-danger">
            {error}
          </p>
        )}
      </div>
      <div className="flex justify-end gap-2 border-t border-line bg-surface px-5 py-3">
        <button type="button" className={buttonSecondary} onClick={onCancel} disabled={busy} autoFocus>
          Cancel
        </button>
        <button type="button" className={buttonDanger} onClick={onConfirm} disabled={busy}>
          {busy ? 'Deleting…' : confirmLabel}
        </button>
      </div>
    </dialog>
  );
}
