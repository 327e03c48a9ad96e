/**
 * Aggregate exports: a one- or two-way table of case counts with margins, with every count
 * from 1 to 10 suppressed and complementary suppression (analysis/'s suppressSmallCells, the
 * CMS cell-size suppression policy), so no hidden count can be recovered from the totals.
 */
import type { DataSource } from 'typeorm';
import { suppressSmallCells, type SuppressedTable } from '../../analysis/index.js';
import type { CohortFilter } from '../../shared/analysis/cohort-filter.js';
import { PPC_EVENT_TYPES } from '../../shared/clinical/codes.js';
import type { ExportVariable } from '../../shared/exports/variables.js';
import { cohortFrom, SqlParams } from './cohort.js';
import { variableSql } from './query.js';
import { rowTransformer, type Cell, type TransformContext } from './transform.js';

export const SUPPRESSED = 'suppressed';
export const MISSING = '(missing)';

export interface AggregateTable {
  rowLabels: string[];
  colLabels: string[] | null;
  counts: number[][];
  suppressed: SuppressedTable;
  total: number;
}

/** Counts the cohort by one or two variables (labels after de-identification) and suppresses small cells. */
export async function buildAggregate(ds: DataSource, cohort: CohortFilter, rowsBy: ExportVariable, colsBy: ExportVariable | null, t: TransformContext): Promise<AggregateTable> {
  const p = new SqlParams();
  const { from, where } = cohortFrom(cohort, p);
  const vars = colsBy ? [rowsBy, colsBy] : [rowsBy];
  // Outcome summaries need the per-case join; they are only offered as yes/no by AGGREGATE_DIMENSIONS.
  const needsOutcomes = vars.some((v) => v.source.kind === 'ppc');
  const join = needsOutcomes
    ? `LEFT JOIN (SELECT e.case_id, ${PPC_EVENT_TYPES.map((type, i) => `bool_or(e.type = ${p.add(type)}::text) AS p${i}`).join(', ')} FROM outcome_events e WHERE e.removed_at IS NULL GROUP BY e.case_id) o ON o.case_id = c.id`
    : '';
  const cols = vars.map((v, i) => `${variableSql(v)} AS v${i}`);
  const rows: Record<string, unknown>[] = await ds.query(`SELECT ${cols.join(', ')}, count(*)::int AS n FROM ${from} ${join} WHERE ${where.join(' AND ')} GROUP BY ${vars.map((_, i) => i + 1).join(', ')}`, p.values);
  const label = rowTransformer(vars, { ...t, nextStudyId: () => '' });
  const cells = new Map<string, number>();
  const rk = new Set<string>();
  const ck = new Set<string>();
  const str = (c: Cell) => (c === null ? MISSING : String(c));
  for (const r of rows) {
    const [, a, b] = label(vars.map((_, i) => r[`v${i}`]));
    const key = `${str(a)}\u0000${colsBy ? str(b) : ''}`;
    cells.set(key, (cells.get(key) ?? 0) + Number(r.n));
    rk.add(str(a));
    if (colsBy) ck.add(str(b));
  }
  const sort = (s: Set<string>) => [...s].sort((x, y) => (x === MISSING ? 1 : y === MISSING ? -1 : x.localeCompare(y, 'en', { numeric: true })));
  const rowLabels = sort(rk);
  const colLabels = colsBy ? sort(ck) : null;
  const counts = rowLabels.map((a) => (colLabels ?? ['']).map((b) => cells.get(`${a}\u0000${b}`) ?? 0));
  const total = counts.flat().reduce((s, v) => s + v, 0);
  if (!rowLabels.length) return { rowLabels, colLabels, counts, suppressed: { rows: [], suppressed: [] }, total };
  const suppressed = colLabels
    ? suppressSmallCells({ rows: counts, rowTotals: counts.map((r) => r.reduce((s, v) => s + v, 0)), colTotals: colLabels.map((_, j) => counts.reduce((s, r) => s + r[j], 0)), grandTotal: total })
    : suppressSmallCells({ rows: counts, colTotals: [total] });
  return { rowLabels, colLabels, counts, suppressed, total };
}

/** The table as spreadsheet rows: header, one row per category with its total, and a total row. */
export function aggregateRows(table: AggregateTable, rowsBy: ExportVariable, colsBy: ExportVariable | null): { header: string[]; rows: Cell[][] } {
  const show = (v: number | null | undefined): Cell => (v === null || v === undefined ? SUPPRESSED : v);
  const s = table.suppressed;
  if (!colsBy || !table.colLabels) {
    return {
      header: [rowsBy.name, 'cases'],
      rows: [...table.rowLabels.map((l, i) => [l, show(s.rows[i]?.[0])]), ['Total', show(s.colTotals?.[0])]],
    };
  }
  return {
    header: [`${rowsBy.name} \\ ${colsBy.name}`, ...table.colLabels, 'Total'],
    rows: [
      ...table.rowLabels.map((l, i) => [l, ...table.colLabels!.map((_, j) => show(s.rows[i]?.[j])), show(s.rowTotals?.[i])]),
      ['Total', ...table.colLabels.map((_, j) => show(s.colTotals?.[j])), show(s.grandTotal)],
    ],
  };
}
