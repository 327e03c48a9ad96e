import { useSearchParams } from 'react-router-dom';
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef } from '@tanstack/react-table';
import type { ExportAuditEntry } from '../../../shared/exports/schemas.js';
import { Button, EmptyState, ErrorState, Loading, PageHeader, Panel } from '../../components/ui.js';
import { EXPORT_AUDIT_CSV_URL, useExportAudit } from './api/get-export-audit.js';

const ACTION_LABELS: Record<string, string> = {
  'export-request': 'Requested', 'export-approve': 'Approved', 'export-decline': 'Declined', 'export-generate': 'File generated', 'export-generate-failed': 'Generation failed',
  'export-download': 'Downloaded', 'export-download-refused': 'Download refused', 'export-expire': 'File deleted (expired)', 'export-audit-export': 'Audit log exported',
};

const COLUMNS: ColumnDef<ExportAuditEntry>[] = [
  { id: 'at', header: 'When', cell: ({ row }) => <span className="tabular-nums">{new Date(row.original.at).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'medium' })}</span> },
  { id: 'action', header: 'Event', cell: ({ row }) => ACTION_LABELS[row.original.action] ?? row.original.action },
  { id: 'actor', header: 'Who', cell: ({ row }) => row.original.actorEmail ?? 'the system (job or schedule)' },
  { id: 'request', header: 'Request', cell: ({ row }) => <code className="text-xs">{row.original.requestId?.slice(0, 8) ?? '—'}</code> },
  { id: 'reason', header: 'Reason or details', cell: ({ row }) => row.original.reason ?? (row.original.details ? Object.entries(row.original.details).filter(([, v]) => v !== null && typeof v !== 'object').map(([k, v]) => `${k}: ${String(v)}`).join(' · ') : '') },
];

export function ExportAuditPage() {
  const [params, setParams] = useSearchParams();
  const page = Math.max(1, Number(params.get('page') ?? 1) || 1);
  const pageSize = 50;
  const q = useExportAudit({ page, pageSize });
  const pageCount = q.data ? Math.max(1, Math.ceil(q.data.total / pageSize)) : 1;
  const table = useReactTable({ data: q.data?.items ?? [], columns: COLUMNS, getCoreRowModel: getCoreRowModel(), manualPagination: true, pageCount });
  const go = (p: number) => setParams({ page: String(p) });
  return (
    <div>
      <PageHeader title="Export audit log" subtitle="Every request, decision, generation, download and deletion of a research export." actions={<a className="rounded border border-line bg-panel px-3 py-1.5 text-sm font-semibold hover:border-accent" href={EXPORT_AUDIT_CSV_URL} download>Download as CSV</a>} />
      <Panel>
        {q.isPending && <Loading what="the audit log" />}
        {q.error && <ErrorState error={q.error} retry={() => q.refetch()} />}
        {q.data && q.data.total === 0 && <EmptyState title="No export events yet" />}
        {q.data && q.data.total > 0 && (
          <>
            <div className="overflow-x-auto">
              <table className="w-full text-left text-sm">
                <thead className="border-b border-line text-muted">{table.getHeaderGroups().map((g) => <tr key={g.id}>{g.headers.map((h) => <th key={h.id} scope="col" className="py-2 pr-3 font-semibold">{flexRender(h.column.columnDef.header, h.getContext())}</th>)}</tr>)}</thead>
                <tbody>{table.getRowModel().rows.map((r) => <tr key={r.id} className="border-b border-line/60 align-top">{r.getVisibleCells().map((c) => <td key={c.id} className="py-1.5 pr-3">{flexRender(c.column.columnDef.cell, c.getContext())}</td>)}</tr>)}</tbody>
              </table>
            </div>
            <nav aria-label="Pages" className="mt-3 flex items-center gap-3 text-sm">
              <Button variant="secondary" onClick={() => go(page - 1)} disabled={page <= 1}>Previous</Button>
              <span className="tabular-nums">Page {page} of {pageCount} · {q.data.total.toLocaleString('en')} events</span>
              <Button variant="secondary" onClick={() => go(page + 1)} disabled={page >= pageCount}>Next</Button>
            </nav>
          </>
        )}
      </Panel>
    </div>
  );
}
