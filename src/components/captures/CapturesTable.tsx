import { useEffect, useMemo, useState } from 'react';
import { QueryClient, QueryClientProvider, keepPreviousData, useQuery, useQueryClient } from '@tanstack/react-query';
import { flexRender, getCoreRowModel, useReactTable, type RowSelectionState, type SortingState } from '@tanstack/react-table';
import { buttonSmall } from '../ui';
import { TablePager } from '../TablePager';
import { bulkDeleteCaptures, CAPTURES_CHANGED, deleteCapture, fetchCaptureList, type CaptureListParams } from './api';
import { captureColumns, SORTABLE } from './capture-columns';
import { CaptureFilters, emptyFilters, parseRate, type FilterValues } from './CaptureFilters';
import { ConfirmDialog } from './ConfirmDialog';
import { StorageUsageBar } from './StorageUsageBar';
import type { Capture, CaptureList } from './types';

export interface CapturesTableProps {
  /** The first page as the server rendered it (default filters), shown before any request. */
  initialList: CaptureList;
}

/** The captures list island: its own query cache, so the page needs no provider around it. */
export default function CapturesTable(props: CapturesTableProps) {
  const [client] = useState(() => new QueryClient({ defaultOptions: { queries: { staleTime: 10_000, retry: 1 } } }));
  return (
    <QueryClientProvider client={client}>
      <CapturesTableBody {...props} />
    </QueryClientProvider>
  );
}

const PAGE_SIZES = [10, 25, 50, 100];

function useDebounced<T>(value: T, ms: number): T {
  const [settled, setSettled] = useState(value);
  useEffect(() => {
    const timer = setTimeout(() => setSettled(value), ms);
    return () => clearTimeout(timer);
  }, [value, ms]);
  return settled;
}

function CapturesTableBody({ initialList }: CapturesTableProps) {
  const queryClient = useQueryClient();
  const [filters, setFilters] = useState<FilterValues>(emptyFilters);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'createdAt', desc: true }]);
  const [pagination, setPagination] = useState({ pageIndex: 0, pageSize: initialList.pageSize });
  const [selection, setSelection] = useState<RowSelectionState>({});
  const [toDelete, setToDelete] = useState<Capture[] | null>(null);
  const [deleting, setDeleting] = useState(false);
  const [deleteError, setDeleteError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const typed = useDebounced(filters, 300);

  const params = useMemo<CaptureListParams>(() => {
    const sort = sorting[0];
    return {
      q: typed.q.trim() || undefined,
      owner: typed.owner || undefined,
      tag: typed.tag.trim() || undefined,
      layout: typed.layout || undefined,
      datatype: typed.datatype || undefined,
      minRate: parseRate(typed.minRate).value,
      maxRate: parseRate(typed.maxRate).value,
      sort: (sort && SORTABLE.has(sort.id) ? sort.id : 'createdAt') as CaptureListParams['sort'],
      order: sort?.desc === false ? 'asc' : 'desc',
      page: pagination.pageIndex + 1,
      pageSize: pagination.pageSize,
    };
  }, [typed, sorting, pagination]);
  const isDefault = params.page === 1 && params.pageSize === initialList.pageSize && params.sort === 'createdAt' && params.order === 'desc' && Object.values(typed).every((v) => v === '');

  const query = useQuery({
    queryKey: ['captures', params],
    queryFn: () => fetchCaptureList(params),
    placeholderData: keepPreviousData,
    initialData: isDefault ? initialList : undefined,
    initialDataUpdatedAt: isDefault ? Date.now() : undefined,
  });
  const list = query.data ?? initialList;

  // Uploads and syntheses in other islands announce new captures.
  useEffect(() => {
    const refresh = () => void queryClient.invalidateQueries({ queryKey: ['captures'] });
    window.addEventListener(CAPTURES_CHANGED, refresh);
    return () => window.removeEventListener(CAPTURES_CHANGED, refresh);
  }, [queryClient]);

  const changeFilters = (next: FilterValues) => {
    setFilters(next);
    setPagination((p) => ({ ...p, pageIndex: 0 }));
    setSelection({});
  };
  const columns = useMemo(
    () => captureColumns({ onDelete: (capture) => setToDelete([capture]), onTag: (tag) => changeFilters({ ...filters, tag }) }),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [filters],
  );

  const table = useReactTable({
    data: list.items,
    columns,
    getRowId: (row) => row.id,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    rowCount: list.total,
    enableSortingRemoval: false,
    enableRowSelection: (row) => row.original.permissions.delete,
    state: { sorting, pagination, rowSelection: selection },
    onSortingChange: (updater) => {
      setSorting(updater);
      setPagination((p) => ({ ...p, pageIndex: 0 }));
    },
    onPaginationChange: setPagination,
    onRowSelectionChange: setSelection,
  });

  const selected = list.items.filter((c) => selection[c.id]);

  async function confirmDelete() {
    if (!toDelete) return;
    setDeleting(true);
    setDeleteError(null);
    if (toDelete.length === 1) {
      const result = await deleteCapture(toDelete[0].id);
      setDeleting(false);
      if (!result.ok) return setDeleteError(result.error.message);
      setNotice(`Deleted "${toDelete[0].name}".`);
    } else {
      const result = await bulkDeleteCaptures(toDelete.map((c) => c.id));
      setDeleting(false);
      if (!result.ok) return setDeleteError(result.error.message);
      const refused = result.data.refused.length;
      setNotice(`Deleted ${result.data.deleted.length} ${result.data.deleted.length === 1 ? 'capture' : 'captures'}${refused ? `; ${refused} refused (not yours, or already gone)` : ''}.`);
    }
    setToDelete(null);
    setSelection({});
    await queryClient.invalidateQueries({ queryKey: ['captures'] });
  }


  return (
    <section aria-label="Captures" className="space-y-4" data-testid="captures-table" data-loading={query.isFetching || undefined}>
      <div className="rounded-lg border border-line bg-panel p-4">
        <CaptureFilters values={filters} onChange={changeFilters} />
        <div className="mt-4 flex flex-wrap items-center gap-x-6 gap-y-3 border-t border-line pt-3">
          <StorageUsageBar usage={list.usage} />
          <div className="flex items-center gap-3 text-sm">
            <span className="text-muted" aria-live="polite">
              {selected.length > 0 ? `${selected.length} selected` : 'Select captures to delete several at once'}
            </span>
            <button type="button" className={buttonSmall} disabled={selected.length === 0} onClick={() => setToDelete(selected)}>
              Delete selected
            </button>
          </div>
        </div>
      </div>

      {notice && (
        <p role="status" className="flex items-center justify-between rounded-md border border-ok/40 bg-ok/10 px-3 py-2 text-sm text-ok">
          {notice}
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

      {/* relative: the header's sr-only text is absolutely placed and must stay inside the scroll box. */}
      <div className="relative overflow-x-auto rounded-lg border border-line bg-panel">
        <table className="w-full whitespace-nowrap text-sm">
          <caption className="sr-only">Captures, sorted by {params.sort} {params.order === 'asc' ? 'ascending' : 'descending'}</caption>
          <thead className="border-b border-line text-left text-xs uppercase tracking-wide text-muted">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sortable = SORTABLE.has(header.column.id);
                  const sorted = header.column.getIsSorted();
                  const numeric = (header.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                      className={'px-2.5 py-2 font-medium ' + (numeric ? 'text-right' : '')}
                    >
                      {sortable ? (
                        <button type="button" onClick={header.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 uppercase hover:text-ink">
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          <span aria-hidden="true" className={sorted ? 'text-accent' : 'opacity-40'}>
                            {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}
                          </span>
                        </button>
                      ) : (
                        flexRender(header.column.columnDef.header, header.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody className={query.isFetching && !query.isLoading ? 'opacity-70' : undefined}>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className={'border-b border-line last:border-b-0 ' + (row.getIsSelected() ? 'bg-accent/5' : 'hover:bg-surface')} data-capture-id={row.id}>
                {row.getVisibleCells().map((cell) => {
                  const numeric = (cell.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                  return (
                    <td key={cell.id} className={'px-2.5 py-2 align-top ' + (numeric ? 'text-right' : '')}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  );
                })}
              </tr>
            ))}
            {list.items.length === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-10 text-center text-muted">
                  {Object.values(filters).some((v) => v !== '') ? 'No capture matches these filters.' : 'No captures yet: upload a recording or synthesize one.'}
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>

      <TablePager
        noun="captures"
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

      <ConfirmDialog
        open={toDelete !== null}
        title={toDelete && toDelete.length > 1 ? `Delete ${toDelete.length} captures?` : 'Delete this capture?'}
        confirmLabel={toDelete && toDelete.length > 1 ? `Delete ${toDelete.length} captures` : 'Delete capture'}
        busy={deleting}
        error={deleteError}
        onConfirm={confirmDelete}
        onCancel={() => {
          setToDelete(null);
          setDeleteError(null);
        }}
      >
        <p>Their samples and metadata are removed for good.</p>
        <ul className="max-h-48 list-disc overflow-y-auto pl-5 text-ink">
          {toDelete?.map((c) => (
            <li key={c.id}>{c.name}</li>
          ))}
        </ul>
      </ConfirmDialog>
    </section>
  );
}
