import { useEffect, useMemo, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { buttonSmall } from '../ui';
import { ServerTableView } from '../table/ServerTableView';
import { TableNotice } from '../table/TableNotice';
import { useServerTable } from '../table/useServerTable';
import { useUrlState } from '../table/useUrlState';
import { urlSorting } from '../table/url-sorting';
import { withQueryClient } from '../table/withQueryClient';
import { CAPTURES_CHANGED } from './api';
import { fetchCaptureList, useBulkDeleteCaptures, useDeleteCapture } from './queries';
import { captureColumns } from './capture-columns';
import { CaptureFilters } from './CaptureFilters';
import { ConfirmDialog } from './ConfirmDialog';
import { CAPTURE_PAGE_SIZES, captureListCodec, captureListParams, hasFilters, type CaptureListState, type FilterValues } from './list-state';
import { StorageUsageBar } from './StorageUsageBar';
import type { Capture, CaptureList } from './types';

export interface CapturesTableProps {
  /** The list state the page's URL asked for (parsed on the server with the same codec). */
  initialState: CaptureListState;
  /** The page of captures the server rendered for that state, shown before any request. */
  initialList: CaptureList;
}

// Filter fields typed letter by letter: they rewrite the current history entry once typing pauses.
const TYPED: ReadonlySet<keyof FilterValues> = new Set(['q', 'tag', 'minRate', 'maxRate']);

/** The captures list island: filters, sort and page live in the URL. */
function CapturesTable({ initialState, initialList }: CapturesTableProps) {
  const queryClient = useQueryClient();
  const urlState = useUrlState(captureListCodec, initialState);
  const { state, settled, update } = urlState;
  const [toDelete, setToDelete] = useState<Capture[] | null>(null);
  const [deleting, setDeleting] = useState(false);
  const [deleteError, setDeleteError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const removeOne = useDeleteCapture();
  const removeMany = useBulkDeleteCaptures();

  // Uploads and syntheses in other islands announce new captures.
  useEffect(() => {
    const refresh = () => void queryClient.invalidateQueries({ queryKey: ['captures'] });
    window.addEventListener(CAPTURES_CHANGED, refresh);
    return () => window.removeEventListener(CAPTURES_CHANGED, refresh);
  }, [queryClient]);

  const changeFilters = (filters: FilterValues) => {
    const typed = (Object.keys(filters) as (keyof FilterValues)[]).filter((key) => filters[key] !== state.filters[key]).every((key) => TYPED.has(key));
    update((current) => ({ ...current, filters, page: 1 }), typed ? 'replace' : 'push');
  };
  const columns = useMemo(
    () => captureColumns({ onDelete: (capture) => setToDelete([capture]), onTag: (tag) => update((current) => ({ ...current, filters: { ...current.filters, tag }, page: 1 }), 'push') }),
    [update],
  );

  const { query, params, list, selected, clearSelection, view } = useServerTable({
    queryKey: 'captures',
    urlState,
    initialState,
    initialList,
    toParams: captureListParams,
    fetchList: fetchCaptureList,
    rowsOf: (page: CaptureList) => page.items,
    columns,
    getRowId: (capture) => capture.id,
    sorting: urlSorting(urlState),
    canSelect: (capture) => capture.permissions.delete,
  });

  async function confirmDelete() {
    if (!toDelete) return;
    setDeleting(true);
    setDeleteError(null);
    try {
      if (toDelete.length === 1) {
        await removeOne.mutateAsync(toDelete[0].id);
        setNotice(`Deleted "${toDelete[0].name}".`);
      } else {
        const result = await removeMany.mutateAsync(toDelete.map((c) => c.id));
        const refused = result.refused.length;
        setNotice(`Deleted ${result.deleted.length} ${result.deleted.length === 1 ? 'capture' : 'captures'}${refused ? `; ${refused} refused (not yours, or already gone)` : ''}.`);
      }
    } catch (failure) {
      setDeleteError((failure as Error).message);
      return;
    } finally {
      setDeleting(false);
    }
    // The mutations refresh the list.
    setToDelete(null);
    clearSelection();
  }

  return (
    <section aria-label="Captures" className="space-y-4" data-testid="captures-table" data-loading={query.isFetching || undefined}>
      <div className="rounded-lg border border-line bg-panel p-4">
        <CaptureFilters values={state.filters} onChange={changeFilters} />
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
        <TableNotice tone="ok" onDismiss={() => setNotice(null)}>
          {notice}
        </TableNotice>
      )}

      <ServerTableView
        {...view}
        noun="captures"
        caption={`Captures, sorted by ${params.sort} ${params.order === 'asc' ? 'ascending' : 'descending'}`}
        empty={hasFilters(settled.filters) ? 'No capture matches these filters.' : 'No captures yet: upload a recording or synthesize one.'}
        pageSizes={CAPTURE_PAGE_SIZES}
        cellPadding="px-2.5 py-2"
        cellAlign="top"
        rowAttributes={(capture) => ({ 'data-capture-id': capture.id })}
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

export default withQueryClient(CapturesTable, 10_000);
