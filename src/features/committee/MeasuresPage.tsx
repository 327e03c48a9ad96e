import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { chartKindLabel, type MeasureKey } from '../../../shared/committee/measures.js';
import { Button, ClinicalCaution, ErrorState, inputClass, Loading, PageHeader, Panel } from '../../components/ui.js';
import { useSession } from '../../lib/session.js';
import { useMeasures, useUpdateMeasure, type MeasureRow } from './api/get-measures.js';
import { periodLabel } from './components/format.js';

function SettingsForm({ m }: { m: MeasureRow }) {
  const update = useUpdateMeasure();
  const [start, setStart] = useState(m.baselineStart ?? '');
  const [end, setEnd] = useState(m.baselineEnd ?? '');
  return (
    <div className="flex flex-wrap items-end gap-2">
      <label className="flex items-center gap-1 text-xs"><input type="checkbox" checked={m.enabled} onChange={(e) => update.mutate({ key: m.key, enabled: e.target.checked })} /> On</label>
      <label className="text-xs">Baseline from <input aria-label={`Baseline first month of ${m.short}`} type="month" className={inputClass} value={start} onChange={(e) => setStart(e.target.value)} /></label>
      <label className="text-xs">to <input aria-label={`Baseline last month of ${m.short}`} type="month" className={inputClass} value={end} onChange={(e) => setEnd(e.target.value)} /></label>
      <Button variant="secondary" onClick={() => update.mutate({ key: m.key, baselineStart: start || null, baselineEnd: end || null })}>Save baseline</Button>
      {update.error && <ErrorState error={update.error} />}
    </div>
  );
}

export function MeasuresPage() {
  const measures = useMeasures();
  const { data } = useSession();
  const isAdmin = data?.user.roles.includes('admin');
  return (
    <div>
      <PageHeader title="Measures" subtitle="What the committee watches each month, how each is counted, and the chart it is read on." />
      {measures.isPending && <Loading what="measures" />}
      {measures.error && <ErrorState error={measures.error} />}
      {measures.data && (
        <div className="overflow-x-auto rounded border border-line bg-panel">
          <table className="w-full text-sm">
            <caption className="sr-only">Measures catalogue</caption>
            <thead><tr className="text-left"><th scope="col" className="p-2">Measure</th><th scope="col" className="p-2">Unit</th><th scope="col" className="p-2">Charts</th><th scope="col" className="p-2">Better</th><th scope="col" className="p-2">Status and baseline</th></tr></thead>
            <tbody>
              {measures.data.items.map((m) => (
                <tr key={m.key} className="border-t border-line align-top">
                  <td className="p-2"><Link className="font-semibold text-accent underline" to={`/committee/measures/${m.key}`}>{m.label}</Link></td>
                  <td className="p-2">{m.unit}</td>
                  <td className="p-2">run chart + {chartKindLabel(m.kind)}{m.rareEvent ? '; g-chart and quarterly view at small sites' : ''}</td>
                  <td className="p-2">{m.better}</td>
                  <td className="p-2">
                    {isAdmin ? <SettingsForm m={m} /> : (
                      <span>{m.enabled ? 'On' : 'Off'}; baseline {m.baselineStart ? `${periodLabel(m.baselineStart)} to ${m.baselineEnd ? periodLabel(m.baselineEnd) : '…'}` : 'first 12 months of each phase'}</span>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}

export function MeasureDefinitionPage() {
  const { key } = useParams() as { key: MeasureKey };
  const measures = useMeasures();
  const m = measures.data?.items.find((x) => x.key === key);
  if (measures.isPending) return <Loading what="the definition" />;
  if (measures.error) return <ErrorState error={measures.error} />;
  if (!m) return <div><PageHeader title="Measure not found" /><Link to="/committee/measures" className="text-accent underline">Back to the measures</Link></div>;
  return (
    <div>
      <PageHeader title={m.label} subtitle={`${m.enabled ? 'Switched on' : 'Switched off'} · ${m.unit} · ${m.better} is better`} actions={<Link className="text-sm text-accent underline" to={`/committee/charts?measure=${m.key}`}>Open the charts</Link>} />
      {m.caution && <div className="mb-4"><ClinicalCaution /></div>}
      <Panel>
        <dl className="grid gap-3 text-sm md:grid-cols-[12rem_1fr]">
          <dt className="font-semibold">Numerator</dt><dd>{m.numerator}</dd>
          <dt className="font-semibold">Denominator</dt><dd>{m.denominator}</dd>
          <dt className="font-semibold">Exclusions</dt><dd>{m.exclusions}</dd>
          <dt className="font-semibold">Source</dt><dd>{m.source}</dd>
          <dt className="font-semibold">Charts</dt><dd>Run chart against the baseline median (shifts, trends, Anhøj runs rules) and the {chartKindLabel(m.kind)} with limits for each month's size{m.rareEvent ? '; at small sites, the g-chart (cases between events) and the quarterly view' : ''}.</dd>
          <dt className="font-semibold">Baseline</dt><dd>{m.baselineStart ? `${periodLabel(m.baselineStart)} to ${m.baselineEnd ? periodLabel(m.baselineEnd) : 'the first 12 months'}` : 'The first 12 months of each phase (a phase starts at a re-basing note).'}</dd>
          <dt className="font-semibold">Months</dt><dd>Month of surgery. A month is provisional until it is closed; a closed month's numbers are frozen (corrections come in by re-opening it, with a reason).</dd>
        </dl>
      </Panel>
    </div>
  );
}
