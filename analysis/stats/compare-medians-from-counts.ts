import { AnalysisInputError } from '../errors.js';
import { mannWhitneyFromTable, mergeTables, type MedianComparison } from './mann-whitney.js';
import type { Frequency } from './types.js';
import * as check from './validate.js';

/**
 * compareMedians from frequency tables, e.g. the rows of `SELECT los_days, count(*) ... GROUP BY
 * los_days`, so that no case rows reach Node. Gives the same medians, U and p as compareMedians on
 * the expanded samples (the same value may appear in several rows; their counts add up; rows with
 * count 0 are ignored).
 *
 * Definition and method: Mann-Whitney U of sample A with mid-ranks, two-sided p from the normal
 * approximation with tie and continuity corrections, as R's wilcox.test(exact = FALSE,
 * correct = TRUE) (Mann HB, Whitney DR, Ann Math Stat 1947;18:50-60).
 *
 * @param a frequency table of sample A: { value (finite), count (whole number >= 0) }, total >= 1
 * @param b frequency table of sample B, same form
 * @throws AnalysisInputError for an empty table, a table whose counts add up to 0, a value that is
 *   not finite or a count that is not a whole number >= 0
 * @example compareMediansFromCounts([{ value: 1, count: 2 }], [{ value: 2, count: 2 }])
  *   // { medianA: 1, medianB: 2, u: 0, p: 0.193931 }
 */
export function compareMediansFromCounts(
  a: readonly Readonly<Frequency>[],
  b: readonly Readonly<Frequency>[],
): MedianComparison {
  const fn = 'compareMediansFromCounts';
  const tables = [a, b].map((table, s) => {
    const name = s === 0 ? 'a' : 'b';
    const rows = check.nonEmptyArray<unknown>(fn, name, table);
    const counts = new Map<number, number>();
    let total = 0;
    rows.forEach((row, i) => {
      const r = check.object(fn, `${name}[${i}]`, row);
      const value = check.finiteNumber(fn, `${name}[${i}].value`, r.value);
      const c = check.count(fn, `${name}[${i}].count`, r.count);
      if (c > 0) counts.set(value, (counts.get(value) ?? 0) + c);
      total += c;
    });
    if (total === 0) throw new AnalysisInputError(fn, name, 'has counts that add up to 0: at least one case is needed');
    return counts;
  });
  const { values, countA, countB } = mergeTables(tables[0], tables[1]);
  return mannWhitneyFromTable(values, countA, countB);
}
