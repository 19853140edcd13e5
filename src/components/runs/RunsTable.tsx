import { useMemo, useState } from 'react';
import { QueryClient, QueryClientProvider, keepPreviousData, useQuery, useQueryClient } from '@tanstack/react-query';
import { flexRender, getCoreRowModel, useReactTable, type RowSelectionState } from '@tanstack/react-table';
import { buttonPrimary } from '../ui';
import { TablePager } from '../TablePager';
import { cancelRun, fetchRunList, retryRun, type RunListParams } from './api';
import { shortId } from './format';
import { useClock } from './hooks';
import { runColumns } from './run-columns';
import { isActive, type Run, type RunList } from './types';

export interface RunsTableProps {
  /** The first page as the server rendered it (the viewer's visible runs), shown before any request. */
  initialList: RunList;
  /** Admins may switch to the whole queue (every user's runs). */
  canSeeQueue: boolean;
}

/** The runs list island: its own query cache, so the page needs no provider around it. */
export default function RunsTable(props: RunsTableProps) {
  const [client] = useState(() => new QueryClient({ defaultOptions: { queries: { staleTime: 2_000, retry: 1 } } }));
  return (
    <QueryClientProvider client={client}>
      <RunsTableBody {...props} />
    </QueryClientProvider>
  );
}

// The list is polled while a run is queued or running, rather than one event stream per run:
// a browser keeps at most six connections per host, and a busy queue would use them all up.
const ACTIVE_POLL_MS = 1_000;
const PAGE_SIZES = [25, 50, 100];
const STATUS_FILTERS = [
  { value: '', label: 'Every status' },
  { value: 'queued,running', label: 'Queued or running' },
  { value: 'succeeded', label: 'Succeeded' },
  { value: 'failed', label: 'Failed' },
  { value: 'cancelled', label: 'Cancelled' },
];

function RunsTableBody({ initialList, canSeeQueue }: RunsTableProps) {
  const queryClient = useQueryClient();
  const [all, setAll] = useState(false);
  const [status, setStatus] = useState('');
  const [pagination, setPagination] = useState({ pageIndex: 0, pageSize: initialList.pageSize });
  const [selection, setSelection] = useState<RowSelectionState>({});
  // Selected runs are kept whole, so a selection survives paging and live updates.
  const [selectedRuns, setSelectedRuns] = useState<Record<string, Run>>({});
  const [busyId, setBusyId] = useState<string | null>(null);
  const [notice, setNotice] = useState<{ tone: 'ok' | 'error'; text: string; href?: string } | null>(null);

  const params = useMemo<RunListParams>(
    () => ({ all, status: status || undefined, page: pagination.pageIndex + 1, pageSize: pagination.pageSize }),
    [all, status, pagination],
  );
  const isDefault = !all && !status && params.page === 1 && params.pageSize === initialList.pageSize;

  const query = useQuery({
    queryKey: ['runs', params],
    queryFn: () => fetchRunList(params),
    placeholderData: keepPreviousData,
    initialData: isDefault ? initialList : undefined,
    initialDataUpdatedAt: isDefault ? Date.now() : undefined,
    refetchInterval: (q) => (q.state.data?.runs.some((run) => isActive(run.status)) ? ACTIVE_POLL_MS : false),
  });
  const list = query.data ?? initialList;
  const anyRunning = list.runs.some((run) => run.status === 'running');
  const now = useClock(anyRunning);

  async function act(run: Run, action: 'cancel' | 'retry') {
    setBusyId(run.id);
    setNotice(null);
    if (action === 'cancel') {
      const result = await cancelRun(run.id);
      if (!result.ok) setNotice({ tone: 'error', text: `The run could not be cancelled: ${result.error.message}` });
      else setNotice({ tone: 'ok', text: `Cancelled the run of ${run.chain.name} on ${run.capture.name}.` });
    } else {
      const result = await retryRun(run.id);
      if (!result.ok) setNotice({ tone: 'error', text: `The run could not be retried: ${result.error.message}` });
      else {
        const next = result.data.runs[0];
        setNotice({ tone: 'ok', text: `Retrying ${run.chain.name} on ${run.capture.name} as run ${shortId(next.id)}.`, href: `/runs/${next.id}` });
      }
    }
    setBusyId(null);
    await queryClient.invalidateQueries({ queryKey: ['runs'] });
  }

  const columns = useMemo(
    () => runColumns({ onCancel: (run) => void act(run, 'cancel'), onRetry: (run) => void act(run, 'retry'), busyId, now }),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [busyId, now],
  );

  const table = useReactTable({
    data: list.runs,
    columns,
    getRowId: (row) => row.id,
    getCoreRowModel: getCoreRowModel(),
    manualPagination: true,
    rowCount: list.total,
    enableRowSelection: (row) => row.original.status === 'succeeded',
    state: { pagination, rowSelection: selection },
    onPaginationChange: setPagination,
    onRowSelectionChange: (updater) => {
      const next = typeof updater === 'function' ? updater(selection) : updater;
      setSelection(next);
      setSelectedRuns((kept) => {
        const out: Record<string, Run> = {};
        for (const id of Object.keys(next)) if (next[id]) out[id] = kept[id] ?? list.runs.find((run) => run.id === id)!;
        return out;
      });
    },
  });

  const selected = Object.values(selectedRuns).filter(Boolean);
  const compareHref = `/runs/compare?ids=${selected.map((run) => encodeURIComponent(run.id)).join(',')}`;
  const active = list.runs.filter((run) => isActive(run.status)).length;

  return (
    <section aria-label="Runs" className="space-y-4" data-testid="runs-table" data-active-runs={active}>
      <div className="flex flex-wrap items-center gap-x-6 gap-y-3 rounded-lg border border-line bg-panel px-4 py-3">
        <label className="flex items-center gap-2 text-sm">
          <span className="text-muted">Show</span>
          <select
            className="rounded border border-muted/40 bg-surface px-2 py-1 text-sm text-ink"
            value={status}
            onChange={(e) => {
              setStatus(e.target.value);
              setPagination((p) => ({ ...p, pageIndex: 0 }));
            }}
          >
            {STATUS_FILTERS.map((f) => (
              <option key={f.value} value={f.value}>
                {f.label}
              </option>
            ))}
          </select>
        </label>
        {canSeeQueue && (
          <label className="flex items-center gap-2 text-sm" title="Admins see every user's runs, private ones with their names withheld">
            <input
              type="checkbox"
              className="h-4 w-4 accent-[rgb(var(--q-accent))]"
              checked={all}
              onChange={(e) => {
                setAll(e.target.checked);
                setPagination((p) => ({ ...p, pageIndex: 0 }));
              }}
            />
            All users (the whole queue)
          </label>
        )}
        <p className="text-sm text-muted" aria-live="polite">
          {active > 0 ? (
            <>
              <span className="font-mono tabular-nums text-ink">{active}</span> {active === 1 ? 'run' : 'runs'} queued or running, updating live
            </>
          ) : (
            'No run in progress on this page'
          )}
        </p>
        <div className="ml-auto flex items-center gap-3 text-sm">
          <span className="text-muted" aria-live="polite">
            {selected.length > 0 ? `${selected.length} selected` : 'Select two or more succeeded runs to compare them'}
          </span>
          {selected.length > 0 && (
            <button
              type="button"
              className="text-xs text-muted underline hover:text-ink"
              onClick={() => {
                setSelection({});
                setSelectedRuns({});
              }}
            >
              Clear
            </button>
          )}
          {selected.length >= 2 && selected.length <= 10 ? (
            <a className={buttonPrimary} href={compareHref} data-testid="compare-selected">
              Compare {selected.length} runs
            </a>
          ) : (
            <button
              type="button"
              className={buttonPrimary}
              disabled
              title={selected.length > 10 ? 'Compare at most ten runs at once' : 'Select at least two runs'}
            >
              Compare
            </button>
          )}
        </div>
      </div>

      {notice && (
        <p
          role={notice.tone === 'error' ? 'alert' : 'status'}
          className={
            'flex items-center justify-between gap-4 rounded-md border px-3 py-2 text-sm ' +
            (notice.tone === 'error' ? 'border-danger/40 bg-danger/10 text-danger' : 'border-ok/40 bg-ok/10 text-ok')
          }
        >
          <span>
            {notice.text}{' '}
            {notice.href && (
              <a className="underline" href={notice.href}>
                Open it
              </a>
            )}
          </span>
          <button type="button" className="text-xs underline" onClick={() => setNotice(null)}>
            Dismiss
          </button>
        </p>
      )}
      {query.isError && (
        <p role="alert" className="rounded-md border border-danger/40 bg-danger/10 px-3 py-2 text-sm text-danger">
          The list could not be loaded: {(query.error as Error).message}
        </p>
      )}

      <div className="overflow-x-auto rounded-lg border border-line bg-panel">
        <table className="w-full whitespace-nowrap text-sm">
          <caption className="sr-only">Runs, newest first</caption>
          <thead className="border-b border-line text-left text-xs uppercase tracking-wide text-muted">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const numeric = (header.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                  return (
                    <th key={header.id} scope="col" className={'px-3 py-2 font-medium ' + (numeric ? 'text-right' : '')}>
                      {flexRender(header.column.columnDef.header, header.getContext())}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr
                key={row.id}
                className={'border-b border-line last:border-b-0 ' + (row.getIsSelected() ? 'bg-accent/5' : 'hover:bg-surface')}
                data-run-id={row.id}
                data-status={row.original.status}
              >
                {row.getVisibleCells().map((cell) => {
                  const numeric = (cell.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                  return (
                    <td key={cell.id} className={'px-3 py-2 align-middle ' + (numeric ? 'text-right' : '')}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  );
                })}
              </tr>
            ))}
            {list.runs.length === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-10 text-center whitespace-normal text-muted">
                  {status ? 'No run has this status.' : 'No runs yet. Open a chain and choose “Run on captures…”, or open a capture and run a chain on it.'}
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>

      <TablePager
        noun="runs"
        page={list.page}
        pageSize={list.pageSize}
        total={list.total}
        pageSizes={PAGE_SIZES}
        onPageSize={(pageSize) => setPagination({ pageIndex: 0, pageSize })}
        canPrevious={table.getCanPreviousPage()}
        canNext={table.getCanNextPage()}
        onPrevious={() => table.previousPage()}
        onNext={() => table.nextPage()}
      />
    </section>
  );
}
