import { useState } from 'react';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import type { Problem } from '../../../../shared/imports/api.js';
import { Button, ErrorState, Loading } from '../../../components/ui.js';
import { problemsXlsxUrl, useProblems } from '../api/imports.js';

const col = createColumnHelper<Problem>();
const COLUMNS = [
  col.accessor('severity', { header: 'Severity', cell: (c) => <span className={c.getValue() === 'error' ? 'font-semibold text-danger' : 'text-ochre'}>{c.getValue() === 'error' ? 'Error' : 'Warning'}</span> }),
  col.accessor('sheet', { header: 'Sheet' }),
  col.accessor('row', { header: 'Row' }),
  col.accessor('cell', { header: 'Cell' }),
  col.accessor('column', { header: 'Column' }),
  col.accessor('value', { header: 'Value', cell: (c) => c.getValue() ?? <span className="text-muted">—</span> }),
  col.accessor('message', { header: 'Problem' }),
  col.accessor('hint', { header: 'How to fix' }),
];
const PAGE = 50;

/** The problems of a dry run (server-paged), with the xlsx download of them. */
export function ProblemsTable({ importId, total }: { importId: string; total: number }) {
  const [page, setPage] = useState(1);
  const q = useProblems(importId, page, PAGE, total > 0);
  const table = useReactTable({ data: q.data?.items ?? [], columns: COLUMNS, getCoreRowModel: getCoreRowModel(), manualPagination: true, pageCount: Math.ceil((q.data?.total ?? 0) / PAGE) });
  if (!total) return <p className="text-sm text-ok">No problems: every row passed.</p>;
  if (q.isLoading) return <Loading what="the problems" />;
  if (q.error) return <ErrorState error={q.error} retry={() => q.refetch()} />;
  const pages = table.getPageCount();
  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="text-sm tabular-nums">{total.toLocaleString()} problem{total === 1 ? '' : 's'}{q.data && q.data.stored < total ? ` (the first ${q.data.stored.toLocaleString()} are listed)` : ''}</p>
        <a className="text-sm font-semibold text-accent hover:underline" href={problemsXlsxUrl(importId)} download>Download the problems (.xlsx, offending cells highlighted)</a>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full text-sm">
          <caption className="sr-only">Problems found by the dry run</caption>
          <thead>{table.getHeaderGroups().map((g) => <tr key={g.id} className="border-b border-line text-left">{g.headers.map((h) => <th key={h.id} scope="col" className="px-2 py-1">{flexRender(h.column.columnDef.header, h.getContext())}</th>)}</tr>)}</thead>
          <tbody>{table.getRowModel().rows.map((r) => <tr key={r.id} className="border-b border-line align-top">{r.getVisibleCells().map((c) => <td key={c.id} className="px-2 py-1 tabular-nums">{flexRender(c.column.columnDef.cell, c.getContext())}</td>)}</tr>)}</tbody>
        </table>
      </div>
      {pages > 1 && (
        <div className="flex items-center gap-2 text-sm">
          <Button variant="secondary" disabled={page <= 1} onClick={() => setPage((p) => p - 1)}>Previous</Button>
          <span className="tabular-nums">Page {page} of {pages}</span>
          <Button variant="secondary" disabled={page >= pages} onClick={() => setPage((p) => p + 1)}>Next</Button>
        </div>
      )}
    </div>
  );
}
