import type { ReactNode } from 'react';

/** A dismissable line above a table saying what an action did (ok) or why it failed (error). */
export function TableNotice({ tone, children, onDismiss }: { tone: 'ok' | 'error'; children: ReactNode; onDismiss: () => void }) {
  return (
    <p
      role={tone === 'error' ? 'alert' : 'status'}
      className={
        'flex items-center justify-between gap-4 rounded-md border px-3 py-2 text-sm ' +
        (tone === 'error' ? 'border-danger/40 bg-danger/10 text-danger' : 'border-ok/40 bg-ok/10 text-ok')
      }
    >
      <span>{children}</span>
      <button type="button" className="text-xs underline" onClick={onDismiss}>
        Dismiss
      </button>
    </p>
  );
}
