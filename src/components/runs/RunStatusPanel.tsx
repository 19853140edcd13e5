import { formatQuantity } from '@/lib/units';
import { buttonPrimary, buttonSecondary } from '../ui';
import { durationText, shortId, utcMinute } from './format';
import { useClock } from './hooks';
import { RunProgress } from './RunProgress';
import { CacheMarker, StatusBadge } from './StatusBadge';
import { isActive, type Run } from './types';

export interface RunStatusPanelProps {
  run: Run;
  busy: boolean;
  onCancel: () => void;
  onRetry: () => void;
  /** A problem with the last cancel or retry. */
  actionError: string | null;
}

/** Where a run stands: status, live progress, the error of a failed run, timings; cancel and retry. */
export function RunStatusPanel({ run, busy, onCancel, onRetry, actionError }: RunStatusPanelProps) {
  const now = useClock(run.status === 'running');
  const results = run.summary;
  return (
    <section
      aria-label="Status"
      className="grid gap-x-8 gap-y-4 rounded-lg border border-line bg-panel p-5 lg:grid-cols-[minmax(0,1fr)_minmax(0,26rem)]"
      data-testid="run-status"
      data-status={run.status}
    >
      <div className="min-w-0 space-y-4">
        <div className="flex flex-wrap items-center gap-2">
          <StatusBadge status={run.status} />
          {run.fromCache && <CacheMarker />}
          <span className="text-sm text-muted">
            {run.status === 'queued' && 'Waiting for a free worker; the page updates by itself.'}
            {run.status === 'running' && 'Running on the server; you can leave this page and come back.'}
            {run.status === 'succeeded' &&
              (run.fromCache
                ? 'Answered from the cache: the same revision already ran on this capture with this engine.'
                : 'Finished; the plots and readouts are below.')}
            {run.status === 'cancelled' && 'Cancelled before it finished; nothing was kept.'}
            {run.status === 'failed' && 'Stopped with an error; nothing was kept.'}
          </span>
        </div>
        {run.status !== 'failed' && run.status !== 'cancelled' && (
          <RunProgress status={run.status} progress={run.progress} currentStage={run.currentStage} etaSeconds={run.etaSeconds} />
        )}
        {run.error && (
          <div role="alert" className="rounded-md border border-danger/40 bg-danger/10 px-4 py-3 text-sm" data-testid="run-error">
            <p className="font-medium text-danger">
              {run.error.stageId ? (
                <>
                  Failed in stage <span className="font-mono">{run.error.stageId}</span> ({run.error.kind})
                  {run.error.sampleIndex !== null && (
                    <>
                      {' '}
                      at input sample <span className="font-mono tabular-nums">{run.error.sampleIndex.toLocaleString('en')}</span>
                    </>
                  )}
                </>
              ) : run.error.kind === 'input' ? (
                'The capture could not be read'
              ) : (
                'The server failed while running the chain'
              )}
            </p>
            <p className="mt-1 text-ink">{run.error.message}</p>
          </div>
        )}
        {actionError && (
          <p role="alert" className="text-sm text-danger">
            {actionError}
          </p>
        )}
        {(run.permissions.cancel && isActive(run.status)) || run.permissions.retry ? (
          <div className="flex flex-wrap gap-2">
            {run.permissions.cancel && isActive(run.status) && (
              <button type="button" className={buttonSecondary} disabled={busy} onClick={onCancel}>
                {busy ? 'Cancelling…' : 'Cancel run'}
              </button>
            )}
            {run.permissions.retry && (
              <button type="button" className={buttonPrimary} disabled={busy} onClick={onRetry}>
                {busy ? 'Asking…' : 'Retry'}
              </button>
            )}
          </div>
        ) : null}
      </div>
      <dl className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-4 gap-y-1.5 self-start text-sm">
        <dt className="text-muted">Chain</dt>
        <dd className="min-w-0 truncate">
          <a className="text-ink hover:text-accent hover:underline" href={`/chains/${run.chain.id}`}>
            {run.chain.name}
          </a>{' '}
          <span className="font-mono text-xs text-muted">r{run.chain.revision}</span>
        </dd>
        <dt className="text-muted">Capture</dt>
        <dd className="min-w-0 truncate">
          <a className="text-ink hover:text-accent hover:underline" href={`/captures/${run.capture.id}`} title={run.capture.name}>
            {run.capture.name}
          </a>
        </dd>
        <dt className="text-muted">Asked by</dt>
        <dd>
          {run.requestedBy.name}, <span className="font-mono text-xs tabular-nums">{utcMinute(run.createdAt)} UTC</span>
        </dd>
        <dt className="text-muted">Started</dt>
        <dd className="font-mono text-xs tabular-nums leading-5">{run.startedAt ? `${utcMinute(run.startedAt)} UTC` : '—'}</dd>
        <dt className="text-muted">Duration</dt>
        <dd className="font-mono text-xs tabular-nums leading-5" data-testid="run-duration">
          {durationText(run, now)}
          {run.status === 'running' && ' so far'}
        </dd>
        {results?.input && (
          <>
            <dt className="text-muted">Input</dt>
            <dd className="font-mono text-xs tabular-nums leading-5">
              {results.input.samples.toLocaleString('en')} samples, {formatQuantity(results.input.sampleRate, 'sps')}
              {results.timing?.inputSamplesPerSecond ? `, ${formatQuantity(results.timing.inputSamplesPerSecond, 'sps')} processed` : ''}
            </dd>
          </>
        )}
        {run.attempt > 1 && (
          <>
            <dt className="text-muted">Attempt</dt>
            <dd>
              <span className="font-mono tabular-nums">{run.attempt}</span>
              {run.retryOf && (
                <>
                  {' '}
                  (retry of{' '}
                  <a className="font-mono underline hover:text-accent" href={`/runs/${run.retryOf}`}>
                    {shortId(run.retryOf)}
                  </a>
                  )
                </>
              )}
            </dd>
          </>
        )}
        {results?.engineVersion && (
          <>
            <dt className="text-muted">Engine</dt>
            <dd className="font-mono text-xs leading-5">{results.engineVersion}</dd>
          </>
        )}
      </dl>
    </section>
  );
}
