import { useMemo, useState, type FormEvent } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef, type SortingState, type VisibilityState } from '@tanstack/react-table';
import { CASE_STATUSES, CASE_STATUS_LABELS, PPC_EVENT_TYPE_LABELS, PROCEDURE_CATEGORIES, PROCEDURE_CATEGORY_LABELS } from '../../../shared/clinical/codes.js';
import { ARISCAT_RISK_CLASS_LABELS } from '../../../shared/clinical/scores.js';
import { CASE_SORT_FIELDS, OUTCOME_FILTER_VALUES, type CaseListItem } from '../../../shared/registry/list.js';
import { Button, EmptyState, ErrorState, inputClass, Loading, PageHeader, Panel } from '../../components/ui.js';
import { StatusBadge } from '../../components/status-badge.js';
import { paths } from '../../lib/paths.js';
import { userHasAccess, useSession } from '../../lib/session.js';
import { useCases } from './api/get-cases.js';
import { useSites } from './api/get-sites.js';
import { countText, PAGE_SIZES, readListState, toApiParams, writeListState, type CaseListState } from './list-state.js';

const OUTCOME_LABELS: Record<string, string> = { 'any-ppc': 'Any PPC', 'no-ppc': 'No PPC', 'pneumonia-nhsn': 'Pneumonia (CDC/NHSN PNU1 met)', ...PPC_EVENT_TYPE_LABELS };
const RISK_FILTERS = [['low', 'Low'], ['intermediate', 'Intermediate'], ['high', 'High'], ['unscored', 'Not yet scored']] as const;
const shortCategory = (c: string) => PROCEDURE_CATEGORY_LABELS[c as keyof typeof PROCEDURE_CATEGORY_LABELS]?.replace(/ \(.*\)$/, '') ?? c;

/** Columns: a typed module constant; `id` is the server's sort field where one exists. */
const COLUMNS: ColumnDef<CaseListItem>[] = [
  { id: 'registryNumber', accessorKey: 'registryNumber', header: 'Registry number', cell: ({ row }) => <Link className="font-semibold text-accent underline-offset-2 hover:underline" to={paths.cases.detail(row.original.id)}>{row.original.registryNumber}</Link> },
  { id: 'siteCode', header: 'Site', accessorKey: 'siteCode' },
  { id: 'unitCode', header: 'Unit', accessorFn: (r) => r.unitCode ?? '—', enableSorting: false },
  { id: 'surgeryDate', header: 'Surgery', accessorKey: 'surgeryDate' },
  { id: 'status', accessorKey: 'status', header: 'Status', cell: ({ row }) => <StatusBadge status={row.original.status} /> },
  { id: 'procedureCategory', header: 'Procedure', accessorFn: (r) => (r.procedureCategory ? shortCategory(r.procedureCategory) : '—') },
  { id: 'age', header: 'Age (years)', accessorFn: (r) => r.age ?? '—', meta: { numeric: true } },
  {
    id: 'ariscatPoints', accessorKey: 'ariscatPoints', header: 'ARISCAT points', meta: { numeric: true },
    cell: ({ row }) => (row.original.ariscatPoints == null ? <span className="text-muted">not scored</span> : <span>{row.original.ariscatPoints} · {row.original.ariscatClass}</span>),
  },
  {
    id: 'outcome', header: 'Outcomes', enableSorting: false,
    cell: ({ row }) => (row.original.eventTypes.length === 0 ? <span className="text-muted">none recorded</span> : <span>{row.original.anyPpc ? 'PPC: ' : ''}{row.original.eventTypes.map((t) => PPC_EVENT_TYPE_LABELS[t]).join(', ')}</span>),
  },
  { id: 'complete', header: 'Required data', enableSorting: false, cell: ({ row }) => (row.original.complete ? 'Complete' : <span className="text-ochre">Missing items</span>) },
  { id: 'updatedAt', accessorKey: 'updatedAt', header: 'Last change', cell: ({ row }) => new Date(row.original.updatedAt).toLocaleDateString('en-CA') },
];
const SORTABLE = new Set<string>(CASE_SORT_FIELDS);
const COLUMN_LABEL = Object.fromEntries(COLUMNS.map((c) => [c.id!, String(c.header)]));

function Filters({ state, set }: { state: CaseListState; set: (next: CaseListState) => void }) {
  const sites = useSites();
  const session = useSession();
  const user = session.data!.user;
  const mySites = (sites.data?.items ?? []).filter((s) => user.roles.includes('admin') || user.siteIds.includes(s.id));
  const p = state.params;
  const [q, setQ] = useState(p.q ?? '');
  const update = (patch: Partial<typeof p>) => set({ ...state, params: { ...p, ...patch, page: 1 } });
  const toggle = (key: 'status' | 'riskClass', v: string) => {
    const cur = p[key] ?? [];
    const next = cur.includes(v) ? cur.filter((x) => x !== v) : [...cur, v];
    update({ [key]: next.length ? next : undefined });
  };
  const search = (e: FormEvent) => { e.preventDefault(); update({ q: q.trim() || undefined }); };
  const any = !!(p.siteId || p.surgeryFrom || p.surgeryTo || p.status || p.procedureCategory || p.riskClass || p.outcome || p.q);
  return (
    <Panel title="Filters" className="no-print">
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <form onSubmit={search} className="flex flex-col gap-1" role="search">
          <label htmlFor="f-q" className="text-sm font-semibold">Registry number</label>
          <div className="flex gap-1">
            <input id="f-q" className={`${inputClass} min-w-0 flex-1`} value={q} onChange={(e) => setQ(e.target.value)} placeholder="e.g. HBR-2025" />
            <Button type="submit" variant="secondary">Find</Button>
          </div>
        </form>
        <div className="flex flex-col gap-1">
          <label htmlFor="f-site" className="text-sm font-semibold">Site</label>
          <select id="f-site" className={inputClass} value={p.siteId?.[0] ?? ''} onChange={(e) => update({ siteId: e.target.value ? [e.target.value] : undefined })}>
            <option value="">All my sites</option>
            {mySites.map((s) => <option key={s.id} value={s.id}>{s.code} — {s.name}</option>)}
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <span className="text-sm font-semibold" id="f-dates">Surgery dates</span>
          <div className="flex items-center gap-1" role="group" aria-labelledby="f-dates">
            <input aria-label="Surgery from" type="date" className={`${inputClass} min-w-0 flex-1`} value={p.surgeryFrom ?? ''} onChange={(e) => update({ surgeryFrom: e.target.value || undefined })} />
            <span aria-hidden="true">–</span>
            <input aria-label="Surgery to" type="date" className={`${inputClass} min-w-0 flex-1`} value={p.surgeryTo ?? ''} onChange={(e) => update({ surgeryTo: e.target.value || undefined })} />
          </div>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="f-proc" className="text-sm font-semibold">Procedure category</label>
          <select id="f-proc" className={inputClass} value={p.procedureCategory?.[0] ?? ''} onChange={(e) => update({ procedureCategory: e.target.value ? [e.target.value] : undefined })}>
            <option value="">Any</option>
            {PROCEDURE_CATEGORIES.map((c) => <option key={c} value={c}>{PROCEDURE_CATEGORY_LABELS[c]}</option>)}
          </select>
        </div>
        <fieldset className="flex flex-col gap-1 sm:col-span-2">
          <legend className="text-sm font-semibold">Status</legend>
          <div className="flex flex-wrap gap-x-3 gap-y-1">
            {CASE_STATUSES.map((s) => (
              <label key={s} className="flex items-center gap-1 text-sm"><input type="checkbox" checked={p.status?.includes(s) ?? false} onChange={() => toggle('status', s)} /> {CASE_STATUS_LABELS[s]}</label>
            ))}
          </div>
        </fieldset>
        <fieldset className="flex flex-col gap-1">
          <legend className="text-sm font-semibold">ARISCAT risk class</legend>
          <div className="flex flex-wrap gap-x-3 gap-y-1">
            {RISK_FILTERS.map(([v, l]) => (
              <label key={v} className="flex items-center gap-1 text-sm" title={v === 'unscored' ? undefined : ARISCAT_RISK_CLASS_LABELS[v]}><input type="checkbox" checked={p.riskClass?.includes(v) ?? false} onChange={() => toggle('riskClass', v)} /> {l}</label>
            ))}
          </div>
        </fieldset>
        <div className="flex flex-col gap-1">
          <label htmlFor="f-outcome" className="text-sm font-semibold">Outcome</label>
          <select id="f-outcome" className={inputClass} value={p.outcome ?? ''} onChange={(e) => update({ outcome: e.target.value || undefined })}>
            <option value="">Any</option>
            {OUTCOME_FILTER_VALUES.map((o) => <option key={o} value={o}>{OUTCOME_LABELS[o]}</option>)}
          </select>
        </div>
      </div>
      {any && <Button variant="ghost" className="mt-2 px-0" onClick={() => { setQ(''); set({ ...state, params: { page: 1, pageSize: p.pageSize, sort: p.sort } }); }}>Clear all filters</Button>}
    </Panel>
  );
}

export function CaseListPage() {
  const [sp, setSp] = useSearchParams();
  const state = useMemo(() => readListState(sp), [sp]);
  const set = (next: CaseListState) => setSp(writeListState(next));
  const list = useCases(toApiParams(state.params));
  const session = useSession();
  const canCreate = userHasAccess(session.data!.user, ['admin', 'abstractor']);
  const p = state.params;
  const [field, dir] = (p.sort ?? 'surgeryDate.desc').split('.');
  const sorting: SortingState = [{ id: field, desc: dir === 'desc' }];
  const columnVisibility: VisibilityState = Object.fromEntries(state.hidden.map((h) => [h, false]));
  const data = list.data;
  const pageCount = data ? Math.max(1, Math.ceil(data.total / p.pageSize)) : -1;

  const table = useReactTable({
    data: data?.items ?? [],
    columns: COLUMNS,
    getCoreRowModel: getCoreRowModel(),
    manualPagination: true,
    manualSorting: true,
    manualFiltering: true,
    enableMultiSort: false,
    pageCount,
    state: { sorting, columnVisibility, pagination: { pageIndex: p.page - 1, pageSize: p.pageSize } },
    onSortingChange: (u) => {
      const next = typeof u === 'function' ? u(sorting) : u;
      const s = next[0];
      set({ ...state, params: { ...p, page: 1, sort: s ? `${s.id}.${s.desc ? 'desc' : 'asc'}` : undefined } });
    },
    onColumnVisibilityChange: (u) => {
      const next = typeof u === 'function' ? u(columnVisibility) : u;
      set({ ...state, hidden: Object.entries(next).filter(([, v]) => v === false).map(([k]) => k) });
    },
    getRowId: (r) => r.id,
  });
  const go = (page: number) => set({ ...state, params: { ...p, page } });

  return (
    <div>
      <PageHeader
        title="Cases"
        subtitle="Surgical cases of your sites. Filters, sort and page are kept in the address, so a link shows the same view."
        actions={canCreate && <Link to={paths.cases.create} className="inline-flex items-center rounded bg-accent px-3 py-1.5 text-sm font-semibold text-white hover:bg-accent-strong">New case</Link>}
      />
      <div className="flex flex-col gap-4">
        <Filters key={p.q ?? ''} state={state} set={set} />
        <section aria-labelledby="case-table-title" className="rounded border border-line bg-panel">
          <div className="flex flex-wrap items-center justify-between gap-2 border-b border-line px-3 py-2">
            <h2 id="case-table-title" className="text-base font-semibold">
              <span aria-live="polite">{data ? countText(p.page, p.pageSize, data.items.length, data.total, data.totalIsEstimate) : 'Cases'}</span>
              {list.isFetching && data && <span className="ml-2 text-xs font-normal text-muted">updating…</span>}
            </h2>
            <details className="relative no-print">
              <summary className="cursor-pointer rounded border border-line px-2 py-1 text-sm">Columns</summary>
              <fieldset className="absolute right-0 z-10 mt-1 w-56 rounded border border-line bg-panel p-2 shadow">
                <legend className="sr-only">Columns shown</legend>
                {table.getAllLeafColumns().filter((c) => c.id !== 'registryNumber').map((c) => (
                  <label key={c.id} className="flex items-center gap-2 py-0.5 text-sm"><input type="checkbox" checked={c.getIsVisible()} onChange={c.getToggleVisibilityHandler()} /> {COLUMN_LABEL[c.id]}</label>
                ))}
              </fieldset>
            </details>
          </div>
          {list.isPending && <Loading what="cases" />}
          {list.error && <div className="p-3"><ErrorState error={list.error} retry={() => list.refetch()} /></div>}
          {data && data.items.length === 0 && <div className="p-3"><EmptyState title="No cases match these filters">Change or clear the filters{canCreate ? ', or enter a new case' : ''}.</EmptyState></div>}
          {data && data.items.length > 0 && (
            <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Cases table (scrolls sideways)">
              <table className="w-full text-left text-sm">
                <caption className="sr-only">Cases, sorted by {COLUMN_LABEL[field] ?? field} {dir === 'desc' ? 'descending' : 'ascending'}</caption>
                <thead className="border-b border-line bg-surface text-muted">
                  {table.getHeaderGroups().map((hg) => (
                    <tr key={hg.id}>
                      {hg.headers.map((h) => {
                        const sortable = SORTABLE.has(h.column.id) && h.column.getCanSort();
                        const sorted = h.column.getIsSorted();
                        const numeric = (h.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                        return (
                          <th key={h.id} scope="col" aria-sort={sorted ? (sorted === 'desc' ? 'descending' : 'ascending') : undefined} className={`px-3 py-2 font-semibold whitespace-nowrap ${numeric ? 'text-right' : ''}`}>
                            {sortable ? (
                              <button type="button" className="inline-flex items-center gap-1 hover:text-ink" onClick={h.column.getToggleSortingHandler()} title="Sort by this column">
                                {flexRender(h.column.columnDef.header, h.getContext())}
                                <span aria-hidden="true">{sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}</span>
                              </button>
                            ) : flexRender(h.column.columnDef.header, h.getContext())}
                          </th>
                        );
                      })}
                    </tr>
                  ))}
                </thead>
                <tbody>
                  {table.getRowModel().rows.map((r) => (
                    <tr key={r.id} className="border-b border-line/60 hover:bg-accent-soft/40">
                      {r.getVisibleCells().map((c) => (
                        <td key={c.id} className={`px-3 py-1.5 ${c.column.id === 'outcome' || c.column.id === 'procedureCategory' ? '' : 'whitespace-nowrap'} ${(c.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric ? 'text-right tabular' : ''}`}>{flexRender(c.column.columnDef.cell ?? ((x) => String(x.getValue() ?? '')), c.getContext())}</td>
                      ))}
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
          {data && (
            <nav aria-label="Pages" className="flex flex-wrap items-center justify-between gap-2 px-3 py-2 text-sm no-print">
              <div className="flex items-center gap-1">
                <Button variant="secondary" disabled={p.page <= 1} onClick={() => go(1)}>First</Button>
                <Button variant="secondary" disabled={p.page <= 1} onClick={() => go(p.page - 1)}>Previous</Button>
                <span className="px-2 tabular">Page {p.page.toLocaleString('en-GB')} of {data.totalIsEstimate ? 'about ' : ''}{pageCount.toLocaleString('en-GB')}</span>
                <Button variant="secondary" disabled={data.items.length < p.pageSize || (!data.totalIsEstimate && p.page >= pageCount)} onClick={() => go(p.page + 1)}>Next</Button>
                <Button variant="secondary" disabled={!!data.totalIsEstimate || p.page >= pageCount} onClick={() => go(pageCount)} title={data.totalIsEstimate ? 'The total is an estimate: narrow the filters to jump to the last page' : undefined}>Last</Button>
              </div>
              <label className="flex items-center gap-2">Rows per page
                <select className={inputClass} value={p.pageSize} onChange={(e) => set({ ...state, params: { ...p, page: 1, pageSize: Number(e.target.value) } })}>
                  {PAGE_SIZES.map((s) => <option key={s} value={s}>{s}</option>)}
                </select>
              </label>
            </nav>
          )}
        </section>
      </div>
    </div>
  );
}
