import { Link } from 'react-router-dom';
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef } from '@tanstack/react-table';
import type { ExportRequestView } from '../../../shared/exports/schemas.js';
import { EmptyState, ErrorState, Loading, PageHeader, Panel } from '../../components/ui.js';
import { paths } from '../../lib/paths.js';
import { useExports } from './api/get-exports.js';
import { ExportProgress, ExportStatus } from './components/export-status.js';

const fmtBytes = (n: number) => (n < 1024 * 1024 ? `${Math.max(1, Math.round(n / 1024))} KB` : `${(n / 1048576).toFixed(1)} MB`);
const fmtDate = (iso: string | null) => (iso ? new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' }) : '—');
const describe = (r: ExportRequestView) =>
  r.kind === 'aggregate' ? `Aggregate table by ${r.rowsBy}${r.colsBy ? ` × ${r.colsBy}` : ''}` : `${r.fields.length} variables + study id`;

const COLUMNS: ColumnDef<ExportRequestView>[] = [
  { id: 'createdAt', header: 'Requested', cell: ({ row }) => fmtDate(row.original.createdAt) },
  { id: 'what', header: 'What', cell: ({ row }) => <span><span className="font-semibold">{describe(row.original)}</span><span className="block text-xs text-muted line-clamp-2">{row.original.purpose}</span></span> },
  { id: 'format', header: 'Format and level', cell: ({ row }) => `${row.original.format.toUpperCase()} · ${row.original.level === 'limited' ? `limited (DUA ${row.original.dua?.reference ?? ''})` : 'de-identified'}` },
  {
    id: 'status', header: 'Status',
    cell: ({ row }) => (
      <div className="flex flex-col gap-1">
        <ExportStatus status={row.original.status} />
        <ExportProgress view={row.original} />
        {row.original.status === 'declined' && row.original.decisionReason && <span className="text-xs">Reason: {row.original.decisionReason}</span>}
        {row.original.status === 'failed' && <span className="text-xs text-danger">{row.original.error}</span>}
      </div>
    ),
  },
  { id: 'expires', header: 'Available until', cell: ({ row }) => (row.original.status === 'ready' ? fmtDate(row.original.expiresAt) : '—') },
  {
    id: 'download', header: 'File',
    cell: ({ row }) => {
      const r = row.original;
      if (!r.file || !r.canDownload) return <span className="text-muted">—</span>;
      return (
        <a className="inline-flex items-center rounded bg-accent px-3 py-1.5 text-sm font-semibold text-white hover:bg-accent-strong" href={`/api/exports/${r.id}/file`} download>
          Download <span className="sr-only">{r.file.name}</span>
          <span className="ml-1 font-normal tabular-nums">({fmtBytes(r.file.bytes)}, {r.file.rows.toLocaleString('en')} rows{r.file.sheets > 1 ? `, ${r.file.sheets} sheets` : ''})</span>
        </a>
      );
    },
  },
];

export function MyExportsPage() {
  const list = useExports('mine');
  const table = useReactTable({ data: list.data?.items ?? [], columns: COLUMNS, getCoreRowModel: getCoreRowModel(), manualPagination: true });
  return (
    <div>
      <PageHeader title="My exports" subtitle="Your dataset requests, their approval, and the files while they are kept. Only you can download your files." actions={<Link className="rounded bg-accent px-3 py-1.5 text-sm font-semibold text-white hover:bg-accent-strong" to={paths.research.request}>Request a dataset</Link>} />
      <Panel>
        {list.isPending && <Loading what="your requests" />}
        {list.error && <ErrorState error={list.error} retry={() => list.refetch()} />}
        {list.data && list.data.items.length === 0 && <EmptyState title="No requests yet">Request a dataset to start; an administrator reviews it.</EmptyState>}
        {list.data && list.data.items.length > 0 && (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <thead className="border-b border-line text-muted">
                {table.getHeaderGroups().map((g) => <tr key={g.id}>{g.headers.map((h) => <th key={h.id} scope="col" className="py-2 pr-3 font-semibold">{flexRender(h.column.columnDef.header, h.getContext())}</th>)}</tr>)}
              </thead>
              <tbody>
                {table.getRowModel().rows.map((r) => <tr key={r.id} className="border-b border-line/60 align-top">{r.getVisibleCells().map((c) => <td key={c.id} className="py-2 pr-3">{flexRender(c.column.columnDef.cell, c.getContext())}</td>)}</tr>)}
              </tbody>
            </table>
          </div>
        )}
      </Panel>
      <p className="mt-3 text-xs text-muted">For surveillance and quality-improvement research only; not for bedside decisions. Never try to re-identify anyone.</p>
    </div>
  );
}
