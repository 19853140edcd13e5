/**
 * Columns of the chains table. Sorting happens on the server, so only the columns the list
 * endpoint sorts by (name, revision, updated) offer it; a sortable column's id is the endpoint's
 * sort key.
 */
import { createColumnHelper, type ColumnDef } from '@tanstack/react-table';
import { buttonSmall } from '../ui';
import type { Chain } from '@/contracts/chain';

const column = createColumnHelper<Chain>();

/** What a row's controls can ask the table to do. */
export interface ChainRowActions {
  onFork: (chain: Chain) => void;
}

export function chainColumns(actions: ChainRowActions): ColumnDef<Chain, any>[] {
  return [
    column.accessor('name', {
      header: 'Name',
      cell: ({ row }) => (
        <div className="min-w-[12rem] max-w-xl whitespace-normal">
          <a href={`/chains/${row.original.id}`} className="font-medium hover:text-accent hover:underline">
            {row.original.name}
          </a>
          {row.original.description && <span className="block truncate text-xs text-muted">{row.original.description}</span>}
        </div>
      ),
    }),
    column.accessor((chain) => chain.owner.name, { id: 'owner', header: 'Owner', enableSorting: false, cell: ({ getValue }) => <span className="text-muted">{getValue()}</span> }),
    column.accessor('visibility', {
      header: 'Visibility',
      enableSorting: false,
      cell: ({ getValue }) => (
        <span className={'rounded px-1.5 py-px text-xs ' + (getValue() === 'team' ? 'bg-accent/10 text-accent' : 'bg-muted/15 text-muted')}>{getValue()}</span>
      ),
    }),
    column.accessor('latestRevision', { header: 'Revision', cell: ({ getValue }) => <span className="font-mono">r{getValue()}</span>, meta: { numeric: true } }),
    column.accessor('updatedAt', {
      header: 'Updated (UTC)',
      // The ISO text cut to minutes: the same on the server's first render and in every browser.
      cell: ({ getValue }) => (
        <span className="whitespace-nowrap font-mono text-xs tabular-nums text-muted" title={getValue()}>
          {String(getValue()).slice(0, 10)} {String(getValue()).slice(11, 16)}
        </span>
      ),
    }),
    column.display({
      id: 'actions',
      header: () => <span className="sr-only">Actions</span>,
      cell: ({ row }) =>
        row.original.permissions.fork ? (
          <button type="button" className={buttonSmall} onClick={() => actions.onFork(row.original)} aria-label={`Fork ${row.original.name}`}>
            Fork
          </button>
        ) : null,
    }),
  ];
}
