import { useMemo, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { CONFIDENCE_LEVELS } from '../../../shared/analysis/results.js';
import { CohortFilterSchema, cohortFilterFromParams, encodeCohortFilter } from '../../../shared/analysis/cohort-filter.js';
import { Button, ClinicalCaution, EmptyState, ErrorState, Loading, Notice, PageHeader, Panel, inputClass } from '../../components/ui.js';
import { getErrorMessage } from '../../lib/api-client.js';
import { paths } from '../../lib/paths.js';
import { useSession } from '../../lib/session.js';
import { exportUrl, useCohortPage, useSeries } from './api/analysis.js';
import { useCohortSites } from './api/get-sites.js';
import { useCreateCohort, useDeleteCohort, useSavedCohorts, useUpdateCohort } from './api/saved-cohorts.js';
import { CohortFilterForm, cohortQuery } from './components/filter-form.js';
import { LosHistogram } from './components/los-histogram.js';
import { MeasureChart } from './components/measure-chart.js';
import { MethodsNote, MethodTip } from './components/methods.js';
import { LosTable, MeasuresTable, StrataTable } from './components/result-tables.js';
import { SeriesChart } from './components/series-chart.js';
import { DataTable } from './components/data-table.js';
import { fmtCount, fmtInterval, levelLabel } from './format.js';

const SHARERS = ['admin', 'analyst', 'committee'];

/** Cohort builder and cohort page: filters in the URL, results from the server's aggregates. */
export function CohortBuilderPage() {
  const [params, setParams] = useSearchParams();
  const user = useSession().data?.user;
  const canListSites = !!user && user.roles.some((r) => r !== 'researcher');
  const sites = useCohortSites(canListSites);
  const level = params.get('level') ?? '0.95';
  const grouping = params.get('grouping') ?? 'quarter';
  const filterQuery = cohortQuery(params).toString();
  const query = `${filterQuery}${filterQuery ? '&' : ''}level=${level}`;
  const page = useCohortPage(query);
  const series = useSeries(`${query}&grouping=${grouping}&measure=any-ppc`);
  const update = (next: URLSearchParams) => setParams(next, { replace: true });
  const setOption = (k: string, v: string) => { const n = new URLSearchParams(params); n.set(k, v); update(n); };
  const parsedFilter = useMemo(() => CohortFilterSchema.safeParse(cohortFilterFromParams(cohortQuery(params))), [params]);
  const compareHref = `${paths.cohorts.compare}?${encodeCohortFilter(parsedFilter.success ? parsedFilter.data : {}, 'a.').toString()}&b=rest&level=${level}`;

  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Cohort builder"
        subtitle="Build a cohort from the registry's counted cases; the address of this page reproduces the view."
        actions={<>
          <a className="inline-flex items-center rounded border border-line bg-panel px-3 py-1.5 text-sm font-semibold hover:border-accent" href={exportUrl('cohort', query)} download>Export workbook</a>
          <Link className="inline-flex items-center rounded border border-line bg-panel px-3 py-1.5 text-sm font-semibold hover:border-accent" to={compareHref}>Compare with the rest of the network</Link>
          <Button variant="secondary" onClick={() => window.print()}>Print</Button>
        </>}
      />
      <ClinicalCaution />
      <div className="grid grid-cols-1 gap-4 lg:grid-cols-[20rem_1fr] print:block">
        <aside className="no-print flex flex-col gap-3">
          <Panel>
            <CohortFilterForm legend="Filters" params={params} onChange={update} sites={sites.data?.items} />
            <div className="mt-3 grid grid-cols-2 gap-2">
              <label className="flex flex-col text-sm font-semibold">Confidence level
                <select className={inputClass} value={level} onChange={(e) => setOption('level', e.target.value)}>
                  {CONFIDENCE_LEVELS.map((l) => <option key={l} value={String(l)}>{levelLabel(l)}</option>)}
                </select>
              </label>
              <label className="flex flex-col text-sm font-semibold">Group by
                <select className={inputClass} value={grouping} onChange={(e) => setOption('grouping', e.target.value)}>
                  <option value="month">Month</option>
                  <option value="quarter">Quarter</option>
                </select>
              </label>
            </div>
            <Button variant="ghost" className="mt-2" onClick={() => update(new URLSearchParams({ level }))}>Clear filters</Button>
          </Panel>
          <SavePanel filterQuery={filterQuery} canShare={!!user && user.roles.some((r) => SHARERS.includes(r))} />
        </aside>
        <section className="flex min-w-0 flex-col gap-4 print:w-full" aria-live="polite">
          {!parsedFilter.success && <Notice tone="danger">{parsedFilter.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ')}</Notice>}
          {page.isPending ? <Loading what="the cohort" /> : page.isError ? <ErrorState error={page.error} retry={() => page.refetch()} /> : (
            <>
              <Panel title={<>Cohort: {fmtCount(page.data.size)} counted cases <MethodTip text={page.data.methods[0]} /></>}>
                <p className="text-sm">
                  Verified: {fmtCount(page.data.completeness.verified)} ({page.data.completeness.verifiedShare == null ? '—' : `${(page.data.completeness.verifiedShare * 100).toFixed(1)}%`});
                  {' '}with a discharge date: {fmtCount(page.data.completeness.discharged)} ({page.data.completeness.dischargedShare == null ? '—' : `${(page.data.completeness.dischargedShare * 100).toFixed(1)}%`}).
                </p>
                {page.data.completeness.warning && <div className="mt-2"><Notice tone="warn">{page.data.completeness.warning}</Notice></div>}
                {page.data.size === 0 && <div className="mt-2"><EmptyState title="No counted case matches these filters">Widen the dates or remove a filter.</EmptyState></div>}
              </Panel>
              {page.data.size !== 0 && (
                <>
                  <Panel title={<>Outcomes with {levelLabel(page.data.level)} confidence intervals <MethodTip text={page.data.methods[1]} /></>}>
                    <div className="grid grid-cols-1 gap-4 2xl:grid-cols-2 print:grid-cols-1">
                      <MeasureChart measures={page.data.measures} level={page.data.level} />
                      <MeasuresTable measures={page.data.measures} level={page.data.level} caption="Outcomes of the cohort" />
                    </div>
                  </Panel>
                  <Panel title={<>Any PPC by {grouping} <MethodTip text="p-chart: 3-sigma limits for each period's number of cases (Provost & Murray 2011)." /></>}>
                    {series.isPending ? <Loading what="the series" /> : series.isError ? <ErrorState error={series.error} /> : (
                      <div className="grid grid-cols-1 gap-4 2xl:grid-cols-2 print:grid-cols-1">
                        <SeriesChart series={series.data} />
                        <DataTable
                          caption={`Any PPC by ${grouping}`}
                          data={series.data.points}
                          columns={[
                            { header: grouping === 'month' ? 'Month' : 'Quarter', accessorKey: 'period' },
                            { header: 'Events / cases', cell: (c) => `${fmtCount(c.row.original.events)} / ${fmtCount(c.row.original.denominator)}` },
                            { header: 'Proportion', cell: (c) => fmtInterval({ estimate: c.row.original.value, lower: c.row.original.lower, upper: c.row.original.upper }, 'proportion', series.data.level) },
                            { header: 'Signal', cell: (c) => (c.row.original.outside ? 'beyond a limit' : '') },
                          ]}
                        />
                      </div>
                    )}
                  </Panel>
                  <Panel title={<>Length of stay <MethodTip text="Median and quartiles from the frequency table of lengths of stay (R type 7)." /></>}>
                    <div className="grid grid-cols-1 gap-4 2xl:grid-cols-2 print:grid-cols-1">
                      <LosHistogram los={page.data.los} />
                      <LosTable los={page.data.los} />
                    </div>
                  </Panel>
                  <Panel title="By ARISCAT risk class">
                    <StrataTable strata={page.data.byAriscat} level={page.data.level} caption="Outcomes by ARISCAT class (events: proportion with CI)" />
                  </Panel>
                  <Panel title={page.data.siteVisibility === 'coded' ? 'By site (sites coded)' : page.data.siteVisibility === 'own-sites' ? 'Your sites' : 'By site'}>
                    <StrataTable strata={page.data.bySite} level={page.data.level} caption="Outcomes by site (events: proportion with CI)" />
                  </Panel>
                  <MethodsNote methods={page.data.methods} />
                </>
              )}
            </>
          )}
        </section>
      </div>
    </div>
  );
}

/** Save the current filter as a named cohort (private, or shared with analysts and committee), and open saved ones. */
function SavePanel({ filterQuery, canShare }: { filterQuery: string; canShare: boolean }) {
  const saved = useSavedCohorts();
  const create = useCreateCohort();
  const update = useUpdateCohort();
  const remove = useDeleteCohort();
  const [name, setName] = useState('');
  const [shared, setShared] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const parsed = CohortFilterSchema.safeParse(cohortFilterFromParams(new URLSearchParams(filterQuery)));
  const save = async () => {
    setMessage(null);
    if (!parsed.success) return setMessage('Correct the filters first.');
    try {
      await create.mutateAsync({ name, filter: parsed.data, shared });
      setMessage(`Saved "${name}".`);
      setName('');
    } catch (e) { setMessage(getErrorMessage(e)); }
  };
  const linkOf = (q: string) => `${window.location.origin}${paths.cohorts.builder}${q ? `?${q}` : ''}`;
  return (
    <Panel title="Saved cohorts">
      <form className="flex flex-col gap-2" onSubmit={(e) => { e.preventDefault(); void save(); }}>
        <label className="flex flex-col text-sm font-semibold" htmlFor="cohort-name">Name
          <input id="cohort-name" className={inputClass} value={name} onChange={(e) => setName(e.target.value)} maxLength={120} required />
        </label>
        {canShare && (
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" checked={shared} onChange={(e) => setShared(e.target.checked)} /> Share with the network's analysts and committee
          </label>
        )}
        <Button type="submit" disabled={!name.trim() || create.isPending}>Save cohort</Button>
        <Button type="button" variant="secondary" onClick={() => { void navigator.clipboard?.writeText(linkOf(filterQuery)).catch(() => undefined); setMessage(`Link: ${linkOf(filterQuery)}`); }}>Copy link to this view</Button>
        {message && <p role="status" className="break-all text-xs">{message}</p>}
      </form>
      {saved.isPending ? <Loading what="saved cohorts" /> : saved.isError ? <ErrorState error={saved.error} /> : (
        <ul className="mt-3 flex flex-col gap-1 text-sm">
          {saved.data.items.length === 0 && <li className="text-muted">No saved cohort yet.</li>}
          {saved.data.items.map((c) => {
            const q = encodeCohortFilter(c.filter).toString();
            return (
              <li key={c.id} className="flex flex-wrap items-center gap-2 border-b border-line/60 py-1">
                <Link className="font-semibold text-accent hover:underline" to={`${paths.cohorts.builder}${q ? `?${q}` : ''}`}>{c.name}</Link>
                <span className="text-xs text-muted">{c.shared ? 'shared' : 'private'}{c.mine ? '' : ` · by ${c.ownerName}`}</span>
                {c.mine && canShare && (
                  <Button variant="ghost" className="text-xs" onClick={() => update.mutate({ id: c.id, body: { shared: !c.shared } })}>{c.shared ? 'Make private' : 'Share'}</Button>
                )}
                {c.mine && <Button variant="ghost" className="text-xs" onClick={() => { if (window.confirm(`Delete the cohort "${c.name}"?`)) remove.mutate(c.id); }}>Delete</Button>}
              </li>
            );
          })}
        </ul>
      )}
    </Panel>
  );
}
