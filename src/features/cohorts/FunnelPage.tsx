import { useSearchParams } from 'react-router-dom';
import { MEASURES } from '../../../shared/analysis/measures.js';
import { Button, ClinicalCaution, ErrorState, Loading, PageHeader, Panel, inputClass } from '../../components/ui.js';
import { useSession } from '../../lib/session.js';
import { exportUrl, useFunnel } from './api/analysis.js';
import { useCohortSites } from './api/get-sites.js';
import { CohortFilterForm, cohortQuery } from './components/filter-form.js';
import { DataTable } from './components/data-table.js';
import { FunnelChart } from './components/funnel-chart.js';
import { MethodsNote, MethodTip } from './components/methods.js';
import { fmtCount } from './format.js';

const POSITION_WORDS: Record<string, string> = {
  within: 'within the 95% limits', 'above-95': 'above the 95% limit', 'above-99.8': 'above the 99.8% limit', 'below-95': 'below the 95% limit', 'below-99.8': 'below the 99.8% limit',
};

/** Site comparison: a funnel plot of each site's rate against its case count, and its table. */
export function FunnelPage() {
  const [params, setParams] = useSearchParams();
  const user = useSession().data?.user;
  const sites = useCohortSites(!!user && user.roles.some((r) => r !== 'researcher'));
  const measure = params.get('measure') ?? 'any-ppc';
  const filterQuery = cohortQuery(params).toString();
  const query = `${filterQuery}${filterQuery ? '&' : ''}measure=${measure}`;
  const funnel = useFunnel(query);
  const update = (next: URLSearchParams) => setParams(next, { replace: true });
  return (
    <div className="flex flex-col gap-4">
      <PageHeader title="Site funnel plot" subtitle="Each site's proportion against its number of counted cases, with limits around the network proportion."
        actions={<>
          <a className="inline-flex items-center rounded border border-line bg-panel px-3 py-1.5 text-sm font-semibold hover:border-accent" href={exportUrl('funnel', query)} download>Export workbook</a>
          <Button variant="secondary" onClick={() => window.print()}>Print</Button>
        </>} />
      <ClinicalCaution />
      <div className="grid grid-cols-1 gap-4 lg:grid-cols-[20rem_1fr] print:block">
        <aside className="no-print flex flex-col gap-3">
          <Panel>
            <label className="mb-2 flex flex-col text-sm font-semibold">Measure
              <select className={inputClass} value={measure} onChange={(e) => { const n = new URLSearchParams(params); n.set('measure', e.target.value); update(n); }}>
                {MEASURES.filter((m) => m.kind === 'proportion').map((m) => <option key={m.key} value={m.key}>{m.label}</option>)}
              </select>
            </label>
            <CohortFilterForm legend="Cases" params={params} onChange={update} sites={sites.data?.items} />
          </Panel>
        </aside>
        <section className="flex min-w-0 flex-col gap-4 print:w-full" aria-live="polite">
          {funnel.isPending ? <Loading what="the funnel plot" /> : funnel.isError ? <ErrorState error={funnel.error} retry={() => funnel.refetch()} /> : (
            <>
              <Panel title={<>{funnel.data.label}: network {funnel.data.target == null ? '—' : `${(funnel.data.target * 100).toFixed(1)}%`} <MethodTip text={funnel.data.methods[1]} /></>}>
                <div className="grid grid-cols-1 gap-4 2xl:grid-cols-2 print:grid-cols-1">
                  <FunnelChart funnel={funnel.data} />
                  <DataTable caption="Sites against the funnel" data={funnel.data.sites} columns={[
                    { header: 'Site', accessorKey: 'label' },
                    { header: 'Events / cases', cell: (c) => `${fmtCount(c.row.original.events)} / ${fmtCount(c.row.original.total)}` },
                    { header: 'Proportion', cell: (c) => (c.row.original.proportion == null ? '—' : `${(c.row.original.proportion * 100).toFixed(1)}%`) },
                    { header: 'Position', cell: (c) => (c.row.original.position ? POSITION_WORDS[c.row.original.position] : 'suppressed') },
                  ]} />
                </div>
              </Panel>
              <MethodsNote methods={funnel.data.methods} />
            </>
          )}
        </section>
      </div>
    </div>
  );
}
