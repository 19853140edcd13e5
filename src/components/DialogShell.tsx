import { useEffect, useId, useRef, type ReactNode } from 'react';
import { buttonPrimary, buttonSecondary } from './ui';

export interface DialogShellProps {
  /** Whether the dialog shows; leave unset for a dialog that is open while mounted. */
  open?: boolean;
  title: string;
  /** One line under the title. */
  subtitle?: ReactNode;
  children: ReactNode;
  /** Text of the confirming button; the button is disabled while `confirmDisabled`. */
  confirmLabel: string;
  confirmDisabled?: boolean;
  /** Text of the confirming button while `busy`. */
  busyLabel?: string;
  /** `danger` for destructive actions: a red confirming button, and Cancel takes the first focus. */
  tone?: 'primary' | 'danger';
  /** `narrow` (32 rem) for a short question, `wide` (44 rem) for a form with a list. */
  width?: 'narrow' | 'wide';
  busy?: boolean;
  /** A problem to show inside the dialog (the dialog stays open). */
  error?: string | null;
  /** data-testid of the confirming button. */
  confirmTestId?: string;
  onConfirm: () => void;
  onClose: () => void;
}

const buttonDanger =
  'inline-flex items-center justify-center gap-2 rounded-md bg-danger px-3.5 py-2 text-sm font-medium text-panel hover:bg-danger/90 disabled:cursor-not-allowed disabled:opacity-60';

const widths = { narrow: 'w-[min(32rem,calc(100vw-2rem))]', wide: 'w-[min(44rem,calc(100vw-2rem))]' };

/**
 * A modal on the native <dialog> element: focus stays inside, Escape closes (unless busy), and
 * focus returns to the button that opened it.
 */
export function DialogShell(props: DialogShellProps) {
  const { open = true, title, subtitle, children, confirmLabel, confirmDisabled, busyLabel = 'Asking…', tone = 'primary', width = 'wide' } = props;
  const { busy, error, confirmTestId, onConfirm, onClose } = props;
  const ref = useRef<HTMLDialogElement>(null);
  // Two dialogs on one page (capture and annotation delete) must not share a title id.
  const titleId = useId();
  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (open && !dialog.open) dialog.showModal();
    if (!open && dialog.open) dialog.close();
  }, [open]);
  useEffect(() => {
    const dialog = ref.current;
    return () => dialog?.close();
  }, []);
  const danger = tone === 'danger';
  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onCancel={(event) => {
        event.preventDefault();
        if (!busy) onClose();
      }}
      className={`m-auto flex max-h-[min(44rem,calc(100vh-2rem))] ${widths[width]} flex-col rounded-lg border border-line bg-panel p-0 text-ink shadow-xl backdrop:bg-black/50 [&:not([open])]:hidden`}
    >
      <div className="border-b border-line px-5 pb-3 pt-4">
        <h2 id={titleId} className="text-lg font-semibold">
          {title}
        </h2>
        {subtitle && <div className="mt-0.5 text-sm text-muted">{subtitle}</div>}
      </div>
      <div className="min-h-0 flex-1 overflow-y-auto px-5 py-4">{children}</div>
      {error && (
        <p role="alert" className="mx-5 mb-3 rounded-md border border-danger/40 bg-danger/10 px-3 py-2 text-sm text-danger">
          {error}
        </p>
      )}
      <div className="flex justify-end gap-2 border-t border-line bg-surface px-5 py-3">
        <button type="button" className={buttonSecondary} onClick={onClose} disabled={busy} autoFocus={danger}>
          Cancel
        </button>
        <button
          type="button"
          className={danger ? buttonDanger : buttonPrimary}
          onClick={onConfirm}
          disabled={busy || confirmDisabled}
          data-testid={confirmTestId}
        >
          {busy ? busyLabel : confirmLabel}
        </button>
      </div>
    </dialog>
  );
}
