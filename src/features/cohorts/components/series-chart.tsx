import { CartesianGrid, ComposedChart, Line, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { Series } from '../../../../shared/analysis/results.js';
import { OKABE_ITO } from '../format.js';

/** The measure per month or quarter with its p-chart (u-chart) limits; points beyond a limit get a triangle. */
export function SeriesChart({ series }: { series: Series }) {
  const pct = series.unit === '%';
  const k = pct ? 100 : 1;
  const data = series.points.map((p) => ({ period: p.period, value: p.value == null ? null : p.value * k, lcl: p.lcl == null ? null : p.lcl * k, ucl: p.ucl == null ? null : p.ucl * k, centre: series.centre == null ? null : series.centre * k, outside: p.outside }));
  const unit = pct ? '%' : series.unit;
  const outside = data.filter((d) => d.outside).length;
  const Dot = (props: { cx?: number; cy?: number; payload?: (typeof data)[number]; index?: number }) => {
    const { cx, cy, payload, index } = props;
    if (cx === undefined || cy === undefined || !payload || payload.value == null) return <g key={`d${index}`} />;
    return payload.outside
      ? <path key={`d${index}`} d={`M${cx},${cy - 7} l6,11 l-12,0 Z`} fill={OKABE_ITO.vermillion} />
      : <circle key={`d${index}`} cx={cx} cy={cy} r={3} fill={OKABE_ITO.blue} />;
  };
  return (
    <figure className="print:break-inside-avoid">
      <div role="img" aria-label={`${series.label} by ${series.grouping}, ${data.length} points with control limits; ${outside} point(s) beyond a limit.`} style={{ width: '100%', height: 240 }}>
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={data} margin={{ top: 8, right: 16, bottom: 8, left: 8 }}>
            <CartesianGrid stroke="#e6e1d6" vertical={false} />
            <XAxis dataKey="period" tick={{ fontSize: 10, fill: '#1f2a2e' }} interval="preserveStartEnd" minTickGap={24} />
            <YAxis tick={{ fontSize: 11, fill: '#1f2a2e' }} width={56} domain={[0, 'auto']} label={{ value: unit, angle: -90, position: 'insideLeft', fontSize: 11, fill: '#1f2a2e' }} />
            <Tooltip formatter={(v: unknown, n: unknown) => [typeof v === 'number' ? `${v.toFixed(2)} ${unit}` : '—', String(n)]} />
            <Line type="step" dataKey="ucl" name="Upper control limit" stroke={OKABE_ITO.vermillion} strokeDasharray="6 3" dot={false} isAnimationActive={false} />
            <Line type="step" dataKey="lcl" name="Lower control limit" stroke={OKABE_ITO.vermillion} strokeDasharray="6 3" dot={false} isAnimationActive={false} />
            <Line type="linear" dataKey="centre" name="Centre line" stroke={OKABE_ITO.green} dot={false} isAnimationActive={false} />
            <Line type="linear" dataKey="value" name={series.label} stroke={OKABE_ITO.blue} strokeWidth={2} dot={Dot} isAnimationActive={false} connectNulls={false} />
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-muted"><span style={{ color: OKABE_ITO.blue }}>●</span> value, <span style={{ color: OKABE_ITO.vermillion }}>▲</span> beyond a 3-sigma limit, dashed: control limits, solid green: centre line.</figcaption>
    </figure>
  );
}
