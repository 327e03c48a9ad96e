import { poissonLimits } from './poisson-limits.js';
import type { Interval } from './types.js';
import * as check from './validate.js';

/**
 * Standardized ratio O/E (e.g. observed over risk-model-expected complications) with the
 * exact Poisson interval.
 *
 * Definition: estimate = observed / expected.
 * Method: observed is taken as Poisson with the expected count fixed; the exact (Garwood) limits
 * of the count, chi2^-1(alpha/2; 2O)/2 and chi2^-1(1 - alpha/2; 2O + 2)/2 (lower 0 when O = 0),
 * are divided by E (Breslow NE, Day NE, Statistical Methods in Cancer Research vol. II, IARC 1987,
 * ch. 2; Ulm K, Am J Epidemiol 1990;131:373-5).
 *
 * @param observed whole number >= 0
 * @param expected expected count under the reference rates, > 0 (need not be whole)
 * @param options.level confidence level in (0, 1), default 0.95
 * @throws AnalysisInputError for a negative or fractional observed count, an expected count <= 0
 *   or not finite, or a level outside (0, 1)
 * @example standardizedRatio(10, 8) // { estimate: 1.25, lower: 0.599424, upper: 2.298795 }
 */
export function standardizedRatio(observed: number, expected: number, options?: { readonly level?: number }): Interval {
  const fn = 'standardizedRatio';
  const opts = check.options(fn, options);
  const o = check.count(fn, 'observed', observed);
  const e = check.positiveNumber(fn, 'expected', expected);
  const level = check.level(fn, opts.level);
  const { lower, upper } = poissonLimits(o, level);
  return { estimate: o / e, lower: lower / e, upper: upper / e };
}
