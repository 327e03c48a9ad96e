import { mannWhitneyFromTable, mergeTables, type MedianComparison } from './mann-whitney.js';
import * as check from './validate.js';

export type { MedianComparison } from './mann-whitney.js';

/**
 * Compares two samples of a continuous or ordinal measure (e.g. lengths of stay in days).
 *
 * Definition: the medians of A and B; U = the Mann-Whitney statistic of sample A, the number of
 * pairs (a, b) with a > b, ties counting 1/2 (= rank sum of A - nA(nA + 1)/2, mid-ranks).
 * Method: two-sided p from the normal approximation with the tie correction of the variance and
 * a continuity correction of 1/2, as R's wilcox.test(a, b, exact = FALSE, correct = TRUE)
 * (Mann HB, Whitney DR, Ann Math Stat 1947;18:50-60; Hollander M, Wolfe DA, Nonparametric
 * Statistical Methods, 2nd ed. 1999, sec. 4.1). When every value is tied, p = 1 (U can take no
 * other value). The same answer from frequency tables: compareMediansFromCounts.
 *
 * @param a sample A, finite numbers, at least one
 * @param b sample B, finite numbers, at least one
 * @throws AnalysisInputError for an empty sample or a value that is not a finite number
 * @example compareMedians([1, 2, 3], [4, 5, 6]) // { medianA: 2, medianB: 5, u: 0, p: 0.080856 } (R: wilcox.test(1:3, 4:6, exact = FALSE))
 */
export function compareMedians(a: readonly number[], b: readonly number[]): MedianComparison {
  const fn = 'compareMedians';
  const tables = [a, b].map((sample, s) => {
    const name = s === 0 ? 'a' : 'b';
    const list = check.nonEmptyArray<number>(fn, name, sample);
    const counts = new Map<number, number>();
    list.forEach((v, i) => {
      const value = check.finiteNumber(fn, `${name}[${i}]`, v);
      counts.set(value, (counts.get(value) ?? 0) + 1);
    });
    return counts;
  });
  const { values, countA, countB } = mergeTables(tables[0], tables[1]);
  return mannWhitneyFromTable(values, countA, countB);
}
