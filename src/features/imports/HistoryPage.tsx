import { useState } from 'react';
import { Link } from 'react-router-dom';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import type { ImportView } from '../../../shared/imports/api.js';
import { Button, EmptyState, ErrorState, Loading, PageHeader } from '../../components/ui.js';
import { useImports } from './api/imports.js';
import { importPaths } from './paths.js';

const col = createColumnHelper<ImportView>();
const COLUMNS = [
  col.accessor('createdAt', { header: 'When', cell: (c) => new Date(c.getValue()).toLocaleString() }),
  col.accessor('createdByEmail', { header: 'Who' }),
  col.accessor('siteCode', { header: 'Site' }),
  col.accessor('fileName', { header: 'File', cell: (c) => <Link className="font-semibold text-accent hover:underline" to={importPaths.detail(c.row.original.id)}>{c.getValue()}</Link> }),
  col.accessor('fileHash', { header: 'SHA-256', cell: (c) => <code title={c.getValue()}>{c.getValue().slice(0, 12)}…</code> }),
  col.accessor('status', { header: 'Outcome' }),
  col.display({ id: 'counts', header: 'New / updated / unchanged / rejected', cell: (c) => { const k = c.row.original.counts; return k ? `${k.new} / ${k.updated} / ${k.unchanged} / ${k.rejected}` : '—'; } }),
  col.accessor('problemCount', { header: 'Problems' }),
];
const PAGE = 25;

/** Every import of the user's sites: who, when, file name and hash, counts, outcome. */
export function HistoryPage() {
  const [page, setPage] = useState(1);
  const q = useImports(page, PAGE);
  const table = useReactTable({ data: q.data?.items ?? [], columns: COLUMNS, getCoreRowModel: getCoreRowModel(), manualPagination: true, pageCount: Math.ceil((q.data?.total ?? 0) / PAGE) });
  return (
    <div className="flex flex-col gap-4">
      <PageHeader title="Import history" subtitle="Each import of your sites, with its file hash, counts and outcome; open one to read its problems again." actions={<Link className="text-sm font-semibold text-accent hover:underline" to={importPaths.start}>New import</Link>} />
      {q.isLoading && <Loading what="the imports" />}
      {q.error && <ErrorState error={q.error} retry={() => q.refetch()} />}
      {q.data && !q.data.total && <EmptyState title="No imports yet" />}
      {!!q.data?.total && (
        <div className="overflow-x-auto">
          <table className="w-full text-sm tabular-nums">
            <caption className="sr-only">Imports, newest first</caption>
            <thead>{table.getHeaderGroups().map((g) => <tr key={g.id} className="border-b border-line text-left">{g.headers.map((h) => <th key={h.id} scope="col" className="px-2 py-1">{flexRender(h.column.columnDef.header, h.getContext())}</th>)}</tr>)}</thead>
            <tbody>{table.getRowModel().rows.map((r) => <tr key={r.id} className="border-b border-line">{r.getVisibleCells().map((c) => <td key={c.id} className="px-2 py-1">{flexRender(c.column.columnDef.cell, c.getContext())}</td>)}</tr>)}</tbody>
          </table>
        </div>
      )}
      {table.getPageCount() > 1 && (
        <div className="flex items-center gap-2 text-sm">
          <Button variant="secondary" disabled={page <= 1} onClick={() => setPage((p) => p - 1)}>Previous</Button>
          <span>Page {page} of {table.getPageCount()}</span>
          <Button variant="secondary" disabled={page >= table.getPageCount()} onClick={() => setPage((p) => p + 1)}>Next</Button>
        </div>
      )}
    </div>
  );
}
