import { useMemo } from 'react';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { ReadoutValue } from './ReadoutValue';
import type { TestPoint } from './types';
import { readoutNote } from './readout-notes';

/** One measurement of one probe. */
export interface ReadoutRow {
  probe: string;
  name: string;
  value: number | null;
  unit: string;
  /** Why there is no value, or the caveats on the value ('' when none). */
  note: string;
  reason?: string;
}

/** Every readout of every test point, in chain order. */
export function readoutRows(testPoints: TestPoint[]): ReadoutRow[] {
  return testPoints.flatMap((point) => point.readouts.map((r) => ({ probe: point.stageId, name: r.name, value: r.value, unit: r.unit, note: readoutNote(r), reason: r.reason })));
}

const column = createColumnHelper<ReadoutRow>();

const columns = [
  column.accessor('probe', {
    header: 'Probe',
    cell: ({ getValue, row, table }) => {
      // The probe is named once, on the first of its rows.
      const rows = table.getRowModel().rows;
      const previous = rows[row.index - 1];
      return previous && previous.original.probe === getValue() ? null : <span className="font-mono text-xs text-muted">{getValue()}</span>;
    },
  }),
  column.accessor('name', {
    header: 'Measurement',
    cell: ({ row }) => (
      <span className="whitespace-normal">
        {row.original.name}
        {row.original.note && <span className="block text-xs text-muted" data-testid="readout-note">{row.original.note}</span>}
      </span>
    ),
  }),
  column.accessor('value', {
    header: 'Value',
    cell: ({ row }) => <ReadoutValue value={row.original.value} unit={row.original.unit} reason={row.original.reason} />,
    meta: { numeric: true },
  }),
];

/** The readouts of a run, one row per measurement, values with their units in the monospace face. */
export function ReadoutsTable({ testPoints }: { testPoints: TestPoint[] }) {
  const data = useMemo(() => readoutRows(testPoints), [testPoints]);
  const table = useReactTable({ data, columns, getCoreRowModel: getCoreRowModel() });
  if (data.length === 0) return <p className="text-sm text-muted">This chain marks no measuring stage as a probe, so the run has no readouts.</p>;
  return (
    <table className="w-full text-sm" data-testid="readouts-table">
      <caption className="sr-only">Readouts of the run</caption>
      <thead className="border-b border-line text-left text-xs uppercase tracking-wide text-muted">
        {table.getHeaderGroups().map((group) => (
          <tr key={group.id}>
            {group.headers.map((header) => (
              <th
                key={header.id}
                scope="col"
                className={
                  'py-1.5 pr-3 font-medium last:pr-0 ' + ((header.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric ? 'text-right' : '')
                }
              >
                {flexRender(header.column.columnDef.header, header.getContext())}
              </th>
            ))}
          </tr>
        ))}
      </thead>
      <tbody>
        {table.getRowModel().rows.map((row) => (
          <tr key={row.id} className="border-b border-line/60 last:border-0" data-readout={row.original.name}>
            {row.getVisibleCells().map((cell) => (
              <td
                key={cell.id}
                className={
                  'py-1.5 pr-3 align-baseline last:pr-0 ' + ((cell.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric ? 'text-right' : '')
                }
              >
                {flexRender(cell.column.columnDef.cell, cell.getContext())}
              </td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
