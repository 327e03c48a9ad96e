import { useState } from 'react';
import { QUASI_IDENTIFIER_LABELS, type QuasiIdentifier } from '../../../shared/exports/k-anonymity.js';
import { RISK_ACTION_LABELS, type ExportRequestView, type RiskAction } from '../../../shared/exports/schemas.js';
import { Button, EmptyState, ErrorState, Field, inputClass, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { ApiError } from '../../lib/api-client.js';
import { useDecideExport, useExportRisk } from './api/decide-export.js';
import { useExports } from './api/get-exports.js';
import { CohortSummary } from './components/cohort-summary.js';
import { ExportProgress, ExportStatus } from './components/export-status.js';

function RiskPanel({ id, kind }: { id: string; kind: string }) {
  const risk = useExportRisk(id, kind === 'rows');
  if (kind !== 'rows') return <Notice>An aggregate table: counts from 1 to 10 are suppressed, with complementary suppression (CMS cell-size suppression policy).</Notice>;
  if (risk.isPending) return <Loading what="the re-identification check" />;
  if (risk.error) return <ErrorState error={risk.error} retry={() => risk.refetch()} />;
  const r = risk.data;
  const low = r.asRequested.records > 0 && r.asRequested.k < r.asRequested.threshold;
  return (
    <Notice tone={low ? 'warn' : 'ok'}>
      <p className="font-semibold">{low ? `Warning: k-anonymity below ${r.asRequested.threshold}` : 'k-anonymity check passed'}</p>
      <p>{r.message}</p>
      <p className="mt-1 text-xs text-muted">
        Quasi-identifiers in this file: {r.quasiIdentifiers.map((q) => QUASI_IDENTIFIER_LABELS[q as QuasiIdentifier]).join(', ') || 'none'} · {r.asRequested.records.toLocaleString('en')} records in {r.asRequested.classes.toLocaleString('en')} combinations
        · after coarsening: k = {r.coarsened.k}, {r.coarsened.classesBelow} combinations under {r.coarsened.threshold} (Sweeney 2002)
      </p>
    </Notice>
  );
}

function Decision({ r }: { r: ExportRequestView }) {
  const decide = useDecideExport();
  const [reason, setReason] = useState('');
  const [riskAction, setRiskAction] = useState<RiskAction>('none');
  const [acceptRisk, setAcceptRisk] = useState(false);
  const [siteNames, setSiteNames] = useState(false);
  const needsRiskChoice = decide.error instanceof ApiError && decide.error.code === 'k_anonymity_below_threshold';
  const send = (decision: 'approve' | 'decline') => decide.mutate({ id: r.id, decision, reason, riskAction, acceptRisk, siteNamesApproved: siteNames });
  const reasonError = decide.error instanceof ApiError ? decide.error.fields.find((f) => f.path === 'reason')?.message : undefined;
  return (
    <article className="rounded border border-line bg-panel p-4" aria-labelledby={`req-${r.id}`}>
      <header className="mb-2 flex flex-wrap items-baseline justify-between gap-2">
        <h2 id={`req-${r.id}`} className="text-base font-semibold">{r.kind === 'aggregate' ? `Aggregate table by ${r.rowsBy}${r.colsBy ? ` × ${r.colsBy}` : ''}` : `${r.fields.length} variables, row-level`} · {r.format.toUpperCase()} · {r.level === 'limited' ? 'limited data set' : 'fully de-identified'}</h2>
        <span className="text-sm text-muted">{r.requester.displayName} · {new Date(r.createdAt).toLocaleDateString('en-GB', { dateStyle: 'medium' })}</span>
      </header>
      <p className="mb-3 text-sm">{r.purpose}</p>
      <div className="mb-3 grid gap-4 md:grid-cols-2">
        <div><h3 className="mb-1 text-sm font-semibold">Cohort</h3><CohortSummary cohort={r.cohort} /></div>
        <div>
          <h3 className="mb-1 text-sm font-semibold">Variables</h3>
          <p className="text-sm">{r.kind === 'rows' ? r.fields.join(', ') : `${r.rowsBy}${r.colsBy ? `, ${r.colsBy}` : ''}`}</p>
          {r.dua && <p className="mt-1 text-sm">Data-use agreement {r.dua.reference}, expires {r.dua.expiresOn}</p>}
          {r.siteNamesRequested && <p className="mt-1 text-sm text-ochre">Site names requested (instead of codes)</p>}
        </div>
      </div>
      <RiskPanel id={r.id} kind={r.kind} />
      <div className="mt-3 grid gap-3 md:grid-cols-2">
        {r.kind === 'rows' && (
          <fieldset>
            <legend className="text-sm font-semibold">If the check warns</legend>
            {(Object.keys(RISK_ACTION_LABELS) as RiskAction[]).map((a) => (
              <label key={a} className="flex items-center gap-2 text-sm"><input type="radio" name={`risk-${r.id}`} checked={riskAction === a} onChange={() => setRiskAction(a)} />{RISK_ACTION_LABELS[a]}</label>
            ))}
            {riskAction === 'none' && <label className="mt-1 flex items-center gap-2 text-sm"><input type="checkbox" checked={acceptRisk} onChange={() => setAcceptRisk(!acceptRisk)} />I accept combinations under k = 5 for this request</label>}
          </fieldset>
        )}
        <div className="flex flex-col gap-2">
          {r.siteNamesRequested && <label className="flex items-center gap-2 text-sm"><input type="checkbox" checked={siteNames} onChange={() => setSiteNames(!siteNames)} />Approve with site names</label>}
          <Field label="Reason (sent to the requester)" htmlFor={`reason-${r.id}`} error={reasonError}>
            <textarea id={`reason-${r.id}`} rows={2} className={inputClass} value={reason} onChange={(e) => setReason(e.target.value)} />
          </Field>
        </div>
      </div>
      {needsRiskChoice && <Notice tone="warn">Choose coarsen or suppress, or tick that you accept the risk, then approve again.</Notice>}
      {decide.error && !needsRiskChoice && <ErrorState error={decide.error} />}
      <div className="mt-3 flex gap-2">
        <Button onClick={() => send('approve')} disabled={decide.isPending}>Approve and generate</Button>
        <Button variant="danger" onClick={() => send('decline')} disabled={decide.isPending}>Decline</Button>
      </div>
    </article>
  );
}

export function ApprovalsPage() {
  const list = useExports('all');
  const pending = list.data?.items.filter((r) => r.status === 'pending') ?? [];
  const decided = list.data?.items.filter((r) => r.status !== 'pending') ?? [];
  return (
    <div>
      <PageHeader title="Export approvals" subtitle="Approve or decline research dataset requests. A row-level file is checked for k-anonymity first (quasi-identifiers: age band, sex, site code, surgery year, procedure category)." />
      {list.isPending && <Loading what="requests" />}
      {list.error && <ErrorState error={list.error} retry={() => list.refetch()} />}
      {list.data && (
        <div className="flex flex-col gap-4">
          {pending.length === 0 ? <EmptyState title="Nothing waiting">New requests appear here and are announced by e-mail.</EmptyState> : pending.map((r) => <Decision key={r.id} r={r} />)}
          <Panel title="Decided">
            {decided.length === 0 ? <p className="text-sm text-muted">None yet.</p> : (
              <div className="overflow-x-auto">
                <table className="w-full text-left text-sm">
                  <thead className="border-b border-line text-muted"><tr><th scope="col" className="py-2 pr-3">Requested</th><th scope="col" className="pr-3">Requester</th><th scope="col" className="pr-3">What</th><th scope="col" className="pr-3">Status</th><th scope="col" className="pr-3">Decided by</th><th scope="col">Reason</th></tr></thead>
                  <tbody>
                    {decided.map((r) => (
                      <tr key={r.id} className="border-b border-line/60 align-top">
                        <td className="py-2 pr-3 tabular-nums">{new Date(r.createdAt).toLocaleDateString('en-CA')}</td>
                        <td className="pr-3">{r.requester.displayName}</td>
                        <td className="pr-3">{r.kind === 'aggregate' ? 'aggregate table' : `${r.fields.length} variables`} · {r.format} · {r.level}{r.riskAction !== 'none' ? ` · ${r.riskAction}` : ''}</td>
                        <td className="pr-3"><ExportStatus status={r.status} /><ExportProgress view={r} /></td>
                        <td className="pr-3">{r.decidedBy ?? '—'}</td>
                        <td>{r.decisionReason}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
          </Panel>
        </div>
      )}
    </div>
  );
}
