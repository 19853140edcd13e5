/**
 * Columns of the runs table. The list endpoint sorts newest first and pages on the server, so the
 * columns offer no sorting of their own.
 */
import { createColumnHelper, type ColumnDef } from '@tanstack/react-table';
import { buttonSmall } from '../ui';
import { durationText, utcMinute } from './format';
import { RunProgress } from './RunProgress';
import { CacheMarker, StatusBadge } from './StatusBadge';
import { isActive, type Run } from './types';

const column = createColumnHelper<Run>();

/** What a row's controls can ask the table to do. */
export interface RunRowActions {
  onCancel: (run: Run) => void;
  onRetry: (run: Run) => void;
  /** Id of the run whose action is under way, to disable its buttons. */
  busyId: string | null;
  /** Clock (ms since epoch) for the time so far of running runs; null until the page is mounted. */
  now: number | null;
}

export function runColumns(actions: RunRowActions): ColumnDef<Run, any>[] {
  return [
    column.display({
      id: 'select',
      header: () => <span className="sr-only">Select to compare</span>,
      cell: ({ row }) => (
        <input
          type="checkbox"
          aria-label={`Select the run of ${row.original.chain.name} on ${row.original.capture.name} to compare`}
          className="h-4 w-4 accent-[rgb(var(--q-accent))]"
          checked={row.getIsSelected()}
          disabled={!row.getCanSelect()}
          title={row.getCanSelect() ? 'Select to compare' : 'Only succeeded runs have results to compare.'}
          onChange={row.getToggleSelectedHandler()}
        />
      ),
    }),
    column.accessor('status', {
      header: 'Status',
      cell: ({ row }) => (
        <a
          href={`/runs/${row.original.id}`}
          className="inline-flex items-center gap-1.5 rounded hover:opacity-80"
          aria-label={`Open the run (${row.original.status})`}
        >
          <StatusBadge status={row.original.status} />
          {row.original.fromCache && <CacheMarker />}
        </a>
      ),
    }),
    column.accessor('progress', {
      header: 'Progress',
      cell: ({ row }) => {
        const run = row.original;
        if (run.status === 'failed') {
          return (
            <span className="block max-w-[13rem] truncate text-xs text-danger" title={run.error?.message}>
              {run.error?.stageId ? `at ${run.error.stageId}: ` : ''}
              {run.error?.message ?? 'failed'}
            </span>
          );
        }
        return <RunProgress compact status={run.status} progress={run.progress} currentStage={run.currentStage} etaSeconds={run.etaSeconds} />;
      },
    }),
    column.accessor((run) => run.chain.name, {
      id: 'chain',
      header: 'Chain',
      cell: ({ row }) => (
        <div className="whitespace-nowrap">
          <a href={`/runs/${row.original.id}`} className="font-medium text-ink hover:text-accent hover:underline" title="Open this run">
            {row.original.chain.name}
          </a>{' '}
          <span className="font-mono text-xs text-muted" title={`Revision ${row.original.chain.revision} of the chain`}>
            r{row.original.chain.revision}
          </span>
        </div>
      ),
    }),
    column.accessor((run) => run.capture.name, {
      id: 'capture',
      header: 'Capture',
      cell: ({ row }) => (
        <a
          href={`/captures/${row.original.capture.id}`}
          className="block max-w-[15rem] truncate text-ink 2xl:max-w-[32rem] hover:text-accent hover:underline"
          title={row.original.capture.name}
        >
          {row.original.capture.name}
        </a>
      ),
    }),
    column.accessor((run) => run.requestedBy.name, { id: 'requestedBy', header: 'Asked by' }),
    column.accessor('startedAt', {
      header: 'Started (UTC)',
      cell: ({ row }) => {
        const run = row.original;
        const title = `Asked ${run.createdAt}${run.startedAt ? `, started ${run.startedAt}` : ''}${run.finishedAt ? `, finished ${run.finishedAt}` : ''}`;
        return run.startedAt ? (
          <span className="font-mono text-xs tabular-nums" title={title}>
            {utcMinute(run.startedAt)}
          </span>
        ) : (
          <span className="font-mono text-xs tabular-nums text-muted" title={title}>
            asked {utcMinute(run.createdAt).slice(11)}
          </span>
        );
      },
    }),
    column.display({
      id: 'duration',
      header: 'Duration',
      cell: ({ row }) => <span className="font-mono text-xs tabular-nums">{durationText(row.original, actions.now)}</span>,
      meta: { numeric: true },
    }),
    column.display({
      id: 'actions',
      header: () => <span className="sr-only">Actions</span>,
      cell: ({ row }) => {
        const run = row.original;
        const busy = actions.busyId === run.id;
        return (
          <div className="flex justify-end gap-1.5">
            {run.permissions.cancel && isActive(run.status) && (
              <button type="button" className={buttonSmall} disabled={busy} onClick={() => actions.onCancel(run)}>
                Cancel
              </button>
            )}
            {run.permissions.retry && (
              <button type="button" className={buttonSmall} disabled={busy} onClick={() => actions.onRetry(run)}>
                Retry
              </button>
            )}
          </div>
        );
      },
    }),
  ];
}
