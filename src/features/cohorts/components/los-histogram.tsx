import { Bar, BarChart, CartesianGrid, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { LosSummary } from '../../../../shared/analysis/results.js';
import { OKABE_ITO } from '../format.js';

export function LosHistogram({ los }: { los: LosSummary }) {
  const data = los.histogram.map((h) => ({ days: h.days, count: h.count ?? 0, hidden: h.count == null }));
  const description = `Histogram of length of stay in days for ${los.cases ?? 'a suppressed number of'} cases; median ${los.median ?? '—'} days, interquartile range ${los.q1 ?? '—'} to ${los.q3 ?? '—'} days.`;
  return (
    <figure className="print:break-inside-avoid">
      <div role="img" aria-label={description} style={{ width: '100%', height: 200 }}>
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={data} margin={{ top: 8, right: 16, bottom: 16, left: 8 }}>
            <CartesianGrid stroke="#e6e1d6" vertical={false} />
            <XAxis dataKey="days" tick={{ fontSize: 10, fill: '#1f2a2e' }} label={{ value: 'length of stay (days)', position: 'insideBottom', offset: -8, fontSize: 11, fill: '#1f2a2e' }} interval="preserveStartEnd" />
            <YAxis tick={{ fontSize: 11, fill: '#1f2a2e' }} width={56} label={{ value: 'cases', angle: -90, position: 'insideLeft', fontSize: 11, fill: '#1f2a2e' }} />
            <Tooltip formatter={(v: unknown) => [`${String(v)} cases`, 'Cases']} labelFormatter={(l: unknown) => `${String(l)} days`} />
            <Bar dataKey="count" fill={OKABE_ITO.green} isAnimationActive={false} name="Cases" />
          </BarChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-muted">Cases by length of stay (discharge minus admission date, days; the last bar pools 30 days and more).</figcaption>
    </figure>
  );
}
