import { CartesianGrid, ComposedChart, Line, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { ChartResponse } from '../../../../shared/committee/chart.js';
import { OKABE_ITO, periodLabel, withUnit } from './format.js';

type Point = ChartResponse['points'][number];

/**
 * A run chart (values and the baseline median) or the matching control chart (values, centre
 * line, per-month 3-sigma limits). Signal points are diamonds with their number, points beyond a
 * limit get a triangle, provisional months are hollow: shape and words, never colour alone.
 */
export function SpcChart({ chart, mode, height = 300 }: { chart: ChartResponse; mode: 'run' | 'control'; height?: number }) {
  const numbers = new Map(chart.signals.filter((s) => s.chart === mode).map((s, i) => [s.id, i + 1]));
  const starts = new Map(chart.signals.filter((s) => s.chart === mode).map((s) => [s.id, s.startPeriod]));
  const data = chart.points.map((p) => ({
    ...p, label: periodLabel(p.period),
    sig: p.signals.filter((s) => numbers.has(s)).map((s) => numbers.get(s)!),
    // The number is written once, at the first point of its signal.
    firstOf: p.signals.filter((s) => starts.get(s) === p.period).map((s) => numbers.get(s)!),
  }));
  const unit = chart.measure.unit;
  const Dot = (props: { cx?: number; cy?: number; payload?: Point & { sig: number[]; firstOf: number[] }; index?: number }) => {
    const { cx, cy, payload, index } = props;
    if (cx === undefined || cy === undefined || !payload || payload.value === null) return <g key={`d${index}`} />;
    const fill = payload.provisional ? '#ffffff' : OKABE_ITO.blue;
    return (
      <g key={`d${index}`}>
        {payload.sig.length ? (
          <>
            <path d={`M${cx},${cy - 7} L${cx + 7},${cy} L${cx},${cy + 7} L${cx - 7},${cy} Z`} fill={payload.provisional ? '#ffffff' : OKABE_ITO.vermillion} stroke={OKABE_ITO.vermillion} strokeWidth={2} />
            {payload.firstOf.length > 0 && <text x={cx} y={cy - 10} textAnchor="middle" fontSize={11} fontWeight={600} fill="#1f2a2e">{payload.firstOf.join(',')}</text>}
          </>
        ) : (
          <circle cx={cx} cy={cy} r={3.5} fill={fill} stroke={OKABE_ITO.blue} strokeWidth={2} />
        )}
        {mode === 'control' && payload.outside && <path d={`M${cx},${cy + 9} l5,9 l-10,0 Z`} fill={OKABE_ITO.black} />}
      </g>
    );
  };
  const phaseStarts = chart.phases.slice(1).map((p) => periodLabel(p.startPeriod));
  const description = mode === 'run'
    ? `Run chart of ${chart.measure.label}, ${chart.scope.label}: ${chart.points.length} points around the baseline median; ${numbers.size} signal(s), listed below.`
    : `${chart.measure.chart} of ${chart.measure.label}, ${chart.scope.label}: centre line and 3-sigma limits for each month's size; ${numbers.size} signal(s), listed below.`;
  return (
    <figure>
      <div role="img" aria-label={description} style={{ width: '100%', height }}>
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={data} margin={{ top: 16, right: 16, bottom: 8, left: 8 }}>
            <CartesianGrid stroke="#e6e1d6" vertical={false} />
            <XAxis dataKey="label" tick={{ fontSize: 11, fill: '#1f2a2e' }} interval="preserveStartEnd" minTickGap={24} />
            <YAxis tick={{ fontSize: 11, fill: '#1f2a2e' }} width={56} label={{ value: unit, angle: -90, position: 'insideLeft', fontSize: 11, fill: '#1f2a2e' }} domain={chart.measure.kind === 'individuals' ? ['auto', 'auto'] : [0, 'auto']} />
            <Tooltip formatter={(v: unknown, name: unknown) => [withUnit(typeof v === 'number' ? v : null, unit), String(name)]} />
            {chart.annotations.map((a) => (
              <ReferenceLine key={a.id} x={periodLabel(chart.view === 'quarterly' ? `${a.month.slice(0, 4)}-Q${Math.floor((Number(a.month.slice(5)) - 1) / 3) + 1}` : a.month)} stroke={OKABE_ITO.pink} strokeDasharray="2 3" label={{ value: `✎ ${a.siteCode && chart.scope.site === 'network' ? `${a.siteCode}: ` : ''}${a.text}`, position: 'insideTopLeft', fontSize: 10, fill: '#7a3a63' }} />
            ))}
            {phaseStarts.map((x) => <ReferenceLine key={x} x={x} stroke={OKABE_ITO.black} strokeWidth={2} label={{ value: 'new phase', position: 'insideBottomRight', fontSize: 10 }} />)}
            {mode === 'control' && <Line type="step" dataKey="upper" name="Upper limit (3 sigma)" stroke={OKABE_ITO.vermillion} strokeDasharray="6 3" dot={false} isAnimationActive={false} />}
            {mode === 'control' && <Line type="step" dataKey="lower" name="Lower limit (3 sigma)" stroke={OKABE_ITO.vermillion} strokeDasharray="6 3" dot={false} isAnimationActive={false} />}
            {mode === 'control' && <Line type="step" dataKey="centre" name="Centre line" stroke={OKABE_ITO.green} dot={false} isAnimationActive={false} />}
            {mode === 'run' && <Line type="step" dataKey="median" name="Baseline median" stroke={OKABE_ITO.orange} strokeDasharray="2 2" strokeWidth={2} dot={false} isAnimationActive={false} />}
            <Line type="linear" dataKey="value" name={chart.measure.short} stroke={OKABE_ITO.blue} strokeWidth={2} dot={Dot} activeDot={false} isAnimationActive={false} connectNulls={false} />
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="mt-1 flex flex-wrap gap-x-4 gap-y-1 text-xs text-muted">
        <span><span aria-hidden="true" style={{ color: OKABE_ITO.blue }}>●</span> value (hollow = provisional, month not closed)</span>
        {mode === 'run' ? <span><span aria-hidden="true" style={{ color: OKABE_ITO.orange }}>┄</span> baseline median</span> : <>
          <span><span aria-hidden="true" style={{ color: OKABE_ITO.green }}>━</span> centre line</span>
          <span><span aria-hidden="true" style={{ color: OKABE_ITO.vermillion }}>╌</span> 3-sigma limits</span>
          <span><span aria-hidden="true">▲</span> beyond a limit</span></>}
        <span><span aria-hidden="true" style={{ color: OKABE_ITO.vermillion }}>◆</span> numbered signal (see the list)</span>
        <span><span aria-hidden="true" style={{ color: OKABE_ITO.pink }}>┆</span> note</span>
      </figcaption>
    </figure>
  );
}
