import type { ChartResponse } from '../../../../shared/committee/chart.js';
import { periodLabel } from './format.js';

/** Every signal of one chart, numbered as on the chart, in words. */
export function SignalList({ chart, mode }: { chart: ChartResponse; mode: 'run' | 'control' }) {
  const list = chart.signals.filter((s) => s.chart === mode);
  if (!list.length) return <p className="text-sm text-muted">No signal on the {mode === 'run' ? 'run chart' : chart.measure.chart}: the variation looks random (common cause).</p>;
  return (
    <ol className="flex flex-col gap-2 text-sm">
      {list.map((s, i) => (
        <li key={s.id} className="rounded border border-line bg-surface p-2">
          <p className="font-semibold">
            <span className="mr-1 inline-block rounded bg-ink px-1.5 text-xs text-white">{i + 1}</span>
            {s.label} · {periodLabel(s.startPeriod)}{s.endPeriod !== s.startPeriod ? ` to ${periodLabel(s.endPeriod)}` : ''}
            {s.favourable !== null && <span className={`ml-2 rounded px-1.5 text-xs ${s.favourable ? 'bg-ok-soft text-ok' : 'bg-danger-soft text-danger'}`}>{s.favourable ? 'better direction' : 'worse direction'}</span>}
            {s.provisional && <span className="ml-2 rounded bg-warn-soft px-1.5 text-xs text-ochre">includes provisional months</span>}
          </p>
          <p className="text-muted">{s.explanation}</p>
        </li>
      ))}
    </ol>
  );
}
