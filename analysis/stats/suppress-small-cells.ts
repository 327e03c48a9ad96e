import { z } from 'zod';
import { AnalysisInputError } from '../errors.js';
import * as check from './validate.js';

const countArray = z.array(z.number().int().nonnegative());

/**
 * A one- or two-way table of counts with optional margins. A one-way table is a single row
 * (`rows: [[a, b, c]]`, its total in `rowTotals: [t]` and/or `grandTotal`) or a single column.
 * Margins, when given, must equal the sums of the cells.
 */
export const countTableSchema = z.object({
  rows: z.array(countArray).min(1),
  rowTotals: countArray.optional(),
  colTotals: countArray.optional(),
  grandTotal: z.number().int().nonnegative().optional(),
});
export type CountTable = z.infer<typeof countTableSchema>;

const nullableCountArray = z.array(z.number().int().nonnegative().nullable());

/** Where a hidden value was and why: `small` (a count from 1 to min - 1) or `complementary` (hidden so that a small count cannot be worked out). */
export const suppressionSchema = z.object({
  at: z.enum(['cell', 'rowTotal', 'colTotal', 'grandTotal']),
  row: z.number().int().nullable(),
  col: z.number().int().nullable(),
  reason: z.enum(['small', 'complementary']),
});
export type Suppression = z.infer<typeof suppressionSchema>;

/** The same table with null for every hidden value, and the list of what was hidden and why. */
export const suppressedTableSchema = z.object({
  rows: z.array(nullableCountArray),
  rowTotals: nullableCountArray.optional(),
  colTotals: nullableCountArray.optional(),
  grandTotal: z.number().int().nonnegative().nullable().optional(),
  suppressed: z.array(suppressionSchema),
});
export type SuppressedTable = z.infer<typeof suppressedTableSchema>;

type Entry = { at: Suppression['at']; row: number | null; col: number | null; value: number };
type Line = { parts: number[]; total: number };

/**
 * Cell-size suppression of an aggregate table before a researcher sees it.
 *
 * Definition: no count from 1 to `min - 1` (1 to 10 by default) may be shown, in a cell or a margin,
 * nor be derivable from what is shown (CMS cell-size suppression policy: Centers for Medicare &
 * Medicaid Services, data use agreement, minimum cell size 11). Zeros are shown.
 * Method: (1) primary suppression of every small count; (2) complementary suppression: in every
 * line (a row with its total, a column with its total, the row totals or column totals with the
 * grand total) a single hidden entry could be recovered by subtraction, so one more entry of that
 * line is hidden: the smallest non-zero one, cells before totals (a hidden zero would tell that the
 * hidden pair is small); repeated until no line has exactly one hidden entry; (3) a check that no
 * small count is fixed by the whole system of margin equations (a hidden entry is recoverable when
 * it is the same in every solution; found by row reduction), hiding one more entry and repeating
 * when one is. Bounds an attacker could still infer (e.g. x <= a shown total) are not hidden.
 * The input is not changed.
 *
 * @param table rows of whole-number counts, all rows the same length, with optional rowTotals,
 *   colTotals and grandTotal that must equal the sums
 * @param options.min smallest count that may be shown, whole number >= 1, default 11
 * @throws AnalysisInputError for an empty or ragged table, a count that is not a whole number >= 0,
 *   margins of the wrong length or that do not add up, or a min below 1
 * @example suppressSmallCells({ rows: [[5, 20, 30]], rowTotals: [55] })
 *   // { rows: [[null, null, 30]], rowTotals: [55], suppressed: [small cell (0,0), complementary cell (0,1)] }
 */
export function suppressSmallCells(table: CountTable, options?: { readonly min?: number }): SuppressedTable {
  const fn = 'suppressSmallCells';
  const opts = check.options(fn, options);
  const min = opts.min === undefined ? 11 : check.positiveCount(fn, 'options.min', opts.min);
  const t = check.object(fn, 'table', table);
  const rows = check.nonEmptyArray<unknown>(fn, 'table.rows', t.rows).map((row, i) =>
    check.nonEmptyArray<unknown>(fn, `table.rows[${i}]`, row).map((v, j) => check.count(fn, `table.rows[${i}][${j}]`, v)),
  );
  const nCols = rows[0].length;
  rows.forEach((row, i) => {
    if (row.length !== nCols) {
      throw new AnalysisInputError(fn, `table.rows[${i}]`, `has ${row.length} cells but rows[0] has ${nCols}: every row needs the same columns`);
    }
  });
  const rowSums = rows.map((row) => row.reduce((s, v) => s + v, 0));
  const colSums = rows[0].map((_, j) => rows.reduce((s, row) => s + row[j], 0));
  const grandSum = rowSums.reduce((s, v) => s + v, 0);
  const margin = (name: 'rowTotals' | 'colTotals', sums: number[]): number[] | undefined => {
    if (t[name] === undefined) return undefined;
    const list = check.nonEmptyArray<unknown>(fn, `table.${name}`, t[name]);
    if (list.length !== sums.length) {
      throw new AnalysisInputError(fn, `table.${name}`, `must have ${sums.length} totals, one per ${name === 'rowTotals' ? 'row' : 'column'} (got ${list.length})`);
    }
    return list.map((v, i) => {
      const total = check.count(fn, `table.${name}[${i}]`, v);
      if (total !== sums[i]) {
        throw new AnalysisInputError(fn, `table.${name}[${i}]`, `(${total}) is not the sum of its cells (${sums[i]}): fix the table or leave the margin out`);
      }
      return total;
    });
  };
  const rowTotals = margin('rowTotals', rowSums);
  const colTotals = margin('colTotals', colSums);
  let grandTotal: number | undefined;
  if (t.grandTotal !== undefined) {
    grandTotal = check.count(fn, 'table.grandTotal', t.grandTotal);
    if (grandTotal !== grandSum) {
      throw new AnalysisInputError(fn, 'table.grandTotal', `(${grandTotal}) is not the sum of all cells (${grandSum}): fix the table or leave it out`);
    }
  }

  // Every shown number is an entry; every margin gives a line: sum(parts) = total.
  const entries: Entry[] = [];
  const cellId = rows.map((row, i) => row.map((value, j) => entries.push({ at: 'cell', row: i, col: j, value }) - 1));
  const rowTotalId = rowTotals?.map((value, i) => entries.push({ at: 'rowTotal', row: i, col: null, value }) - 1);
  const colTotalId = colTotals?.map((value, j) => entries.push({ at: 'colTotal', row: null, col: j, value }) - 1);
  const grandId = grandTotal === undefined ? undefined : entries.push({ at: 'grandTotal', row: null, col: null, value: grandTotal }) - 1;
  const lines: Line[] = [];
  rowTotalId?.forEach((total, i) => lines.push({ parts: cellId[i], total }));
  colTotalId?.forEach((total, j) => lines.push({ parts: cellId.map((r) => r[j]), total }));
  if (grandId !== undefined) {
    if (rowTotalId) lines.push({ parts: rowTotalId, total: grandId });
    if (colTotalId) lines.push({ parts: colTotalId, total: grandId });
    if (!rowTotalId && !colTotalId) lines.push({ parts: cellId.flat(), total: grandId });
  }

  const reason: (Suppression['reason'] | null)[] = entries.map((e) => (e.value >= 1 && e.value < min ? 'small' : null));
  const hidden = (id: number) => reason[id] !== null;
  // Preference for a complementary entry: non-zero first, cells before totals, then the smallest.
  const rank = (id: number) => [entries[id].value === 0 ? 1 : 0, entries[id].at === 'cell' ? 0 : 1, entries[id].value, id];
  const better = (x: number, y: number) => {
    const a = rank(x);
    const b = rank(y);
    for (let k = 0; k < a.length; k += 1) if (a[k] !== b[k]) return a[k] < b[k];
    return false;
  };
  const pick = (candidates: number[]): number | null =>
    candidates.filter((id) => !hidden(id)).reduce<number | null>((best, id) => (best === null || better(id, best) ? id : best), null);

  for (;;) {
    let changed = true;
    while (changed) {
      changed = false;
      for (const line of lines) {
        const members = [...line.parts, line.total];
        if (members.filter(hidden).length !== 1) continue;
        const id = pick(members);
        if (id !== null) {
          reason[id] = 'complementary';
          changed = true;
        }
      }
    }
    const exposed = recoverable(entries.length, lines, hidden).find((id) => reason[id] === 'small');
    if (exposed === undefined) break;
    const nearby = lines.filter((l) => l.total === exposed || l.parts.includes(exposed)).flatMap((l) => [...l.parts, l.total]);
    const id = pick(nearby) ?? pick(entries.map((_, i) => i));
    if (id === null) break; // cannot happen: with everything hidden no small count is fixed
    reason[id] = 'complementary';
  }

  const show = (id: number) => (hidden(id) ? null : entries[id].value);
  const out: SuppressedTable = {
    rows: cellId.map((r) => r.map(show)),
    suppressed: entries.flatMap((e, id) => {
      const why = reason[id];
      return why === null ? [] : [{ at: e.at, row: e.row, col: e.col, reason: why }];
    }),
  };
  if (rowTotalId) out.rowTotals = rowTotalId.map(show);
  if (colTotalId) out.colTotals = colTotalId.map(show);
  if (grandId !== undefined) out.grandTotal = show(grandId);
  return out;
}

/**
 * Hidden entries whose value is the same in every solution of the margin equations given the
 * shown values: variable j is fixed iff it is a pivot of the reduced row echelon form whose row
 * has no coefficient on a free variable.
 */
function recoverable(size: number, lines: readonly Line[], hidden: (id: number) => boolean): number[] {
  const unknowns = [...Array(size).keys()].filter(hidden);
  const col = new Map(unknowns.map((id, k) => [id, k]));
  const m = unknowns.length;
  const matrix: number[][] = [];
  for (const line of lines) {
    const row = new Array<number>(m).fill(0);
    let any = false;
    for (const p of line.parts) {
      const k = col.get(p);
      if (k !== undefined) {
        row[k] += 1;
        any = true;
      }
    }
    const k = col.get(line.total);
    if (k !== undefined) {
      row[k] -= 1;
      any = true;
    }
    if (any) matrix.push(row);
  }
  const eps = 1e-9;
  const pivotOfRow: number[] = [];
  let r = 0;
  for (let c = 0; c < m && r < matrix.length; c += 1) {
    let best = r;
    for (let i = r + 1; i < matrix.length; i += 1) if (Math.abs(matrix[i][c]) > Math.abs(matrix[best][c])) best = i;
    if (Math.abs(matrix[best][c]) < eps) continue;
    [matrix[r], matrix[best]] = [matrix[best], matrix[r]];
    const pivot = matrix[r][c];
    for (let k = 0; k < m; k += 1) matrix[r][k] /= pivot;
    for (let i = 0; i < matrix.length; i += 1) {
      if (i === r || Math.abs(matrix[i][c]) < eps) continue;
      const f = matrix[i][c];
      for (let k = 0; k < m; k += 1) matrix[i][k] -= f * matrix[r][k];
    }
    pivotOfRow.push(c);
    r += 1;
  }
  const isPivot = new Set(pivotOfRow);
  const fixed: number[] = [];
  pivotOfRow.forEach((c, i) => {
    const onFree = matrix[i].some((v, k) => !isPivot.has(k) && Math.abs(v) > eps);
    if (!onFree) fixed.push(unknowns[c]);
  });
  return fixed;
}
