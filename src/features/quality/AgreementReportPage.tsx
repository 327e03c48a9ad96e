/**
 * The agreement report of a sample: per field, percent agreement and Cohen's kappa with the
 * Landis & Koch words for coded fields, mean difference and limits of agreement (Bland & Altman
 * 1986) for numbers and dates; disagreements listed for adjudication; Excel export.
 */
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import type { ColumnDef } from '@tanstack/react-table';
import type { Disagreement, FieldAgreement } from '../../../shared/quality/reabstraction.js';
import { QUALITY_CAUTION } from '../../../shared/quality/common.js';
import { Button, EmptyState, ErrorState, inputClass, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { getErrorMessage } from '../../lib/api-client.js';
import { paths } from '../../lib/paths.js';
import { useSession } from '../../lib/session.js';
import { useAdjudicate } from './api/adjudicate.js';
import { agreementWorkbookUrl, useAgreementReport } from './api/get-agreement-report.js';
import { DataTable } from './components/data-table.js';
import { num, pct } from './components/format.js';

const limitsText = (f: FieldAgreement) => {
  if (!f.limits) return '—';
  const u = f.unit ? ` ${f.unit}` : '';
  const loa = f.limits.lower === null || f.limits.upper === null ? 'limits need 2 pairs' : `${num(f.limits.lower)} to ${num(f.limits.upper)}${u}`;
  return <span><span data-testid={`loa-${f.field}`}>{loa}</span> <span className="text-xs text-muted">(n {f.limits.n})</span></span>;
};

const fieldColumns: ColumnDef<FieldAgreement>[] = [
  { header: 'Field', cell: ({ row }) => <span className="font-semibold">{row.original.label}</span> },
  { header: 'Pairs', accessorKey: 'pairs' },
  { header: 'Agreement', cell: ({ row }) => pct(row.original.percentAgreement) },
  { header: "Cohen's kappa", cell: ({ row }) => (row.original.kind === 'coded' ? <span data-testid={`kappa-${row.original.field}`}>{num(row.original.kappa, 3)}</span> : '—') },
  { header: 'Landis & Koch', cell: ({ row }) => row.original.band ?? '—' },
  { header: 'Mean difference', cell: ({ row }) => (row.original.limits ? `${num(row.original.limits.meanDifference)}${row.original.unit ? ` ${row.original.unit}` : ''}` : '—') },
  { header: 'Limits of agreement (95%)', cell: ({ row }) => limitsText(row.original) },
  { header: 'Notes', cell: ({ row }) => [row.original.pairsWithMissing ? `${row.original.pairsWithMissing} with a value not documented` : '', row.original.note ?? ''].filter(Boolean).join('; ') || '—' },
];

function Adjudicate({ d, sampleId }: { d: Disagreement; sampleId: string }) {
  const [decision, setDecision] = useState<'' | 'original' | 'reabstracted'>('');
  const [reason, setReason] = useState('');
  const m = useAdjudicate(sampleId);
  if (d.adjudication) {
    return <span className="text-sm">{d.adjudication.decision === 'original' ? 'first abstraction kept' : 'second abstraction taken'}{d.adjudication.written ? ' · case changed (audited)' : ''} · {d.adjudication.reason}</span>;
  }
  const label = `${d.registryNumber} ${d.label}`;
  return (
    <form className="flex flex-wrap items-center gap-2" onSubmit={(e) => { e.preventDefault(); if (decision) m.mutate({ itemId: d.itemId, body: { field: d.field, decision, reason, caseVersion: d.caseVersion } }); }}>
      <select aria-label={`Decision for ${label}`} className={inputClass} value={decision} onChange={(e) => setDecision(e.target.value as typeof decision)}>
        <option value="">Which is right?</option>
        <option value="original">First: {d.originalText}</option>
        <option value="reabstracted">Second: {d.reabstractedText}</option>
      </select>
      <input aria-label={`Reason for ${label}`} className={`${inputClass} w-56`} placeholder="Reason (no identifiers)" value={reason} onChange={(e) => setReason(e.target.value)} />
      <Button type="submit" variant="secondary" disabled={!decision || reason.trim().length < 5 || m.isPending}>Adjudicate</Button>
      {m.error && <span role="alert" className="w-full text-xs text-danger">{getErrorMessage(m.error)}</span>}
    </form>
  );
}

export function AgreementReportPage() {
  const { id = '' } = useParams();
  const q = useAgreementReport(id);
  const user = useSession().data?.user;
  const canAdjudicate = !!user?.roles.some((r) => r === 'admin' || r === 'abstractor');
  if (q.isLoading) return <Loading what="the agreement report" />;
  if (q.error) return <ErrorState error={q.error} retry={() => q.refetch()} />;
  const r = q.data!;
  const s = r.sample;
  const disagreementColumns: ColumnDef<Disagreement>[] = [
    { header: 'Case', cell: ({ row }) => <Link className="font-semibold text-accent hover:underline" to={paths.cases.detail(row.original.caseId)}>{row.original.registryNumber}</Link> },
    { header: 'Field', accessorKey: 'label' },
    { header: 'First abstraction', accessorKey: 'originalText' },
    { header: 'Re-abstraction', accessorKey: 'reabstractedText' },
    { header: 'Adjudication', cell: ({ row }) => (canAdjudicate || row.original.adjudication ? <Adjudicate d={row.original} sampleId={id} /> : 'open') },
  ];
  return (
    <div>
      <PageHeader title="Agreement report"
        subtitle={<>Seed <strong data-testid="report-seed" className="tabular">{s.seed}</strong> · {s.siteCodes.join(', ')} · {s.size} of {s.poolSize} verified cases · re-abstracted by {s.reabstractorEmail}: {s.entered} of {s.size}</>}
        actions={<>
          <a className="rounded bg-accent px-3 py-1.5 text-sm font-semibold text-white" href={agreementWorkbookUrl(id)} download>Export to Excel</a>
          <Link className="rounded border border-line bg-panel px-3 py-1.5 text-sm font-semibold" to={paths.quality.reabstraction}>All samples</Link>
        </>} />
      <div className="grid gap-4">
        {s.entered < s.size && <Notice tone="warn">{s.size - s.entered} of {s.size} cases are not re-abstracted yet; the figures cover the {s.entered} done.</Notice>}
        {r.openedBeforeEntry.length > 0 && <Notice tone="warn">The second abstractor opened {r.openedBeforeEntry.length} of these cases in the registry before entering them ({r.openedBeforeEntry.map((o) => o.registryNumber).join(', ')}): their re-abstraction may not be blind.</Notice>}
        <Panel title="Agreement per field">
          <DataTable caption="Agreement between the first abstraction and the blind re-abstraction, per field" data={r.fields} columns={fieldColumns} getRowId={(f) => f.field} />
          <p className="mt-2 text-xs text-muted">Kappa: Cohen J, Educ Psychol Meas 1960 ("not documented" counts as a value). Words: Landis JR, Koch GG, Biometrics 1977 — below 0 poor, 0 to 0.2 slight, above 0.2 to 0.4 fair, above 0.4 to 0.6 moderate, above 0.6 to 0.8 substantial, above 0.8 almost perfect. Limits of agreement: mean difference (first minus second) ± 1.96 SD, Bland JM, Altman DG, Lancet 1986; dates as days.</p>
        </Panel>
        <Panel title={`Disagreements for adjudication (${r.disagreements.length})`}>
          {r.disagreements.length ? <DataTable caption="Disagreements between the two abstractions" data={r.disagreements} columns={disagreementColumns} getRowId={(d) => `${d.itemId}-${d.field}`} /> : <EmptyState title="No disagreement">{s.entered ? 'The two abstractions agree on every field.' : 'Nothing is re-abstracted yet.'}</EmptyState>}
          <p className="mt-2 text-xs text-muted">Taking the second value changes the case through the registry (audit trail; a verified case goes back for verification; a locked case is amended with the reason). The adjudicator must not have entered or re-abstracted the case.</p>
        </Panel>
        <Notice>{QUALITY_CAUTION}</Notice>
      </div>
    </div>
  );
}
