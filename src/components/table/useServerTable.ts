/**
 * The part every server-paged list shares: one query per page asked for (the previous page stays
 * on screen while the next loads), the server-rendered first page used without a request, paging
 * and sorting routed to the list's state, row selection, and a step back when a page has emptied.
 */
import { useEffect, useMemo, useState } from 'react';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { getCoreRowModel, useReactTable, type ColumnDef, type RowSelectionState, type SortingState, type Updater } from '@tanstack/react-table';
import type { UrlState } from './useUrlState';

/** What a page of any list endpoint says about paging. */
export interface PagedList {
  total: number;
  /** 1-based. */
  page: number;
  pageSize: number;
}

/** The paging part of a list's state. */
export interface PageState {
  /** 1-based. */
  page: number;
  /** Rows per page. */
  pageSize: number;
}

export interface ServerTableOptions<Row, State extends PageState, Params, List extends PagedList> {
  /** First element of the query key; `['captures']` invalidates every page. */
  queryKey: string;
  /** The list's state in the URL; paging writes to it. */
  urlState: UrlState<State>;
  /** The state the server rendered `initialList` for. */
  initialState: State;
  initialList: List;
  /** The list request for a state (a stable function: module level). */
  toParams: (state: State) => Params;
  fetchList: (params: Params) => Promise<List>;
  rowsOf: (list: List) => Row[];
  columns: ColumnDef<Row, any>[];
  getRowId: (row: Row) => string;
  /** Server-side sort, when the list has one. */
  sorting?: { state: SortingState; onChange: (next: SortingState) => void };
  canSelect: (row: Row) => boolean;
  /**
   * Keep selected rows whole through paging and refreshes (choosing runs to compare); otherwise
   * the selection is the rows on screen and empties when another page or filter is asked for.
   */
  selectionAcrossPages?: boolean;
  /** Poll interval (ms) for the page just answered, or false. */
  refetchInterval?: (list: List | undefined) => number | false;
}

function resolve<T>(updater: Updater<T>, current: T): T {
  return typeof updater === 'function' ? (updater as (old: T) => T)(current) : updater;
}

/** Query, TanStack table and selection of one server-paged list. */
export function useServerTable<Row, State extends PageState, Params, List extends PagedList>(options: ServerTableOptions<Row, State, Params, List>) {
  const { urlState, toParams, initialList } = options;
  const { state, update } = urlState;
  const params = useMemo(() => toParams(urlState.settled), [toParams, urlState.settled]);
  const requestKey = JSON.stringify(params);
  const [initialKey] = useState(() => JSON.stringify(toParams(options.initialState)));
  const isInitial = requestKey === initialKey;
  const goTo = (page: number, pageSize: number, mode: 'push' | 'replace') => update((current) => ({ ...current, page, pageSize }), mode);

  const query = useQuery({
    queryKey: [options.queryKey, params],
    queryFn: () => options.fetchList(params),
    placeholderData: keepPreviousData,
    initialData: isInitial ? initialList : undefined,
    initialDataUpdatedAt: isInitial ? Date.now() : undefined,
    refetchInterval: options.refetchInterval ? (q) => options.refetchInterval!(q.state.data) : undefined,
  });
  const list = query.data ?? initialList;
  const rows = options.rowsOf(list);

  // Selection is stored with the request it was made on, so another request starts empty.
  const scope = options.selectionAcrossPages ? '' : requestKey;
  const [picked, setPicked] = useState<{ scope: string; ids: RowSelectionState; rows: Record<string, Row> }>({ scope, ids: {}, rows: {} });
  const current = picked.scope === scope ? picked : { scope, ids: {}, rows: {} };

  const pagination = { pageIndex: state.page - 1, pageSize: state.pageSize };
  const table = useReactTable({
    data: rows,
    columns: options.columns,
    getRowId: options.getRowId,
    getCoreRowModel: getCoreRowModel(),
    manualPagination: true,
    manualSorting: true,
    rowCount: list.total,
    enableSorting: options.sorting !== undefined,
    enableSortingRemoval: false,
    enableRowSelection: (row) => options.canSelect(row.original),
    state: { pagination, rowSelection: current.ids, ...(options.sorting ? { sorting: options.sorting.state } : {}) },
    onPaginationChange: (updater) => {
      const next = resolve(updater, pagination);
      goTo(next.pageIndex + 1, next.pageSize, 'push');
    },
    onSortingChange: (updater) => options.sorting?.onChange(resolve(updater, options.sorting.state)),
    onRowSelectionChange: (updater) => {
      const ids = resolve(updater, current.ids);
      const kept: Record<string, Row> = {};
      for (const id of Object.keys(ids)) {
        const row = current.rows[id] ?? rows.find((r) => options.getRowId(r) === id);
        if (ids[id] && row) kept[id] = row;
      }
      setPicked({ scope, ids, rows: kept });
    },
  });

  // A page past the end (rows deleted, or an old link) steps back to the last page there is.
  const lastPage = Math.max(1, Math.ceil(list.total / list.pageSize));
  const pastEnd = !query.isPlaceholderData && rows.length === 0 && list.page > lastPage;
  useEffect(() => {
    if (pastEnd) goTo(lastPage, state.pageSize, 'replace');
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [pastEnd, lastPage]);

  return {
    query,
    /** The list request on screen. */
    params,
    list,
    rows,
    table,
    /** Selected rows: on screen, or kept across pages with `selectionAcrossPages`. */
    selected: Object.values(current.rows),
    clearSelection: () => setPicked({ scope, ids: {}, rows: {} }),
    /** The props of ServerTableView that come from the query and the table. */
    view: {
      table,
      list,
      refreshing: query.isPlaceholderData,
      error: query.isError ? (query.error as Error) : null,
      /** A new page size starts again at page 1. */
      onPageSize: (pageSize: number) => goTo(1, pageSize, 'push'),
    },
  };
}
