import type { ChartResponse } from '../../../../shared/committee/chart.js';
import { numeratorLabel, periodLabel, withUnit } from './format.js';

/** The chart's numbers as a table (the accessible form of the chart, and what the packet sheet holds). */
export function ChartTable({ chart, caption }: { chart: ChartResponse; caption?: string }) {
  const [num, den] = numeratorLabel(chart);
  const numbers = new Map(chart.signals.map((s) => [s.id, `${s.chart === 'run' ? 'R' : 'C'}${chart.signals.filter((x) => x.chart === s.chart).indexOf(s) + 1}`]));
  return (
    <div className="max-h-[520px] overflow-auto rounded border border-line" tabIndex={0} role="region" aria-label={`Data table: ${chart.measure.short}, ${chart.scope.label}`}>
      <table className="w-full text-xs">
        <caption className="sr-only">{caption ?? `Monthly values of ${chart.measure.label}, ${chart.scope.label}`}</caption>
        <thead className="sticky top-0 bg-panel">
          <tr className="text-left">
            <th scope="col" className="p-1.5">Period</th><th scope="col" className="p-1.5 text-right">{num}</th><th scope="col" className="p-1.5 text-right">{den}</th>
            <th scope="col" className="p-1.5 text-right">Value</th><th scope="col" className="p-1.5 text-right">Limits</th><th scope="col" className="p-1.5">Signals</th>
          </tr>
        </thead>
        <tbody>
          {[...chart.points].reverse().map((p) => (
            <tr key={p.period} className="border-t border-line">
              <th scope="row" className="p-1.5 text-left font-normal">{periodLabel(p.period)}{p.provisional && <span className="ml-1 text-ochre">(provisional)</span>}</th>
              <td className="p-1.5 text-right">{chart.measure.kind === 'individuals' && chart.measure.key !== 'median-length-of-stay' ? p.numerator.toFixed(2) : p.numerator}</td>
              <td className="p-1.5 text-right">{p.denominator}{p.smallCount && <span className="ml-1 text-ochre">small</span>}</td>
              <td className="p-1.5 text-right">{withUnit(p.value, chart.measure.unit)}</td>
              <td className="p-1.5 text-right">{p.lower === null ? '—' : `${p.lower.toFixed(1)}–${p.upper?.toFixed(1)}`}{p.outside && <span className="ml-1 font-semibold">▲ outside</span>}</td>
              <td className="p-1.5">{p.signals.map((s) => numbers.get(s)).join(' ')}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
