/**
 * Columns of the captures table. Sorting happens on the server, so only the columns the list
 * endpoint sorts by (name, created, size, sample rate) offer it; a sortable column's id is the
 * endpoint's sort key.
 */
import { createColumnHelper, type ColumnDef } from '@tanstack/react-table';
import { Quantity } from '../Quantity';
import { buttonSmall } from '../ui';
import { LAYOUT_LABELS, type Capture } from './types';

const column = createColumnHelper<Capture>();

/** What a row's controls can ask the table to do. */
export interface RowActions {
  onDelete: (capture: Capture) => void;
  onTag: (tag: string) => void;
}

export function captureColumns(actions: RowActions): ColumnDef<Capture, any>[] {
  return [
    column.display({
      id: 'select',
      header: ({ table }) => (
        <input
          type="checkbox"
          aria-label="Select every capture on this page"
          className="h-4 w-4 accent-[rgb(var(--q-accent))]"
          checked={table.getIsAllPageRowsSelected()}
          ref={(el) => {
            if (el) el.indeterminate = table.getIsSomePageRowsSelected();
          }}
          onChange={table.getToggleAllPageRowsSelectedHandler()}
        />
      ),
      cell: ({ row }) => (
        <input
          type="checkbox"
          aria-label={`Select ${row.original.name}`}
          className="h-4 w-4 accent-[rgb(var(--q-accent))]"
          checked={row.getIsSelected()}
          disabled={!row.getCanSelect()}
          title={row.getCanSelect() ? undefined : 'Only the owner or an admin may delete this capture.'}
          onChange={row.getToggleSelectedHandler()}
        />
      ),
    }),
    column.accessor('name', {
      header: 'Name',
      cell: ({ row }) => (
        <div className="min-w-[12rem] max-w-[28rem] whitespace-normal">
          <a href={`/captures/${row.original.id}`} className="font-medium text-ink hover:text-accent hover:underline">
            {row.original.name}
          </a>
          <div className="mt-0.5 flex flex-wrap gap-x-2 text-xs text-muted">
            {row.original.source === 'synthesized' && <span>synthesized</span>}
            {row.original.visibility === 'private' && <span>private</span>}
          </div>
        </div>
      ),
    }),
    column.accessor((c) => c.owner.name, { id: 'owner', header: 'Owner', enableSorting: false, cell: ({ getValue }) => <span className="block min-w-[5rem] whitespace-normal">{getValue()}</span> }),
    column.accessor('layout', { header: 'Layout', enableSorting: false, cell: ({ getValue }) => <span className="block min-w-[5rem] whitespace-normal">{LAYOUT_LABELS[getValue() as Capture['layout']]}</span> }),
    column.accessor('datatype', { header: 'Datatype', enableSorting: false, cell: ({ getValue }) => <span className="font-mono text-xs">{getValue()}</span> }),
    column.accessor('sampleRate', { header: 'Sample rate', cell: ({ getValue }) => <Quantity value={getValue()} unit="sps" />, meta: { numeric: true } }),
    column.accessor('centerFrequency', {
      header: 'Centre freq.',
      enableSorting: false,
      cell: ({ getValue }) => (getValue() === null ? <span className="text-muted">—</span> : <Quantity value={getValue()} unit="Hz" significant={6} />),
      meta: { numeric: true },
    }),
    column.accessor('durationSeconds', { header: 'Duration', enableSorting: false, cell: ({ getValue }) => <Quantity value={getValue()} unit="s" />, meta: { numeric: true } }),
    column.accessor('byteSize', { header: 'Size', cell: ({ getValue }) => <Quantity value={getValue()} unit="B" />, meta: { numeric: true } }),
    column.accessor('tags', {
      header: 'Tags',
      enableSorting: false,
      cell: ({ getValue }) => (
        <div className="flex min-w-[7.5rem] max-w-[18rem] flex-wrap gap-1 whitespace-normal">
          {(getValue() as string[]).map((tag) => (
            <button
              key={tag}
              type="button"
              onClick={() => actions.onTag(tag)}
              title={`Show only captures tagged ${tag}`}
              className="rounded bg-accent/10 px-1.5 py-0.5 text-xs text-accent hover:bg-accent/20"
            >
              {tag}
            </button>
          ))}
        </div>
      ),
    }),
    column.accessor('createdAt', {
      header: 'Created (UTC)',
      // Date over time keeps the column narrow enough for the table to fit beside the upload panel.
      cell: ({ getValue }) => (
        <span className="block font-mono text-xs leading-5 tabular-nums" title={getValue()}>
          {String(getValue()).slice(0, 10)}
          <span className="block text-muted">{String(getValue()).slice(11, 16)}</span>
        </span>
      ),
    }),
    column.display({
      id: 'actions',
      header: () => <span className="sr-only">Actions</span>,
      cell: ({ row }) =>
        row.original.permissions.delete ? (
          <button type="button" className={buttonSmall} onClick={() => actions.onDelete(row.original)} aria-label={`Delete ${row.original.name}`}>
            Delete
          </button>
        ) : null,
    }),
  ];
}
