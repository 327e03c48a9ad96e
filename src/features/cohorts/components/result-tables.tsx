import type { ColumnDef } from '@tanstack/react-table';
import type { LosSummary, MeasureResult, Stratum } from '../../../../shared/analysis/results.js';
import { fmtCount, fmtInterval } from '../format.js';
import { DataTable } from './data-table.js';

const measureColumns = (level: number): ColumnDef<MeasureResult, unknown>[] => [
  { header: 'Outcome', accessorKey: 'label' },
  { header: 'Events', cell: (c) => fmtCount(c.row.original.events) },
  { header: 'Denominator', cell: (c) => `${fmtCount(c.row.original.denominator)} ${c.row.original.kind === 'rate' ? 'patient-days' : 'cases'}` },
  { header: 'Rate', cell: (c) => { const m = c.row.original; return m.kind === 'rate' ? `${fmtInterval(m.interval, 'rate', level)} ${m.unit}` : fmtInterval(m.interval, 'proportion', level); } },
  { header: 'Notes', cell: (c) => <span className="text-xs text-warn">{c.row.original.notes.join(' ')}</span> },
];

export function MeasuresTable({ measures, level, caption }: { measures: MeasureResult[]; level: number; caption: string }) {
  return <DataTable columns={measureColumns(level)} data={measures} caption={caption} />;
}

/** One row per stratum, one column per outcome ("events/cases, rate (CI)"). */
export function StrataTable({ strata, level, caption }: { strata: Stratum[]; level: number; caption: string }) {
  const keys = strata[0]?.measures.map((m) => ({ key: m.key, label: m.label.replace(/ \(.*\)$/, '') })) ?? [];
  const columns: ColumnDef<Stratum, unknown>[] = [
    { header: 'Stratum', accessorKey: 'label' },
    { header: 'Cases', cell: (c) => fmtCount(c.row.original.cases) },
    ...keys.map((k, i): ColumnDef<Stratum, unknown> => ({
      id: k.key,
      header: k.label,
      cell: (c) => {
        const m = c.row.original.measures[i];
        return (
          <span>
            {fmtCount(m.events)}: {fmtInterval(m.interval, 'proportion', level)}
            {m.notes.length > 0 && <span className="block text-xs text-warn">{m.notes.join(' ')}</span>}
          </span>
        );
      },
    })),
  ];
  return <DataTable columns={columns} data={strata} caption={caption} />;
}

export function LosTable({ los }: { los: LosSummary }) {
  const rows = [
    { k: 'Cases with a length of stay', v: fmtCount(los.cases) },
    { k: 'Median (days)', v: los.median == null ? '—' : los.median.toFixed(1) },
    { k: 'Interquartile range (days)', v: los.q1 == null || los.q3 == null ? '—' : `${los.q1.toFixed(1)}–${los.q3.toFixed(1)}` },
  ];
  return <DataTable columns={[{ header: 'Length of stay', accessorKey: 'k' }, { header: 'Value', accessorKey: 'v' }]} data={rows} caption="Length of stay (days)" />;
}
