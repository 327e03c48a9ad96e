import type { ImportCounts } from '../../../../shared/imports/api.js';
import { SHEET_NAMES, type RecordKind } from '../../../../shared/imports/fields.js';

const COLS = ['rows', 'new', 'updated', 'unchanged', 'rejected'] as const;

/** Dry-run counts per record kind: new, updated, unchanged, rejected. */
export function CountsTable({ counts }: { counts: ImportCounts }) {
  const kinds = Object.keys(counts.byKind) as RecordKind[];
  return (
    <table className="w-full text-sm tabular-nums">
      <caption className="sr-only">Rows by record kind and what the import does with them</caption>
      <thead><tr className="border-b border-line text-left">{['Sheet', ...COLS].map((c) => <th key={c} scope="col" className="px-2 py-1 capitalize">{c}</th>)}</tr></thead>
      <tbody>
        {kinds.map((k) => (
          <tr key={k} className="border-b border-line">
            <th scope="row" className="px-2 py-1 text-left font-normal">{SHEET_NAMES[k]}</th>
            {COLS.map((c) => <td key={c} className={`px-2 py-1 ${c === 'rejected' && counts.byKind[k]![c] ? 'font-semibold text-danger' : ''}`}>{counts.byKind[k]![c].toLocaleString()}</td>)}
          </tr>
        ))}
        <tr className="font-semibold"><th scope="row" className="px-2 py-1 text-left">All</th>{COLS.map((c) => <td key={c} className="px-2 py-1">{counts[c].toLocaleString()}</td>)}</tr>
      </tbody>
    </table>
  );
}
