import { useParams } from 'react-router-dom';
import { ClinicalCaution, ErrorState, Loading, PageHeader } from '../../components/ui.js';
import { useChart } from './api/get-chart.js';
import { useMeasures, type MeasureRow } from './api/get-measures.js';
import { useReview } from './api/reviews.js';
import { ChartTable } from './components/ChartTable.js';
import { periodLabel } from './components/format.js';
import { SignalList } from './components/SignalList.js';
import { SpcChart } from './components/SpcChart.js';

function MeasureSection({ m, month }: { m: MeasureRow; month: string }) {
  const chart = useChart(m.key, { site: 'network', view: 'monthly', rebase: [], to: month });
  if (chart.isPending) return <Loading what={m.short} />;
  if (chart.error) return <ErrorState error={chart.error} />;
  const c = chart.data!;
  return (
    <section className="mb-6 break-inside-avoid print:break-after-page">
      <h2 className="text-lg font-semibold">{m.label}</h2>
      <p className="text-sm">{c.summary}</p>
      <SpcChart chart={c} mode="control" height={260} />
      <SignalList chart={c} mode="run" />
      <div className="mt-2"><SignalList chart={c} mode="control" /></div>
      <div className="mt-2"><ChartTable chart={c} /></div>
    </section>
  );
}

/** The packet's content as one printable page (print stylesheet: no navigation, page breaks per measure). */
export function PrintPage() {
  const { month } = useParams() as { month: string };
  const measures = useMeasures();
  const review = useReview(month);
  const r = review.data;
  return (
    <div className="print-packet">
      <PageHeader title={`Committee review — ${periodLabel(month)}`} subtitle="Network charts, signals, findings and actions. Print with your browser (Ctrl+P)." />
      <ClinicalCaution />
      {r && (
        <section className="my-4">
          <h2 className="text-lg font-semibold">Findings and actions</h2>
          <p className="text-sm">{r.status === 'signed' ? `Signed off by ${r.signedBy} on ${r.signedAt?.slice(0, 10)}.` : 'Not signed off yet.'}</p>
          <table className="mt-2 w-full text-sm"><caption className="sr-only">Findings</caption>
            <thead><tr className="text-left"><th scope="col">Measure</th><th scope="col">Signal seen</th><th scope="col">Discussion</th></tr></thead>
            <tbody>{r.findings.map((f) => <tr key={f.measureKey} className="border-t border-line"><td>{measures.data?.items.find((m) => m.key === f.measureKey)?.short}</td><td>{f.signalSeen ? 'yes' : 'no'}</td><td>{f.discussion}</td></tr>)}</tbody>
          </table>
          <ul className="mt-2 text-sm">{r.actions.map((a) => <li key={a.id}>• {a.description} — {a.ownerName}, due {a.dueDate} ({a.status})</li>)}</ul>
        </section>
      )}
      {measures.data?.items.filter((m) => m.enabled).map((m) => <MeasureSection key={m.key} m={m} month={month} />)}
    </div>
  );
}
