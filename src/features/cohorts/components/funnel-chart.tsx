import { CartesianGrid, ComposedChart, Line, ReferenceLine, ResponsiveContainer, Scatter, Tooltip, XAxis, YAxis } from 'recharts';
import type { Funnel } from '../../../../shared/analysis/results.js';
import { OKABE_ITO } from '../format.js';

/** Funnel plot: each site's proportion against its cases, 95% and 99.8% limits around the network proportion. */
export function FunnelChart({ funnel }: { funnel: Funnel }) {
  const curve = funnel.curve.map((c) => ({ size: c.size, lower95: c.lower95 * 100, upper95: c.upper95 * 100, lower998: c.lower998 * 100, upper998: c.upper998 * 100 }));
  const points = funnel.sites.filter((s) => s.proportion != null && s.total != null).map((s) => ({ size: s.total as number, value: (s.proportion as number) * 100, label: s.label, position: s.position }));
  const description = `Funnel plot of ${funnel.label}: ${points.length} sites against their number of cases, with 95% and 99.8% limits around the network proportion of ${funnel.target == null ? '—' : (funnel.target * 100).toFixed(1)}%. ${points.map((p) => `${p.label}: ${p.value.toFixed(1)}% of ${p.size} cases (${(p.position ?? '').replace(/-/g, ' ')})`).join('; ')}.`;
  // The limits of tiny sizes reach 100%; show the band where the sites are (the curve is clipped).
  const yMax = Math.min(100, Math.ceil(Math.max(3 * (funnel.target ?? 0) * 100, ...points.map((p) => p.value * 1.5), 5)));
  const Shape = (props: { cx?: number; cy?: number; payload?: (typeof points)[number] }) => {
    const { cx, cy, payload } = props;
    if (cx === undefined || cy === undefined || !payload) return <g />;
    const out = payload.position && payload.position !== 'within';
    return (
      <g>
        {out ? <path d={`M${cx},${cy - 7} l7,7 l-7,7 l-7,-7 Z`} fill={OKABE_ITO.vermillion} /> : <circle cx={cx} cy={cy} r={5} fill={OKABE_ITO.blue} />}
        <text x={cx + 8} y={cy + 4} fontSize={10} fill="#1f2a2e">{payload.label.split(' — ')[0]}</text>
      </g>
    );
  };
  return (
    <figure className="print:break-inside-avoid">
      <div role="img" aria-label={description} style={{ width: '100%', height: 320 }}>
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={curve} margin={{ top: 8, right: 40, bottom: 24, left: 8 }}>
            <CartesianGrid stroke="#e6e1d6" />
            <XAxis type="number" dataKey="size" domain={[0, 'dataMax']} tick={{ fontSize: 11, fill: '#1f2a2e' }} label={{ value: 'counted cases', position: 'insideBottom', offset: -12, fontSize: 11, fill: '#1f2a2e' }} />
            <YAxis type="number" domain={[0, yMax]} allowDataOverflow tick={{ fontSize: 11, fill: '#1f2a2e' }} width={56} label={{ value: '%', angle: -90, position: 'insideLeft', fontSize: 11, fill: '#1f2a2e' }} />
            <Tooltip formatter={(v: unknown, n: unknown) => [typeof v === 'number' ? `${v.toFixed(2)}%` : String(v), String(n)]} />
            {funnel.target != null && <ReferenceLine y={funnel.target * 100} stroke={OKABE_ITO.green} label={{ value: 'network', position: 'right', fontSize: 10 }} />}
            <Line dataKey="upper95" name="95% upper" stroke={OKABE_ITO.orange} strokeDasharray="5 3" dot={false} isAnimationActive={false} />
            <Line dataKey="lower95" name="95% lower" stroke={OKABE_ITO.orange} strokeDasharray="5 3" dot={false} isAnimationActive={false} />
            <Line dataKey="upper998" name="99.8% upper" stroke={OKABE_ITO.vermillion} dot={false} isAnimationActive={false} />
            <Line dataKey="lower998" name="99.8% lower" stroke={OKABE_ITO.vermillion} dot={false} isAnimationActive={false} />
            <Scatter data={points} dataKey="value" name="Site" shape={Shape} isAnimationActive={false} />
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-muted"><span style={{ color: OKABE_ITO.blue }}>●</span> site within the 95% limits, <span style={{ color: OKABE_ITO.vermillion }}>◆</span> outside them; dashed orange: 95% limits; solid red: 99.8% limits; green: network proportion.</figcaption>
    </figure>
  );
}
