/**
 * Data quality per site and month, on the registry's one completeness query: share of cases with
 * every required field, per section and per field; follow-up windows closed without follow-up;
 * cases waiting for verification too long; the trend over months (chart with its data table).
 * Abstractors reach their own gaps in one click (the worklist or the case list, filtered).
 */
import { Link, useSearchParams } from 'react-router-dom';
import { CartesianGrid, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { ColumnDef } from '@tanstack/react-table';
import type { CaseRef, CompletenessReport } from '../../../shared/quality/completeness.js';
import { QUALITY_CAUTION } from '../../../shared/quality/common.js';
import { EmptyState, ErrorState, Field, inputClass, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { StatusBadge } from '../../components/status-badge.js';
import { paths } from '../../lib/paths.js';
import { useCompleteness } from './api/get-completeness.js';
import { DataTable } from './components/data-table.js';
import { count, pct, smallNote } from './components/format.js';
import { SiteSelect } from './components/site-select.js';

type Section = CompletenessReport['sections'][number];
type FieldRow = CompletenessReport['fields'][number];

const monthEnd = (m: string) => {
  const [y, mo] = m.split('-').map(Number);
  return new Date(Date.UTC(y, mo, 0)).toISOString().slice(0, 10);
};

function caseListLink(siteId: string | undefined, month: string, status: string) {
  const sp = new URLSearchParams();
  if (siteId) sp.set('siteId', siteId);
  sp.set('surgeryFrom', `${month}-01`);
  sp.set('surgeryTo', monthEnd(month));
  sp.set('status', status);
  return `${paths.cases.list}?${sp.toString()}`;
}

const sectionColumns: ColumnDef<Section>[] = [
  { header: 'Section', accessorKey: 'label' },
  { header: 'Cases complete in it', cell: ({ row }) => count(row.original.complete) },
  { header: 'Share', cell: ({ row }) => <span className="font-semibold">{pct(row.original.share)}</span> },
];

const fieldColumns: ColumnDef<FieldRow>[] = [
  { header: 'Field', accessorKey: 'label' },
  { header: 'Section', accessorKey: 'section' },
  { header: 'Cases missing it', cell: ({ row }) => `${count(row.original.missing)}${smallNote(row.original.missing)}` },
  { header: 'Share of cases', cell: ({ row }) => pct(row.original.share) },
];

const refColumns = (daysLabel: string): ColumnDef<CaseRef>[] => [
  { header: 'Case', cell: ({ row }) => <Link className="font-semibold text-accent hover:underline" to={paths.cases.detail(row.original.id)}>{row.original.registryNumber}</Link> },
  { header: 'Site', accessorKey: 'siteCode' },
  { header: 'Status', cell: ({ row }) => <StatusBadge status={row.original.status as never} /> },
  { header: 'Surgery', accessorKey: 'surgeryDate' },
  { header: daysLabel, cell: ({ row }) => `${row.original.days} days` },
];

function Trend({ report }: { report: CompletenessReport }) {
  const data = report.trend.map((p) => ({ ...p, percent: p.share === null ? null : Math.round(p.share * 1000) / 10 }));
  return (
    <Panel title="Complete cases over the months">
      <div className="grid gap-4 lg:grid-cols-[2fr_1fr]">
        <figure aria-label="Line chart: percent of cases with every required field, by month" className="h-64">
          <ResponsiveContainer width="100%" height="100%">
            <LineChart data={data} margin={{ top: 8, right: 16, bottom: 8, left: 0 }}>
              <CartesianGrid stroke="var(--color-line)" strokeDasharray="3 3" />
              <XAxis dataKey="month" tick={{ fontSize: 12 }} />
              <YAxis domain={[0, 100]} unit="%" tick={{ fontSize: 12 }} />
              <Tooltip formatter={(v) => [`${String(v)}%`, 'complete']} />
              <Line type="linear" dataKey="percent" name="complete" stroke="var(--color-chart-1)" strokeWidth={2} dot={{ r: 4 }} connectNulls={false} isAnimationActive={false} />
            </LineChart>
          </ResponsiveContainer>
          <figcaption className="text-xs text-muted">Share of cases (not withdrawn) with every required field, by month of surgery.</figcaption>
        </figure>
        <DataTable caption="Complete cases by month" data={report.trend} getRowId={(r) => r.month}
          columns={[
            { header: 'Month', accessorKey: 'month' },
            { header: 'Cases', cell: ({ row }) => count(row.original.cases) },
            { header: 'Complete', cell: ({ row }) => count(row.original.complete) },
            { header: 'Share', cell: ({ row }) => pct(row.original.share) },
          ]} />
      </div>
    </Panel>
  );
}

export function DataQualityPage() {
  const [sp, setSp] = useSearchParams();
  const siteId = sp.get('siteId') ?? undefined;
  const month = sp.get('month') ?? undefined;
  const q = useCompleteness({ siteId, month });
  const set = (k: string, v: string | undefined) => { const n = new URLSearchParams(sp); if (v) n.set(k, v); else n.delete(k); setSp(n); };
  const r = q.data;
  const shown = r?.month ?? month;
  return (
    <div>
      <PageHeader title="Data quality" subtitle={r ? `${r.sites.map((s) => s.code).join(', ')} · ${r.month ?? 'no cases yet'} · as of ${r.today}` : 'Completeness per site and month'}
        actions={<>
          <Link className="rounded border border-line bg-panel px-3 py-1.5 text-sm font-semibold hover:border-accent" to={`${paths.worklist}${siteId ? `?siteId=${siteId}` : ''}`}>Open my gaps in the worklist</Link>
        </>} />
      <div className="no-print mb-4 flex flex-wrap items-end gap-4">
        <Field label="Site" htmlFor="dq-site"><SiteSelect id="dq-site" value={siteId ?? ''} onChange={(v) => set('siteId', v || undefined)} /></Field>
        <Field label="Month of surgery" htmlFor="dq-month"><input id="dq-month" type="month" className={inputClass} value={shown ?? ''} onChange={(e) => set('month', e.target.value || undefined)} /></Field>
      </div>
      {q.isLoading && <Loading what="the completeness figures" />}
      {q.error && <ErrorState error={q.error} retry={() => q.refetch()} />}
      {r && !r.month && <EmptyState title="No cases yet">No case of these sites has a surgery date yet.</EmptyState>}
      {r && r.month && (
        <div className="grid gap-4">
          <Panel>
            <p className="text-sm text-muted">Cases with every required field ({r.month})</p>
            <p className="text-3xl font-semibold tabular"><span data-testid="dq-share">{pct(r.share)}</span> <span className="text-base font-normal text-muted">{count(r.complete)} of {count(r.cases)} cases{smallNote(r.cases)}</span></p>
            <p className="mt-2 flex flex-wrap gap-4 text-sm">
              <Link className="text-accent underline" to={caseListLink(siteId, r.month, 'draft,complete')}>Draft and complete cases of {r.month} in the case list</Link>
              <Link className="text-accent underline" to={`${paths.worklist}${siteId ? `?siteId=${siteId}` : ''}`}>Missing data in the worklist</Link>
            </p>
          </Panel>
          <div className="grid gap-4 lg:grid-cols-2">
            <Panel title="By section">
              <DataTable caption="Cases complete per section" data={r.sections} columns={sectionColumns} getRowId={(s) => s.section} />
              <p className="mt-2 text-xs text-muted">The 30-day follow-up can be done from post-operative day 30 on, so the most recent month is short of follow-up by design.</p>
            </Panel>
            <Panel title="By field">
              {r.fields.length ? <DataTable caption="Cases missing each required field" data={r.fields} columns={fieldColumns} getRowId={(f) => f.field} /> : <EmptyState title="No field is missing">Every case of the month has every required field.</EmptyState>}
            </Panel>
          </div>
          <Trend report={r} />
          <div className="grid gap-4 lg:grid-cols-2">
            <Panel title={`Follow-up window closed without follow-up (${count(r.followUpOverdue.total)})`}>
              {r.followUpOverdue.items.length ? <DataTable caption="Closed follow-up windows without follow-up" data={r.followUpOverdue.items} columns={refColumns('Since the window closed')} getRowId={(c) => c.id} /> : <EmptyState title="None">Every closed 30-day window has its follow-up.</EmptyState>}
            </Panel>
            <Panel title={`Waiting for verification over ${r.verifyWaitDays} days (${count(r.awaitingVerification.total)})`}>
              {r.awaitingVerification.items.length ? <DataTable caption="Cases waiting for verification" data={r.awaitingVerification.items} columns={refColumns('Waiting')} getRowId={(c) => c.id} /> : <EmptyState title="None">No complete case has waited longer than {r.verifyWaitDays} days.</EmptyState>}
            </Panel>
          </div>
          <Notice>{QUALITY_CAUTION}</Notice>
        </div>
      )}
    </div>
  );
}
