import { Bar, CartesianGrid, Cell, ComposedChart, Line, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { OutcomeComparison } from '../../../../shared/analysis/results.js';
import { OKABE_ITO, fmtInterval, levelLabel } from '../format.js';

type Row = { label: string; est: number | null; range: [number, number] | null; text: string; kind: 'crude' | 'mh' };

/**
 * Forest plot: every outcome's risk ratio A/B (circles) and its Mantel-Haenszel risk ratio
 * across ARISCAT classes (diamonds), each with its confidence interval as a bar, on a log scale
 * around 1. Undefined ratios (no events) are left out and said so in the table.
 */
export function ForestPlot({ outcomes, level }: { outcomes: OutcomeComparison[]; level: number }) {
  const rows: Row[] = outcomes.flatMap((o) => {
    const short = o.label.replace(/ \(.*\)$/, '');
    const row = (iv: OutcomeComparison['riskRatio'], kind: Row['kind']): Row => {
      const ok = iv.estimate != null && iv.estimate > 0 && iv.lower != null && iv.lower > 0 && iv.upper != null;
      return { label: kind === 'crude' ? short : `${short}: stratified (MH)`, est: ok ? iv.estimate : null, range: ok ? [iv.lower as number, iv.upper as number] : null, text: fmtInterval(iv, 'ratio', level), kind };
    };
    return [row(o.riskRatio, 'crude'), row(o.mantelHaenszel, 'mh')];
  });
  const xs = rows.flatMap((r) => (r.range ? r.range : []));
  const lo = Math.min(0.5, ...xs) * 0.9;
  const hi = Math.max(2, ...xs) * 1.1;
  const description = `Forest plot of risk ratios A versus B with ${levelLabel(level)} confidence intervals: ${rows.map((r) => `${r.label} ${r.text}`).join('; ')}.`;
  const Dot = (props: { cx?: number; cy?: number; payload?: Row; index?: number }) => {
    const { cx, cy, payload, index } = props;
    if (cx === undefined || cy === undefined || !payload || payload.est == null) return <g key={`f${index}`} />;
    return payload.kind === 'mh'
      ? <path key={`f${index}`} d={`M${cx},${cy - 6} l6,6 l-6,6 l-6,-6 Z`} fill={OKABE_ITO.orange} stroke={OKABE_ITO.black} strokeWidth={0.5} />
      : <circle key={`f${index}`} cx={cx} cy={cy} r={5} fill={OKABE_ITO.blue} stroke={OKABE_ITO.black} strokeWidth={0.5} />;
  };
  return (
    <figure className="print:break-inside-avoid">
      <div role="img" aria-label={description} style={{ width: '100%', height: 40 + rows.length * 26 }}>
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={rows} layout="vertical" margin={{ top: 8, right: 24, bottom: 24, left: 8 }} barCategoryGap="35%">
            <CartesianGrid stroke="#e6e1d6" horizontal={false} />
            <XAxis type="number" scale="log" domain={[lo, hi]} allowDataOverflow tick={{ fontSize: 11, fill: '#1f2a2e' }} tickFormatter={(v: number) => v.toFixed(v < 1 ? 2 : 1)}
              label={{ value: 'risk ratio A / B (log scale; < 1: fewer events in A)', position: 'insideBottom', offset: -12, fontSize: 11, fill: '#1f2a2e' }} />
            <YAxis type="category" dataKey="label" width={230} tick={{ fontSize: 11, fill: '#1f2a2e' }} interval={0} />
            <ReferenceLine x={1} stroke={OKABE_ITO.black} strokeDasharray="3 3" />
            <Tooltip formatter={(_v: unknown, _n: unknown, item: { payload?: Row }) => [item.payload?.text ?? '', item.payload?.kind === 'mh' ? 'Mantel–Haenszel RR' : 'Risk ratio']} />
            <Bar dataKey="range" name="Confidence interval" isAnimationActive={false} barSize={3}>
              {rows.map((r, i) => <Cell key={i} fill={r.kind === 'mh' ? OKABE_ITO.orange : OKABE_ITO.blue} />)}
            </Bar>
            <Line dataKey="est" name="Risk ratio" stroke="none" dot={Dot} activeDot={false} isAnimationActive={false} />
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-muted"><span style={{ color: OKABE_ITO.blue }}>●</span> crude risk ratio, <span style={{ color: OKABE_ITO.orange }}>◆</span> Mantel–Haenszel risk ratio across ARISCAT classes; bars: {levelLabel(level)} confidence intervals; dashed line: no difference (1).</figcaption>
    </figure>
  );
}
