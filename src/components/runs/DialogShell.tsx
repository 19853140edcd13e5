import { useEffect, useId, useRef, type ReactNode } from 'react';
import { buttonPrimary, buttonSecondary } from '../ui';

export interface DialogShellProps {
  title: string;
  /** One line under the title. */
  subtitle?: ReactNode;
  children: ReactNode;
  /** Text of the confirming button; the button is disabled while `confirmDisabled`. */
  confirmLabel: string;
  confirmDisabled?: boolean;
  busy?: boolean;
  error?: string | null;
  onConfirm: () => void;
  onClose: () => void;
}

/**
 * A modal on the native <dialog> element, open while mounted: focus stays inside, Escape closes,
 * focus returns to the opening button.
 */
export function DialogShell({ title, subtitle, children, confirmLabel, confirmDisabled, busy, error, onConfirm, onClose }: DialogShellProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  useEffect(() => {
    const dialog = ref.current;
    if (dialog && !dialog.open) dialog.showModal();
    return () => dialog?.close();
  }, []);
  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onCancel={(event) => {
        event.preventDefault();
        if (!busy) onClose();
      }}
      className="m-auto flex max-h-[min(44rem,calc(100vh-2rem))] w-[min(44rem,calc(100vw-2rem))] flex-col rounded-lg border border-line bg-panel p-0 text-ink shadow-xl backdrop:bg-black/50 [&:not([open])]:hidden"
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
        <button type="button" className={buttonSecondary} onClick={onClose} disabled={busy}>
          Cancel
        </button>
        <button type="button" className={buttonPrimary} onClick={onConfirm} disabled={busy || confirmDisabled} data-testid="run-dialog-submit">
          {busy ? 'Asking…' : confirmLabel}
        </button>
      </div>
    </dialog>
  );
}
