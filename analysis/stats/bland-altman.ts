import { mean, sampleStandardDeviation } from 'simple-statistics';
import { AnalysisInputError } from '../errors.js';
import * as check from './validate.js';

export type BlandAltmanResult = {
  /** Number of pairs. */
  n: number;
  /** Mean of the differences a - b (the bias). */
  meanDifference: number;
  /** Sample standard deviation (n - 1) of the differences; null with a single pair. */
  sdDifference: number | null;
  /** meanDifference - 1.96 SD; null with a single pair. */
  lower: number | null;
  /** meanDifference + 1.96 SD; null with a single pair. */
  upper: number | null;
};

/**
 * Bland-Altman limits of agreement between two measurements of the same cases (e.g. the same
 * variable abstracted twice).
 *
 * Definition: differences d_i = a_i - b_i; bias = mean(d); limits of agreement
 * bias -+ 1.96 SD(d), SD with divisor n - 1 (Bland JM, Altman DG, Lancet 1986;1:307-10). 1.96 is the
 * published multiplier and is used as such (not z_0.975 = 1.95996...).
 *
 * @param a first measurement of each case, finite numbers
 * @param b second measurement of the same cases in the same order, same length as a
 * @throws AnalysisInputError for empty or unequal-length arrays or a value that is not finite
 * @example blandAltman([1, 2, 3], [1, 1, 1]) // { n: 3, meanDifference: 1, sdDifference: 1, lower: -0.96, upper: 2.96 }
 */
export function blandAltman(a: readonly number[], b: readonly number[]): BlandAltmanResult {
  const fn = 'blandAltman';
  const xs = check.nonEmptyArray<unknown>(fn, 'a', a);
  const ys = check.nonEmptyArray<unknown>(fn, 'b', b);
  if (xs.length !== ys.length) {
    throw new AnalysisInputError(fn, 'b', `must have as many values as a (${xs.length}), one per case (got ${ys.length})`);
  }
  const d = xs.map((x, i) => check.finiteNumber(fn, `a[${i}]`, x) - check.finiteNumber(fn, `b[${i}]`, ys[i]));
  const meanDifference = mean(d);
  if (d.length < 2) return { n: d.length, meanDifference, sdDifference: null, lower: null, upper: null };
  const sd = sampleStandardDeviation(d);
  return { n: d.length, meanDifference, sdDifference: sd, lower: meanDifference - 1.96 * sd, upper: meanDifference + 1.96 * sd };
}
