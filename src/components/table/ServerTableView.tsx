import type { ReactNode } from 'react';
import { flexRender, type Row, type Table } from '@tanstack/react-table';
import { TablePager } from '../TablePager';
import type { PagedList } from './useServerTable';

export interface ServerTableViewProps<T> {
  table: Table<T>;
  /** The page on screen as the endpoint answered it. */
  list: PagedList;
  /** What is listed, plural ("captures"), for the pager's label. */
  noun: string;
  /** Screen-reader caption: what the table holds and its order. */
  caption: string;
  /** Shown in place of rows when the page is empty. */
  empty: ReactNode;
  /** A newer page is loading while the previous one is shown. */
  refreshing: boolean;
  error: Error | null;
  pageSizes: readonly number[];
  onPageSize: (size: number) => void;
  /** Padding of header and body cells (Tailwind classes). */
  cellPadding: string;
  /** Vertical alignment of body cells: top for rows of wrapped text, middle for one-line rows. */
  cellAlign: 'top' | 'middle';
  /** data-* attributes of a row, for tests and styles. */
  rowAttributes: (row: T) => Record<`data-${string}`, string>;
}

function isNumeric(meta: unknown): boolean {
  return Boolean((meta as { numeric?: boolean } | undefined)?.numeric);
}

function SortableHeader<T>({ header }: { header: ReturnType<Table<T>['getFlatHeaders']>[number] }) {
  const sorted = header.column.getIsSorted();
  return (
    <button type="button" onClick={header.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 uppercase hover:text-ink">
      {flexRender(header.column.columnDef.header, header.getContext())}
      <span aria-hidden="true" className={sorted ? 'text-accent' : 'opacity-40'}>
        {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}
      </span>
    </button>
  );
}

function BodyRow<T>({ row, cellClass, attributes }: { row: Row<T>; cellClass: string; attributes: Record<string, string> }) {
  return (
    <tr className={'border-b border-line last:border-b-0 ' + (row.getIsSelected() ? 'bg-accent/5' : 'hover:bg-surface')} {...attributes}>
      {row.getVisibleCells().map((cell) => (
        <td key={cell.id} className={cellClass + (isNumeric(cell.column.columnDef.meta) ? ' text-right' : '')}>
          {flexRender(cell.column.columnDef.cell, cell.getContext())}
        </td>
      ))}
    </tr>
  );
}

/** A server-paged table: load error, header (sortable where the table sorts), rows or the empty message, pager. */
export function ServerTableView<T>(props: ServerTableViewProps<T>) {
  const { table, list } = props;
  const cellClass = `${props.cellPadding} ${props.cellAlign === 'top' ? 'align-top' : 'align-middle'}`;
  const rows = table.getRowModel().rows;
  return (
    <>
      {props.error && (
        <p role="alert" className="rounded-md border border-danger/40 bg-danger/10 px-3 py-2 text-sm text-danger">
          The list could not be loaded: {props.error.message}
        </p>
      )}
      {/* relative: a header's sr-only text is absolutely placed and must stay inside the scroll box. */}
      <div className="relative overflow-x-auto rounded-lg border border-line bg-panel">
        <table className="w-full whitespace-nowrap text-sm">
          <caption className="sr-only">{props.caption}</caption>
          <thead className="border-b border-line text-left text-xs uppercase tracking-wide text-muted">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                      className={props.cellPadding + ' font-medium' + (isNumeric(header.column.columnDef.meta) ? ' text-right' : '')}
                    >
                      {header.column.getCanSort() ? <SortableHeader header={header} /> : flexRender(header.column.columnDef.header, header.getContext())}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody className={props.refreshing ? 'opacity-70' : undefined}>
            {rows.map((row) => (
              <BodyRow key={row.id} row={row} cellClass={cellClass} attributes={props.rowAttributes(row.original)} />
            ))}
            {rows.length === 0 && (
              <tr>
                <td colSpan={table.getVisibleLeafColumns().length} className="whitespace-normal px-3 py-10 text-center text-muted">
                  {props.empty}
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      <TablePager
        noun={props.noun}
        page={list.page}
        pageSize={list.pageSize}
        total={list.total}
        pageSizes={props.pageSizes}
        onPageSize={props.onPageSize}
        canPrevious={table.getCanPreviousPage()}
        canNext={table.getCanNextPage()}
        onPrevious={() => table.previousPage()}
        onNext={() => table.nextPage()}
      />
    </>
  );
}
