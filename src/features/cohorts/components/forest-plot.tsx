import { CartesianGrid, ErrorBar, ReferenceLine, ResponsiveContainer, Scatter, ScatterChart, Tooltip, XAxis, YAxis } from 'recharts';
import type { OutcomeComparison } from '../../../../shared/analysis/results.js';
import { OKABE_ITO, fmtInterval, levelLabel } from '../format.js';

type Row = { y: number; label: string; est: number; err: [number, number]; text: string; kind: 'crude' | 'mh' };

/**
 * Forest plot: every outcome's risk ratio A/B (circles) and its Mantel-Haenszel risk ratio
 * across ARISCAT classes (diamonds), with confidence intervals, on a log scale around 1.
 */
export function ForestPlot({ outcomes, level }: { outcomes: OutcomeComparison[]; level: number }) {
  const rows: Row[] = [];
  outcomes.forEach((o, i) => {
    const add = (iv: OutcomeComparison['riskRatio'], kind: Row['kind'], dy: number) => {
      if (iv.estimate == null || iv.estimate <= 0 || iv.lower == null || iv.upper == null || iv.lower <= 0) return;
      rows.push({ y: i * 2 + dy, label: o.label, est: iv.estimate, err: [iv.estimate - iv.lower, iv.upper - iv.estimate], text: fmtInterval(iv, 'ratio', level), kind });
    };
    add(o.riskRatio, 'crude', 0);
    add(o.mantelHaenszel, 'mh', 0.7);
  });
  const xs = rows.flatMap((r) => [r.est - r.err[0], r.est + r.err[1]]);
  const lo = Math.min(0.5, ...xs) * 0.9;
  const hi = Math.max(2, ...xs) * 1.1;
  const labels = new Map(outcomes.map((o, i) => [i * 2, o.label.replace(/ \(.*\)$/, '')]));
  const description = `Forest plot of risk ratios A versus B with ${levelLabel(level)} confidence intervals: ${rows.map((r) => `${r.label} ${r.kind === 'mh' ? 'Mantel-Haenszel ' : ''}${r.text}`).join('; ')}.`;
  const crude = rows.filter((r) => r.kind === 'crude');
  const mh = rows.filter((r) => r.kind === 'mh');
  return (
    <figure className="print:break-inside-avoid">
      <div role="img" aria-label={description} style={{ width: '100%', height: 60 + outcomes.length * 44 }}>
        <ResponsiveContainer width="100%" height="100%">
          <ScatterChart margin={{ top: 8, right: 24, bottom: 24, left: 8 }}>
            <CartesianGrid stroke="#e6e1d6" />
            <XAxis type="number" dataKey="est" scale="log" domain={[lo, hi]} allowDataOverflow tick={{ fontSize: 11, fill: '#1f2a2e' }} tickFormatter={(v: number) => v.toFixed(v < 1 ? 2 : 1)}
              label={{ value: 'risk ratio A / B (log scale; < 1 favours A)', position: 'insideBottom', offset: -12, fontSize: 11, fill: '#1f2a2e' }} />
            <YAxis type="number" dataKey="y" domain={[-1, outcomes.length * 2 - 0.5]} reversed ticks={[...labels.keys()]} tickFormatter={(v: number) => labels.get(v) ?? ''} width={170} tick={{ fontSize: 11, fill: '#1f2a2e' }} />
            <ReferenceLine x={1} stroke={OKABE_ITO.black} strokeDasharray="3 3" />
            <Tooltip formatter={(_v: unknown, _n: unknown, item: { payload?: Row }) => [item.payload?.text ?? '', item.payload?.kind === 'mh' ? 'Mantel–Haenszel RR' : 'Risk ratio']} />
            <Scatter data={crude} fill={OKABE_ITO.blue} name="Risk ratio" isAnimationActive={false} shape="circle">
              <ErrorBar dataKey="err" direction="x" width={5} stroke={OKABE_ITO.blue} strokeWidth={1.5} />
            </Scatter>
            <Scatter data={mh} fill={OKABE_ITO.orange} name="Mantel–Haenszel RR" isAnimationActive={false} shape="diamond">
              <ErrorBar dataKey="err" direction="x" width={5} stroke={OKABE_ITO.orange} strokeWidth={1.5} />
            </Scatter>
          </ScatterChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-muted"><span style={{ color: OKABE_ITO.blue }}>●</span> crude risk ratio, <span style={{ color: OKABE_ITO.orange }}>◆</span> Mantel–Haenszel risk ratio across ARISCAT classes; lines: {levelLabel(level)} confidence intervals; dashed line: no difference.</figcaption>
    </figure>
  );
}
