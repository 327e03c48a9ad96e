import { useSearchParams } from 'react-router-dom';
import type { ColumnDef } from '@tanstack/react-table';
import { CONFIDENCE_LEVELS, type OutcomeComparison } from '../../../shared/analysis/results.js';
import { COHORT_URL_PARAMS } from '../../../shared/analysis/cohort-filter.js';
import { Button, ClinicalCaution, ErrorState, Loading, Notice, PageHeader, Panel, inputClass } from '../../components/ui.js';
import { useSession } from '../../lib/session.js';
import { exportUrl, useComparison } from './api/analysis.js';
import { useCohortSites } from './api/get-sites.js';
import { CohortFilterForm } from './components/filter-form.js';
import { DataTable } from './components/data-table.js';
import { ForestPlot } from './components/forest-plot.js';
import { MethodsNote, MethodTip } from './components/methods.js';
import { MeasuresTable } from './components/result-tables.js';
import { fmtCount, fmtInterval, fmtP, levelLabel } from './format.js';

/** The query of a comparison: a.* and b.* cohort parameters and the options, from the page's URL. */
function comparisonQuery(params: URLSearchParams): string {
  const out = new URLSearchParams();
  for (const p of Object.values(COHORT_URL_PARAMS)) for (const pre of ['a.', 'b.']) { const v = params.get(pre + p); if (v) out.set(pre + p, v); }
  for (const k of ['level', 'expected', 'b']) { const v = params.get(k); if (v) out.set(k, v); }
  return out.toString();
}

/** Compare cohort A with cohort B or with the rest of the network. */
export function ComparePage() {
  const [params, setParams] = useSearchParams();
  const user = useSession().data?.user;
  const sites = useCohortSites(!!user && user.roles.some((r) => r !== 'researcher'));
  const update = (next: URLSearchParams) => setParams(next, { replace: true });
  const setOption = (k: string, v: string) => { const n = new URLSearchParams(params); n.set(k, v); update(n); };
  const query = comparisonQuery(params);
  const cmp = useComparison(query);
  const level = Number(params.get('level') ?? '0.95');
  const rest = params.get('b') === 'rest';
  const columns: ColumnDef<OutcomeComparison, unknown>[] = [
    { header: 'Outcome', accessorKey: 'label' },
    { header: 'A: events / cases', cell: (c) => `${fmtCount(c.row.original.a.events)} / ${fmtCount(c.row.original.a.total)}` },
    { header: 'B: events / cases', cell: (c) => `${fmtCount(c.row.original.b.events)} / ${fmtCount(c.row.original.b.total)}` },
    { header: 'Risk difference A − B', cell: (c) => fmtInterval(c.row.original.difference, 'difference', level) },
    { header: 'Risk ratio', cell: (c) => fmtInterval(c.row.original.riskRatio, 'ratio', level) },
    { header: 'Odds ratio', cell: (c) => fmtInterval(c.row.original.oddsRatio, 'ratio', level) },
    { header: 'Fisher p', cell: (c) => fmtP(c.row.original.fisherP) },
    { header: 'O/E in A', cell: (c) => { const o = c.row.original.observedExpected; return <span>{fmtInterval(o.ratio, 'ratio', level)}<span className="block text-xs text-muted">O {fmtCount(o.observed)}, E {o.expected == null ? '—' : o.expected.toFixed(1)}</span>{o.note && <span className="block text-xs text-warn">{o.note}</span>}</span>; } },
    { header: 'MH risk ratio', cell: (c) => fmtInterval(c.row.original.mantelHaenszel, 'ratio', level) },
    { header: 'Caution', cell: (c) => <span className="text-xs text-warn">{c.row.original.notes.join(' ')}</span> },
  ];
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Compare cohorts"
        subtitle="Cohort A against cohort B, or against the rest of the network; crude, risk-adjusted and stratified comparisons."
        actions={<>
          <a className="inline-flex items-center rounded border border-line bg-panel px-3 py-1.5 text-sm font-semibold hover:border-accent" href={exportUrl('compare', query)} download>Export workbook</a>
          <Button variant="secondary" onClick={() => window.print()}>Print</Button>
        </>}
      />
      <ClinicalCaution />
      <div className="grid grid-cols-1 gap-4 lg:grid-cols-[20rem_1fr] print:block">
        <aside className="no-print flex flex-col gap-3">
          <Panel><CohortFilterForm legend="Cohort A" prefix="a." params={params} onChange={update} sites={sites.data?.items} /></Panel>
          <Panel>
            <label className="mb-2 flex flex-col text-sm font-semibold">Compare A with
              <select className={inputClass} value={rest ? 'rest' : 'cohort'} onChange={(e) => setOption('b', e.target.value)}>
                <option value="cohort">Cohort B (below)</option>
                <option value="rest">The rest of the network (same dates)</option>
              </select>
            </label>
            {!rest && <CohortFilterForm legend="Cohort B" prefix="b." params={params} onChange={update} sites={sites.data?.items} />}
          </Panel>
          <Panel>
            <label className="flex flex-col text-sm font-semibold">Expected events (O/E) from
              <select className={inputClass} value={params.get('expected') ?? 'reference'} onChange={(e) => setOption('expected', e.target.value)}>
                <option value="reference">B's rates within each ARISCAT class</option>
                <option value="ariscat-published">ARISCAT's published class risks (any PPC)</option>
              </select>
            </label>
            <label className="mt-2 flex flex-col text-sm font-semibold">Confidence level
              <select className={inputClass} value={String(level)} onChange={(e) => setOption('level', e.target.value)}>
                {CONFIDENCE_LEVELS.map((l) => <option key={l} value={String(l)}>{levelLabel(l)}</option>)}
              </select>
            </label>
          </Panel>
        </aside>
        <section className="flex min-w-0 flex-col gap-4 print:w-full" aria-live="polite">
          {cmp.isPending ? <Loading what="the comparison" /> : cmp.isError ? <ErrorState error={cmp.error} retry={() => cmp.refetch()} /> : (
            <>
              <Panel title={`A: ${fmtCount(cmp.data.a.size)} cases · ${cmp.data.bIsRest ? 'rest of the network' : 'B'}: ${fmtCount(cmp.data.b.size)} cases`}>
                {[cmp.data.a.completeness.warning && `A: ${cmp.data.a.completeness.warning}`, cmp.data.b.completeness.warning && `B: ${cmp.data.b.completeness.warning}`].filter(Boolean).map((w) => <Notice key={String(w)} tone="warn">{w}</Notice>)}
                <p className="mt-1 text-sm text-muted">A ratio below 1 means fewer events in A than in B.</p>
              </Panel>
              <Panel title={<>Forest plot <MethodTip text={cmp.data.methods[1]} /></>}>
                <ForestPlot outcomes={cmp.data.outcomes} level={cmp.data.level} />
              </Panel>
              <Panel title={<>Every outcome, A against B <MethodTip text={cmp.data.methods[2]} /></>}>
                <DataTable columns={columns} data={cmp.data.outcomes} caption={`Comparison with ${levelLabel(cmp.data.level)} confidence intervals`} />
              </Panel>
              <Panel title={<>Length of stay <MethodTip text={cmp.data.methods[4]} /></>}>
                {cmp.data.los.note ? <Notice tone="warn">{cmp.data.los.note}</Notice> : (
                  <p className="text-sm">Median A {cmp.data.los.medianA} days, median B {cmp.data.los.medianB} days; Mann–Whitney U = {cmp.data.los.u?.toLocaleString('en')}, p = {fmtP(cmp.data.los.p)}.</p>
                )}
              </Panel>
              <div className="grid grid-cols-1 gap-4">
                <Panel title="Cohort A"><MeasuresTable measures={cmp.data.a.measures} level={cmp.data.level} caption="Outcomes of A" /></Panel>
                <Panel title={cmp.data.bIsRest ? 'Rest of the network' : 'Cohort B'}><MeasuresTable measures={cmp.data.b.measures} level={cmp.data.level} caption="Outcomes of B" /></Panel>
              </div>
              <MethodsNote methods={cmp.data.methods} />
            </>
          )}
        </section>
      </div>
    </div>
  );
}
