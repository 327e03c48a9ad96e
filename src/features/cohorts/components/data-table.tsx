import { flexRender, getCoreRowModel, useReactTable, type ColumnDef } from '@tanstack/react-table';

/**
 * A small results table (TanStack Table): the server already aggregated and ordered the rows,
 * so no client sorting or paging (manual mode); numbers right-aligned in tabular numerals.
 */
export function DataTable<T>({ columns, data, caption }: { columns: ColumnDef<T, unknown>[]; data: T[]; caption: string }) {
  const table = useReactTable({ data, columns, getCoreRowModel: getCoreRowModel(), manualSorting: true, manualPagination: true });
  return (
    <div className="overflow-x-auto print:overflow-visible" tabIndex={0} role="region" aria-label={`${caption} (scrolls sideways)`}>
      <table className="w-full border-collapse text-sm">
        <caption className="mb-1 text-left text-sm font-semibold">{caption}</caption>
        <thead>
          {table.getHeaderGroups().map((hg) => (
            <tr key={hg.id} className="border-b border-line text-left">
              {hg.headers.map((h) => <th key={h.id} scope="col" className="px-2 py-1 font-semibold">{flexRender(h.column.columnDef.header, h.getContext())}</th>)}
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((r) => (
            <tr key={r.id} className="border-b border-line/60 align-top">
              {r.getVisibleCells().map((c) => <td key={c.id} className="tabular px-2 py-1 first:min-w-40 [&:not(:first-child)]:whitespace-nowrap print:whitespace-normal">{flexRender(c.column.columnDef.cell, c.getContext())}</td>)}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
