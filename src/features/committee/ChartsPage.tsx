import { useState, type FormEvent } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import type { Site } from '../../../shared/sites.js';
import { Button, ClinicalCaution, EmptyState, ErrorState, Field, inputClass, Loading, Notice, PageHeader, Panel } from '../../components/ui.js';
import { get } from '../../lib/api-client.js';
import { queryKeys } from '../../lib/query-keys.js';
import { useSession } from '../../lib/session.js';
import { useAddAnnotation, useRemoveAnnotation } from './api/annotations.js';
import { useChart, useGChart } from './api/get-chart.js';
import { useMeasures } from './api/get-measures.js';
import { ChartTable } from './components/ChartTable.js';
import { periodLabel } from './components/format.js';
import { SignalList } from './components/SignalList.js';
import { SpcChart } from './components/SpcChart.js';

const useSiteList = () => useQuery({ queryKey: queryKeys.sites.list(), queryFn: () => get<{ items: Site[] }>('/api/sites'), staleTime: 5 * 60_000 });

function AnnotationForm({ site }: { site: string }) {
  const add = useAddAnnotation();
  const [month, setMonth] = useState('');
  const [text, setText] = useState('');
  const submit = (e: FormEvent) => {
    e.preventDefault();
    add.mutate({ siteId: site === 'network' ? null : site, month, text }, { onSuccess: () => { setMonth(''); setText(''); } });
  };
  return (
    <form onSubmit={submit} className="flex flex-wrap items-end gap-2 no-print">
      <Field label="Month" htmlFor="note-month"><input id="note-month" type="month" className={inputClass} value={month} onChange={(e) => setMonth(e.target.value)} required /></Field>
      <Field label="Note" htmlFor="note-text" hint="e.g. protocol introduced, new abstractor"><input id="note-text" className={`${inputClass} w-72`} value={text} onChange={(e) => setText(e.target.value)} required minLength={3} maxLength={200} /></Field>
      <Button type="submit" variant="secondary" disabled={add.isPending}>Pin note</Button>
      {add.error && <ErrorState error={add.error} />}
    </form>
  );
}

export function ChartsPage() {
  const [params, setParams] = useSearchParams();
  const measures = useMeasures();
  const sites = useSiteList();
  const { data: session } = useSession();
  const remove = useRemoveAnnotation();
  const enabled = measures.data?.items.filter((m) => m.enabled) ?? [];
  const key = params.get('measure') ?? enabled[0]?.key ?? 'any-ppc';
  const site = params.get('site') ?? 'network';
  const view = (params.get('view') === 'quarterly' ? 'quarterly' : 'monthly') as 'monthly' | 'quarterly';
  const rebase = (params.get('rebase') ?? '').split(',').filter(Boolean);
  const chart = useChart(key, { site, view, rebase }, !!measures.data);
  const measure = measures.data?.items.find((m) => m.key === key);
  const showG = params.get('g') === '1';
  const g = useGChart(key, site, showG && !!measure?.rareEvent);
  const set = (patch: Record<string, string | null>) => {
    const next = new URLSearchParams(params);
    for (const [k, v] of Object.entries(patch)) { if (v === null || v === '') next.delete(k); else next.set(k, v); }
    setParams(next, { replace: true });
  };
  const toggleRebase = (month: string) => {
    const list = rebase.includes(month) ? rebase.filter((m) => m !== month) : [...rebase, month];
    set({ rebase: list.join(',') || null });
  };
  const c = chart.data;
  return (
    <div>
      <PageHeader title="Measure charts" subtitle="Run chart and control chart of each measure, for the network or one site. Closed months are final; open months are provisional." actions={c && <Link className="text-sm text-accent underline" to={`/committee/measures/${key}`}>Definition of {c.measure.short}</Link>} />
      <div className="mb-4 flex flex-wrap items-end gap-3 no-print">
        <Field label="Measure" htmlFor="pick-measure">
          <select id="pick-measure" className={inputClass} value={key} onChange={(e) => set({ measure: e.target.value, rebase: null, g: null })}>
            {enabled.map((m) => <option key={m.key} value={m.key}>{m.short}</option>)}
          </select>
        </Field>
        <Field label="Site" htmlFor="pick-site">
          <select id="pick-site" className={inputClass} value={site} onChange={(e) => set({ site: e.target.value, rebase: null, g: null })}>
            <option value="network">Whole network</option>
            {sites.data?.items.map((s) => <option key={s.id} value={s.id}>{s.name} ({s.code})</option>)}
          </select>
        </Field>
        <Field label="View" htmlFor="pick-view">
          <select id="pick-view" className={inputClass} value={view} onChange={(e) => set({ view: e.target.value === 'monthly' ? null : e.target.value, rebase: null })}>
            <option value="monthly">Monthly</option><option value="quarterly">Quarterly</option>
          </select>
        </Field>
        {measure?.rareEvent && site !== 'network' && <Button variant="secondary" onClick={() => set({ g: showG ? null : '1' })}>{showG ? 'Hide g-chart' : 'Show g-chart (cases between events)'}</Button>}
      </div>
      {(measures.isPending || chart.isPending) && <Loading what="the chart" />}
      {chart.error && <ErrorState error={chart.error} retry={() => chart.refetch()} />}
      {measure?.caution && <div className="mb-3"><ClinicalCaution /></div>}
      {c && (
        <div className="flex flex-col gap-4">
          <Notice tone={c.signals.some((s) => !s.provisional) ? 'warn' : 'info'}><strong>{c.measure.label} — {c.scope.label}.</strong> {c.summary}</Notice>
          {c.rareEventAdvice && <Notice tone="warn">{c.rareEventAdvice}</Notice>}
          {showG && g.data && (
            <Panel title="g-chart: counted cases between events">
              <p className="mb-2 text-sm">{g.data.summary}</p>
              <table className="text-xs"><caption className="sr-only">Cases between events</caption><thead><tr><th scope="col" className="p-1 text-left">Event in</th><th scope="col" className="p-1 text-right">Cases since the previous event</th><th scope="col" className="p-1 text-right">Upper limit</th></tr></thead>
                <tbody>{g.data.points.map((p, i) => <tr key={i} className="border-t border-line"><td className="p-1">{periodLabel(p.eventMonth)}</td><td className="p-1 text-right">{p.between}{p.outside ? ' ▲ above the limit (a long gap: good news)' : ''}</td><td className="p-1 text-right">{p.upper.toFixed(1)}</td></tr>)}</tbody></table>
              {g.data.signals.map((s) => <p key={s.id} className="mt-2 text-sm text-muted">{s.explanation}</p>)}
            </Panel>
          )}
          <div className="grid gap-4 xl:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
            <div className="flex flex-col gap-4">
              <Panel title={`Run chart (${c.view})`}>
                <SpcChart chart={c} mode="run" />
                <h3 className="mb-2 mt-3 text-sm font-semibold">Run-chart signals (shifts, trends, Anhøj runs rules)</h3>
                <SignalList chart={c} mode="run" />
                <p className="mt-2 text-xs text-muted">
                  {c.phases.map((p) => `Phase ${p.index + 1} (${periodLabel(p.startPeriod)}–${periodLabel(p.endPeriod)}): median of the first ${p.baselinePoints} points; ${p.useful} useful points, longest run ${p.longestRun} (limit ${p.longestRunLimit ?? '—'}), ${p.crossings} crossings (at least ${p.crossingsLimit ?? '—'} expected).`).join(' ')}
                </p>
              </Panel>
              <Panel title={`Control chart: ${c.measure.chart}`}>
                <SpcChart chart={c} mode="control" />
                <h3 className="mb-2 mt-3 text-sm font-semibold">Special-cause signals</h3>
                <SignalList chart={c} mode="control" />
              </Panel>
            </div>
            <div className="flex flex-col gap-4">
              <Panel title="Notes and re-basing">
                {c.annotations.length === 0 && <p className="text-sm text-muted">No note on this chart yet.</p>}
                <ul className="mb-3 flex flex-col gap-2 text-sm">
                  {c.annotations.map((a) => (
                    <li key={a.id} className="rounded border border-line p-2">
                      <p><strong>{periodLabel(a.month)}</strong>{a.siteCode && site === 'network' ? ` (${a.siteCode})` : ''}: {a.text} <span className="text-xs text-muted">({a.createdBy ?? 'unknown'})</span></p>
                      <div className="mt-1 flex flex-wrap items-center gap-3 no-print">
                        <label className="flex items-center gap-1 text-xs"><input type="checkbox" checked={rebase.includes(a.month)} onChange={() => toggleRebase(a.month)} disabled={view === 'quarterly'} /> Start a new phase here (re-base)</label>
                        {session?.user.roles.includes('admin') ? <button type="button" className="text-xs text-danger underline" onClick={() => remove.mutate(a.id)}>Remove</button> : null}
                      </div>
                    </li>
                  ))}
                </ul>
                {remove.error && <ErrorState error={remove.error} />}
                <AnnotationForm site={site} />
              </Panel>
              <Panel title="Data table"><ChartTable chart={c} /></Panel>
            </div>
          </div>
        </div>
      )}
      {measures.data && enabled.length === 0 && <EmptyState title="No measure is switched on">An administrator switches measures on in the catalogue.</EmptyState>}
    </div>
  );
}
