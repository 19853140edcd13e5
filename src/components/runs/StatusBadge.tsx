import type { RunStatus } from './types';

const STYLES: Record<RunStatus, string> = {
  queued: 'border-line bg-surface text-muted',
  running: 'border-accent/40 bg-accent/10 text-accent',
  succeeded: 'border-ok/40 bg-ok/10 text-ok',
  failed: 'border-danger/40 bg-danger/10 text-danger',
  cancelled: 'border-line bg-surface text-muted line-through decoration-muted/60',
};

const LABELS: Record<RunStatus, string> = {
  queued: 'Queued',
  running: 'Running',
  succeeded: 'Succeeded',
  failed: 'Failed',
  cancelled: 'Cancelled',
};

/** A run's status as a small coloured label; the text carries the meaning, colour only helps. */
export function StatusBadge({ status }: { status: RunStatus }) {
  return (
    <span className={'inline-flex items-center gap-1.5 rounded-full border px-2 py-0.5 text-xs font-medium ' + STYLES[status]} data-status={status}>
      {status === 'running' && <span aria-hidden="true" className="h-1.5 w-1.5 animate-pulse rounded-full bg-current" />}
      {LABELS[status]}
    </span>
  );
}

/** The "from the cache" marker: the result was reused, not computed again. */
export function CacheMarker() {
  return (
    <span
      className="inline-flex items-center rounded border border-line px-1.5 py-0.5 font-mono text-[0.7rem] uppercase tracking-wide text-muted"
      title="Answered from the result cache: same chain revision, same capture, same engine version"
      data-testid="from-cache"
    >
      cache
    </span>
  );
}
