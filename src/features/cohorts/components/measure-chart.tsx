import { Bar, CartesianGrid, ComposedChart, ErrorBar, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { MeasureResult } from '../../../../shared/analysis/results.js';
import { OKABE_ITO, fmtInterval, levelLabel } from '../format.js';

/** Each outcome's proportion (%) with its confidence interval as error bars. */
export function MeasureChart({ measures, level }: { measures: MeasureResult[]; level: number }) {
  const data = measures.filter((m) => m.kind === 'proportion').map((m) => ({
    label: m.label.replace(/ \(.*\)$/, ''),
    value: m.interval.estimate == null ? null : m.interval.estimate * 100,
    err: m.interval.estimate == null || m.interval.lower == null || m.interval.upper == null ? [0, 0] : [(m.interval.estimate - m.interval.lower) * 100, (m.interval.upper - m.interval.estimate) * 100],
    text: fmtInterval(m.interval, 'proportion', level),
  }));
  const description = `Bar chart of ${data.length} outcome proportions in percent with ${levelLabel(level)} confidence intervals: ${data.map((d) => `${d.label} ${d.text}`).join('; ')}.`;
  return (
    <figure className="print:break-inside-avoid">
      <div role="img" aria-label={description} style={{ width: '100%', height: 260 }}>
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={data} layout="vertical" margin={{ top: 8, right: 24, bottom: 16, left: 8 }}>
            <CartesianGrid stroke="#e6e1d6" horizontal={false} />
            <XAxis type="number" tick={{ fontSize: 11, fill: '#1f2a2e' }} label={{ value: '% of counted cases', position: 'insideBottom', offset: -8, fontSize: 11, fill: '#1f2a2e' }} domain={[0, 'auto']} />
            <YAxis type="category" dataKey="label" width={190} tick={{ fontSize: 11, fill: '#1f2a2e' }} />
            <Tooltip formatter={(_v: unknown, _n: unknown, item: { payload?: { text: string } }) => [item.payload?.text ?? '', 'Proportion']} />
            <Bar dataKey="value" fill={OKABE_ITO.sky} stroke={OKABE_ITO.blue} isAnimationActive={false} name="Proportion (%)">
              <ErrorBar dataKey="err" width={6} strokeWidth={1.5} stroke={OKABE_ITO.black} direction="x" />
            </Bar>
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-muted">Bars: proportion of counted cases; whiskers: {levelLabel(level)} confidence interval. The table beside gives the numbers.</figcaption>
    </figure>
  );
}
