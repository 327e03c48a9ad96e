/**
 * Definition-consistency findings: run the check (a background job), list what it found by kind,
 * each linked to its case, and mark a finding reviewed with a reason (audited).
 */
import { useEffect, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { useQueryClient } from '@tanstack/react-query';
import type { ColumnDef } from '@tanstack/react-table';
import { FINDING_KINDS, FINDING_KIND_LABELS, LOS_RULE, type Finding, type FindingKind } from '../../../shared/quality/findings.js';
import { Button, ClinicalCaution, EmptyState, ErrorState, Field, inputClass, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { getErrorMessage } from '../../lib/api-client.js';
import { paths } from '../../lib/paths.js';
import { useSession } from '../../lib/session.js';
import { useFindings } from './api/get-findings.js';
import { useReviewFinding } from './api/review-finding.js';
import { getJob, useRunCheck, type JobView } from './api/run-check.js';
import { DataTable } from './components/data-table.js';
import { count } from './components/format.js';
import { SiteSelect } from './components/site-select.js';

function Review({ f }: { f: Finding }) {
  const [reason, setReason] = useState('');
  const m = useReviewFinding();
  if (f.status === 'reviewed') return <span className="text-sm">reviewed by {f.reviewedByEmail ?? '—'}: {f.reviewReason}</span>;
  if (f.status === 'resolved') return <span className="text-sm text-muted">no longer found</span>;
  return (
    <form className="flex flex-wrap items-center gap-2" onSubmit={(e) => { e.preventDefault(); m.mutate({ id: f.id, reason }); }}>
      <input aria-label={`Review reason for ${f.registryNumber}`} className={`${inputClass} w-52`} placeholder="Reason (no identifiers)" value={reason} onChange={(e) => setReason(e.target.value)} />
      <Button type="submit" variant="secondary" disabled={reason.trim().length < 5 || m.isPending}>Mark reviewed</Button>
      {m.error && <span role="alert" className="w-full text-xs text-danger">{getErrorMessage(m.error)}</span>}
    </form>
  );
}

const columns: ColumnDef<Finding>[] = [
  { header: 'Case', cell: ({ row }) => <Link className="whitespace-nowrap font-semibold text-accent hover:underline" to={paths.cases.detail(row.original.caseId)}>{row.original.registryNumber}</Link> },
  { header: 'Site', accessorKey: 'siteCode' },
  { header: 'Kind', cell: ({ row }) => FINDING_KIND_LABELS[row.original.kind] },
  { header: 'What was found', accessorKey: 'message' },
  { header: 'Review', cell: ({ row }) => <Review f={row.original} /> },
];

function useJobPoll(jobId: string | null) {
  const [job, setJob] = useState<JobView | null>(null);
  const qc = useQueryClient();
  useEffect(() => {
    if (!jobId) return;
    let stop = false;
    const tick = async () => {
      const j = await getJob(jobId).catch(() => null);
      if (stop) return;
      setJob(j);
      if (j && (j.status === 'queued' || j.status === 'running')) setTimeout(tick, 1000);
      else qc.invalidateQueries({ queryKey: ['quality', 'findings'] });
    };
    tick();
    return () => { stop = true; };
  }, [jobId, qc]);
  return job;
}

export function FindingsPage() {
  const [sp, setSp] = useSearchParams();
  const siteId = sp.get('siteId') ?? undefined;
  const kind = (sp.get('kind') ?? undefined) as FindingKind | undefined;
  const status = sp.get('status') ?? 'open';
  const page = Number(sp.get('page') ?? 1) || 1;
  const q = useFindings({ siteId, kind, status, page, pageSize: 25 });
  const user = useSession().data?.user;
  const canRun = !!user?.roles.some((r) => r === 'admin' || r === 'analyst');
  const run = useRunCheck();
  const job = useJobPoll(run.data?.jobId ?? null);
  const set = (k: string, v: string | undefined) => { const n = new URLSearchParams(sp); if (v) n.set(k, v); else n.delete(k); if (k !== 'page') n.delete('page'); setSp(n); };
  const r = q.data;
  const pages = r ? Math.max(1, Math.ceil(r.total / r.pageSize)) : 1;
  return (
    <div>
      <PageHeader title="Consistency findings" subtitle={r?.lastRun ? `Last check started ${r.lastRun.at.slice(0, 16).replace('T', ' ')} (${r.lastRun.status})` : 'Contradictions between the records and the definitions'}
        actions={canRun ? <Button onClick={() => run.mutate(siteId ? [siteId] : undefined)} disabled={run.isPending || job?.status === 'running' || job?.status === 'queued'}>Run the check</Button> : undefined} />
      <div className="grid gap-4">
        {job && (
          <Notice tone={job.status === 'succeeded' ? 'ok' : job.status === 'failed' ? 'danger' : 'info'}>
            <span role="status">Check {job.status}{job.progress?.step && job.status !== 'succeeded' ? ` · ${String(job.progress.step)}` : ''}{job.status === 'succeeded' && job.result ? ` · ${String(job.result.findings)} findings` : ''}{job.error ? ` · ${job.error}` : ''}</span>
          </Notice>
        )}
        {run.error && <Notice tone="danger">{getErrorMessage(run.error)}</Notice>}
        <div className="no-print flex flex-wrap items-end gap-4">
          <Field label="Site" htmlFor="fi-site"><SiteSelect id="fi-site" value={siteId ?? ''} onChange={(v) => set('siteId', v || undefined)} /></Field>
          <Field label="Kind" htmlFor="fi-kind">
            <select id="fi-kind" className={inputClass} value={kind ?? ''} onChange={(e) => set('kind', e.target.value || undefined)}>
              <option value="">All kinds</option>
              {FINDING_KINDS.map((k) => <option key={k} value={k}>{FINDING_KIND_LABELS[k]}{r?.counts[k] ? ` (${r.counts[k]})` : ''}</option>)}
            </select>
          </Field>
          <Field label="Status" htmlFor="fi-status">
            <select id="fi-status" className={inputClass} value={status} onChange={(e) => set('status', e.target.value)}>
              <option value="open">Open</option><option value="reviewed">Reviewed</option><option value="resolved">No longer found</option>
            </select>
          </Field>
        </div>
        {r && (
          <ul aria-label="Findings by kind" className="flex flex-wrap gap-2 text-sm">
            {FINDING_KINDS.map((k) => (
              <li key={k}>
                <button type="button" aria-pressed={kind === k} onClick={() => set('kind', kind === k ? undefined : k)}
                  className={`rounded border px-2 py-1 ${kind === k ? 'border-accent bg-accent-soft' : 'border-line bg-panel'}`}>
                  {FINDING_KIND_LABELS[k]} <span className="font-semibold tabular">{count(r.counts[k] ?? 0)}</span>
                </button>
              </li>
            ))}
          </ul>
        )}
        <Panel title={r ? `${count(r.total)} ${status === 'open' ? 'open' : status} finding${r.total === 1 ? '' : 's'}` : 'Findings'}>
          {q.isLoading && <Loading what="the findings" />}
          {q.error && <ErrorState error={q.error} />}
          {r && (r.items.length ? (
            <>
              <DataTable caption="Consistency findings" data={r.items} columns={columns} getRowId={(f) => f.id} />
              {pages > 1 && (
                <nav aria-label="Pages of findings" className="mt-2 flex items-center gap-3 text-sm">
                  <Button variant="secondary" disabled={page <= 1} onClick={() => set('page', String(page - 1))}>Previous</Button>
                  <span>Page {page} of {pages}</span>
                  <Button variant="secondary" disabled={page >= pages} onClick={() => set('page', String(page + 1))}>Next</Button>
                </nav>
              )}
            </>
          ) : <EmptyState title="Nothing found">{r.lastRun ? 'No finding of this kind and status.' : 'The check has not run yet.'}</EmptyState>)}
        </Panel>
        <Panel title="What is checked">
          <ul className="list-disc pl-5 text-sm">
            <li>Pneumonia: a respiratory infection recorded whose observations do not meet CDC/NHSN PNU1 (2022), or another event whose observations meet it without a respiratory infection recorded; a stored PNU1 result that differs from evaluating the observations now.</li>
            <li>Therapy: episodes outside their modality's possible or usual ranges (per-modality tables).</li>
            <li>Length of stay: {LOS_RULE.text} (Tukey's "far out" fence).</li>
            <li>Duplicate suspects: two cases of a site with the same keyed hash and surgery date.</li>
          </ul>
        </Panel>
        <ClinicalCaution />
      </div>
    </div>
  );
}
