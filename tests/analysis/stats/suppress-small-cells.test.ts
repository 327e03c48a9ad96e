import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, suppressSmallCells, suppressedTableSchema, type CountTable, type SuppressedTable } from '../../../analysis/index.js';

// CMS cell-size suppression policy: no count from 1 to 10 may be shown, nor be derivable from the
// other cells and the margins (Centers for Medicare & Medicaid Services, minimum cell size of 11).

/** All shown numbers of a result, cells and margins. */
function shown(t: SuppressedTable): (number | null)[] {
  return [...t.rows.flat(), ...(t.rowTotals ?? []), ...(t.colTotals ?? []), ...(t.grandTotal === undefined ? [] : [t.grandTotal])];
}

/**
 * Brute force, written independently of the module: enumerates every table of non-negative whole
 * numbers that matches everything shown (cells and margins) and records, for each hidden cell, the set
 * of values it takes. A hidden value is recoverable when that set has one element.
 */
function possibleValues(out: SuppressedTable, bound: number): Map<string, Set<number>> {
  // keys: "i,j" for a hidden cell, "row i" / "col j" for a hidden margin
  const hidden: [number, number][] = [];
  out.rows.forEach((row, i) => row.forEach((v, j) => v === null && hidden.push([i, j])));
  const cells = out.rows.map((r) => r.map((v) => v ?? 0));
  const seen = new Map<string, Set<number>>(hidden.map(([i, j]) => [`${i},${j}`, new Set<number>()]));
  const hiddenMargins = {
    rows: (out.rowTotals ?? []).map((v) => v === null),
    cols: (out.colTotals ?? []).map((v) => v === null),
  };
  const rowSum = (i: number) => cells[i].reduce((s, v) => s + v, 0);
  const colSum = (j: number) => cells.reduce((s, r) => s + r[j], 0);
  const consistent = (): boolean => {
    const rs = cells.map((_, i) => rowSum(i));
    const cs = cells[0].map((_, j) => colSum(j));
    const g = rs.reduce((s, v) => s + v, 0);
    if (out.rowTotals && out.rowTotals.some((v, i) => v !== null && v !== rs[i])) return false;
    if (out.colTotals && out.colTotals.some((v, j) => v !== null && v !== cs[j])) return false;
    if (out.grandTotal !== undefined && out.grandTotal !== null && out.grandTotal !== g) return false;
    return true;
  };
  const walk = (k: number) => {
    if (k === hidden.length) {
      if (consistent()) {
        for (const [i, j] of hidden) seen.get(`${i},${j}`)!.add(cells[i][j]);
        const note = (key: string, v: number) => (seen.get(key) ?? seen.set(key, new Set()).get(key)!).add(v);
        out.rowTotals?.forEach((v, i) => v === null && note(`row ${i}`, rowSum(i)));
        out.colTotals?.forEach((v, j) => v === null && note(`col ${j}`, colSum(j)));
      }
      return;
    }
    const [i, j] = hidden[k];
    for (let v = 0; v <= bound; v += 1) {
      cells[i][j] = v;
      // prune: a shown row or column total may not be exceeded
      if (out.rowTotals && out.rowTotals[i] !== null && !hiddenMargins.rows[i] && rowSum(i) > (out.rowTotals[i] as number)) break;
      if (out.colTotals && out.colTotals[j] !== null && !hiddenMargins.cols[j] && colSum(j) > (out.colTotals[j] as number)) break;
      walk(k + 1);
    }
    cells[i][j] = 0;
  };
  walk(0);
  return seen;
}

/** Small tables with all margins; cells drawn so that small counts are common. */
const tableArb = fc
  .tuple(fc.integer({ min: 1, max: 2 }), fc.integer({ min: 2, max: 3 }))
  .chain(([r, c]) => fc.array(fc.array(fc.oneof(fc.constant(0), fc.integer({ min: 1, max: 4 }), fc.integer({ min: 5, max: 9 })), { minLength: c, maxLength: c }), { minLength: r, maxLength: r }))
  .map((rows): CountTable => {
    const rowTotals = rows.map((r) => r.reduce((s, v) => s + v, 0));
    const colTotals = rows[0].map((_, j) => rows.reduce((s, r) => s + r[j], 0));
    return { rows, rowTotals, colTotals, grandTotal: rowTotals.reduce((s, v) => s + v, 0) };
  });

describe('suppressSmallCells', () => {
  it('when a one-way table has one small count, then a complementary cell is hidden too (else total - shown reveals it)', () => {
    const out = suppressSmallCells({ rows: [[5, 20, 30]], rowTotals: [55] });
    expect(out.rows).toEqual([[null, null, 30]]);
    expect(out.rowTotals).toEqual([55]);
    expect(out.suppressed).toEqual([
      { at: 'cell', row: 0, col: 0, reason: 'small' },
      { at: 'cell', row: 0, col: 1, reason: 'complementary' },
    ]);
  });

  it('when a two-way table with margins has one small cell, then a rectangle of four cells is hidden', () => {
    const out = suppressSmallCells({ rows: [[5, 20, 30], [40, 50, 60]], rowTotals: [55, 150], colTotals: [45, 70, 90], grandTotal: 205 });
    expect(out.rows).toEqual([
      [null, null, 30],
      [null, null, 60],
    ]);
    expect(out.rowTotals).toEqual([55, 150]);
    expect(out.grandTotal).toBe(205);
  });

  it('when a margin itself is small, then it is hidden with what would reveal it', () => {
    const out = suppressSmallCells({ rows: [[0, 3], [20, 30]], rowTotals: [3, 50], colTotals: [20, 33], grandTotal: 53 });
    expect(out.rowTotals?.[0]).toBeNull();
    expect(shown(out).every((v) => v === null || v === 0 || v >= 11)).toBe(true);
  });

  it('when no count is small, then nothing is hidden and the shape is kept', () => {
    const table = { rows: [[0, 20], [15, 30]], colTotals: [15, 50] };
    expect(suppressSmallCells(table)).toEqual({ rows: [[0, 20], [15, 30]], colTotals: [15, 50], suppressed: [] });
  });

  it('when there are no margins, then only the small cells are hidden', () => {
    expect(suppressSmallCells({ rows: [[3, 40], [12, 0]] }).rows).toEqual([
      [null, 40],
      [12, 0],
    ]);
  });

  it('when the result is parsed with its own schema, then it is valid', () => {
    const out = suppressSmallCells({ rows: [[5, 20, 30]], rowTotals: [55] });
    expect(suppressedTableSchema.safeParse(out).success).toBe(true);
  });

  describe('properties (fast-check, with min = 5 so that brute force stays small)', () => {
    it('then no shown value is a small count, and no hidden small cell can be recovered from what is shown', () => {
      fc.assert(
        fc.property(tableArb, (table) => {
          const out = suppressSmallCells(table, { min: 5 });
          expect(shown(out).every((v) => v === null || v === 0 || v >= 5)).toBe(true);
          const values = possibleValues(out, table.grandTotal as number);
          table.rows.forEach((row, i) =>
            row.forEach((v, j) => {
              if (v >= 1 && v < 5) {
                const set = values.get(`${i},${j}`);
                expect(set, `cell ${i},${j} (${v}) must be hidden`).toBeDefined();
                expect(set!.has(v)).toBe(true);
                expect(set!.size, `cell ${i},${j} (${v}) is recoverable: ${JSON.stringify(out)}`).toBeGreaterThan(1);
              }
            }),
          );
          const margins: [string, number[] | undefined][] = [['row', table.rowTotals], ['col', table.colTotals]];
          for (const [kind, totals] of margins) {
            totals?.forEach((v, i) => {
              if (v >= 1 && v < 5) {
                const set = values.get(`${kind} ${i}`);
                expect(set, `${kind} total ${i} (${v}) must be hidden`).toBeDefined();
                expect(set!.size, `${kind} total ${i} (${v}) is recoverable: ${JSON.stringify(out)}`).toBeGreaterThan(1);
              }
            });
          }
        }),
        { numRuns: 150 },
      );
    });

    it('then the input table is not changed', () => {
      fc.assert(
        fc.property(tableArb, (table) => {
          const copy = structuredClone(table);
          suppressSmallCells(table, { min: 5 });
          expect(table).toEqual(copy);
        }),
        { numRuns: 50 },
      );
    });
  });

  it('when the input is invalid, then ragged rows, wrong margins or negative counts throw AnalysisInputError', () => {
    expect(() => suppressSmallCells({ rows: [] })).toThrow(AnalysisInputError);
    expect(() => suppressSmallCells({ rows: [[1, 2], [3]] })).toThrow(/rows\[1\]/);
    expect(() => suppressSmallCells({ rows: [[1, 2]], rowTotals: [4] })).toThrow(/rowTotals\[0\]/);
    expect(() => suppressSmallCells({ rows: [[1, 2]], colTotals: [1] })).toThrow(/colTotals/);
    expect(() => suppressSmallCells({ rows: [[1, 2]], grandTotal: 5 })).toThrow(/grandTotal/);
    expect(() => suppressSmallCells({ rows: [[1, -2]] })).toThrow(/rows\[0\]\[1\]/);
    expect(() => suppressSmallCells({ rows: [[1, 2]] }, { min: 0 })).toThrow(/min/);
  });
});
