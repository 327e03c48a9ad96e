/**
 * Case capture: the site's theatre list (eligible operations) against the registry, per month,
 * and the operations still missing from it, listed for abstraction. Uploading a list sends the
 * file to the server, which keeps only keyed hashes of the identifiers.
 */
import { useRef, useState, type FormEvent } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import type { ColumnDef } from '@tanstack/react-table';
import type { CaptureMonth, CaptureReport } from '../../../shared/quality/capture.js';
import { THEATRE_LIST_COLUMNS } from '../../../shared/quality/capture.js';
import { PROCEDURE_CATEGORY_LABELS, type ProcedureCategory } from '../../../shared/clinical/codes.js';
import { Button, EmptyState, ErrorState, Field, inputClass, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { getErrorMessage, ApiError } from '../../lib/api-client.js';
import { paths } from '../../lib/paths.js';
import { useSession } from '../../lib/session.js';
import { useCapture } from './api/get-capture.js';
import { useUploadTheatreList } from './api/upload-theatre-list.js';
import { DataTable } from './components/data-table.js';
import { count, pct } from './components/format.js';
import { SiteSelect } from './components/site-select.js';

const monthColumns: ColumnDef<CaptureMonth>[] = [
  { header: 'Site', accessorKey: 'siteCode' },
  { header: 'Month', cell: ({ row }) => <span className="whitespace-nowrap">{row.original.month}</span> },
  { header: 'On the list', cell: ({ row }) => count(row.original.listed) },
  { header: 'Matched by identifier', cell: ({ row }) => count(row.original.matchedByIdentifier) },
  { header: 'Matched by date and category', cell: ({ row }) => count(row.original.matchedByDate) },
  { header: 'Missing', cell: ({ row }) => <span className={row.original.missing ? 'font-semibold text-danger' : ''}>{count(row.original.missing)}</span> },
  { header: 'Captured', cell: ({ row }) => <span className="font-semibold">{pct(row.original.capture)}</span> },
  { header: 'In the registry, not on the list', cell: ({ row }) => count(row.original.notOnList) },
];

const missingColumns: ColumnDef<CaptureReport['missing'][number]>[] = [
  { header: 'Site', accessorKey: 'siteCode' },
  { header: 'Operation date', cell: ({ row }) => <span className="whitespace-nowrap">{row.original.operationDate}</span> },
  { header: 'Procedure category', cell: ({ row }) => PROCEDURE_CATEGORY_LABELS[row.original.procedureCategory as ProcedureCategory] ?? row.original.procedureCategory },
  { header: 'Month', accessorKey: 'month' },
];

function UploadForm() {
  const [siteId, setSiteId] = useState('');
  const file = useRef<HTMLInputElement>(null);
  const up = useUploadTheatreList();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const f = file.current?.files?.[0];
    if (!siteId || !f) return;
    up.mutate({ siteId, file: f }, { onSuccess: () => { if (file.current) file.current.value = ''; } });
  };
  const err = up.error as ApiError | null;
  return (
    <Panel title="Upload a theatre list">
      <form onSubmit={submit} className="flex flex-wrap items-end gap-4">
        <Field label="Site" htmlFor="cap-up-site"><SiteSelect id="cap-up-site" value={siteId} onChange={setSiteId} allLabel="Choose the site" /></Field>
        <Field label="File (.csv or .xlsx)" htmlFor="cap-up-file" hint={`Columns: ${Object.values(THEATRE_LIST_COLUMNS).map((n) => `"${n[0]}"`).join(', ')}; one operation per row.`}>
          <input id="cap-up-file" ref={file} type="file" accept=".csv,.xlsx" className={inputClass} />
        </Field>
        <Button type="submit" disabled={!siteId || up.isPending}>{up.isPending ? 'Uploading…' : 'Upload'}</Button>
      </form>
      <p className="mt-2 text-xs text-muted">The hospital identifiers are turned into keyed hashes on the server; no identifier is stored or shown. A list for dates already uploaded replaces the earlier one.</p>
      {up.isSuccess && <div className="mt-2"><Notice tone="ok">Saved {count(up.data.rows)} operations from {up.data.fromDate} to {up.data.toDate}{up.data.replaced ? ` (replacing ${count(up.data.replaced)} listed before)` : ''}.</Notice></div>}
      {err && (
        <div role="alert" className="mt-2 rounded border border-danger bg-danger-soft p-3 text-sm text-danger">
          <p>{getErrorMessage(err)}</p>
          {err.fields?.length ? <ul className="mt-1 list-disc pl-5">{err.fields.map((f, i) => <li key={i}>{f.path}: {f.message}</li>)}</ul> : null}
        </div>
      )}
    </Panel>
  );
}

const FIRST = 25;

export function CapturePage() {
  const [allMissing, setAllMissing] = useState(false);
  const [sp, setSp] = useSearchParams();
  const siteId = sp.get('siteId') ?? undefined;
  const from = sp.get('from') ?? undefined;
  const to = sp.get('to') ?? undefined;
  const q = useCapture({ siteId, from, to });
  const user = useSession().data?.user;
  const canUpload = !!user?.roles.some((r) => r === 'admin' || r === 'abstractor');
  const set = (k: string, v: string | undefined) => { const n = new URLSearchParams(sp); if (v) n.set(k, v); else n.delete(k); setSp(n); };
  const r = q.data;
  return (
    <div>
      <PageHeader title="Case capture" subtitle="Eligible operations on the theatre list against the registry's cases, by month" />
      <div className="no-print mb-4 flex flex-wrap items-end gap-4">
        <Field label="Site" htmlFor="cap-site"><SiteSelect id="cap-site" value={siteId ?? ''} onChange={(v) => set('siteId', v || undefined)} /></Field>
        <Field label="From month" htmlFor="cap-from"><input id="cap-from" type="month" className={inputClass} value={from ?? ''} onChange={(e) => set('from', e.target.value || undefined)} /></Field>
        <Field label="To month" htmlFor="cap-to"><input id="cap-to" type="month" className={inputClass} value={to ?? ''} onChange={(e) => set('to', e.target.value || undefined)} /></Field>
      </div>
      <div className="grid gap-4">
        {canUpload && <UploadForm />}
        {q.isLoading && <Loading what="the capture figures" />}
        {q.error && <ErrorState error={q.error} retry={() => q.refetch()} />}
        {r && (
          <>
            <Panel title="Capture by month">
              {r.months.length ? <DataTable caption="Theatre-list operations matched to registry cases, by site and month" data={r.months} columns={monthColumns} getRowId={(m) => `${m.siteId}-${m.month}`} /> : <EmptyState title="No theatre list yet">Upload the site's list of eligible operations to see capture.</EmptyState>}
              <p className="mt-2 text-xs text-muted">Matched by identifier: same keyed hash and surgery date. Matched by date and category: a case without a hash on the same date and procedure category (probable). Withdrawn cases do not count.</p>
            </Panel>
            <Panel title={`Operations missing from the registry (${count(r.missingTotal)})`}>
              {r.missing.length ? (
                <>
                  <DataTable caption="Operations on the theatre list with no registry case" data={allMissing ? r.missing : r.missing.slice(0, FIRST)} columns={missingColumns} getRowId={(m) => m.entryId} />
                  {r.missing.length > FIRST && <Button variant="ghost" className="px-0 text-xs" aria-expanded={allMissing} onClick={() => setAllMissing(!allMissing)}>{allMissing ? `Show the first ${FIRST} only` : `Show all ${r.missing.length} listed`}</Button>}
                  {r.missingTotal > r.missing.length && <p className="mt-1 text-xs text-muted">The first {r.missing.length} of {count(r.missingTotal)} are listed; narrow by site or month.</p>}
                  {canUpload && <p className="mt-2 text-sm"><Link className="text-accent underline" to={paths.cases.create}>Enter a missing case</Link> (find the operation in the theatre system by its date and category).</p>}
                </>
              ) : <EmptyState title="Nothing missing">Every listed operation has a registry case.</EmptyState>}
            </Panel>
            {r.uploads.length > 0 && (
              <Panel title="Recent uploads">
                <DataTable caption="Theatre-list uploads" data={r.uploads} getRowId={(u) => u.id}
                  columns={[
                    { header: 'Site', accessorKey: 'siteCode' },
                    { header: 'Operations', cell: ({ row }) => count(row.original.rows) },
                    { header: 'Dates', cell: ({ row }) => `${row.original.fromDate ?? '—'} to ${row.original.toDate ?? '—'}` },
                    { header: 'Replaced', cell: ({ row }) => count(row.original.replaced) },
                    { header: 'Uploaded', cell: ({ row }) => `${row.original.createdAt.slice(0, 10)}${row.original.createdByEmail ? ` by ${row.original.createdByEmail}` : ' (demo)'}` },
                  ]} />
              </Panel>
            )}
          </>
        )}
      </div>
    </div>
  );
}
