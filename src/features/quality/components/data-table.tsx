/**
 * A small TanStack Table (the server has already paged, sorted and filtered: manual mode) with
 * a caption for screen readers and tabular numerals.
 */
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef } from '@tanstack/react-table';

export function DataTable<T>({ data, columns, caption, getRowId }: { data: T[]; columns: ColumnDef<T, any>[]; caption: string; getRowId?: (row: T, i: number) => string }) {
  const table = useReactTable({ data, columns, getCoreRowModel: getCoreRowModel(), manualPagination: true, manualSorting: true, manualFiltering: true, getRowId });
  return (
    <div className="overflow-x-auto" tabIndex={0} role="region" aria-label={caption}>
      <table className="w-full text-left text-sm tabular">
        <caption className="sr-only">{caption}</caption>
        <thead className="border-b border-line text-muted">
          {table.getHeaderGroups().map((g) => (
            <tr key={g.id}>{g.headers.map((h) => <th key={h.id} scope="col" className="py-1 pr-3 font-semibold">{h.isPlaceholder ? null : flexRender(h.column.columnDef.header, h.getContext())}</th>)}</tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((r) => (
            <tr key={r.id} className="border-b border-line/60 align-top">{r.getVisibleCells().map((c) => <td key={c.id} className="py-1 pr-3">{flexRender(c.column.columnDef.cell, c.getContext())}</td>)}</tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
