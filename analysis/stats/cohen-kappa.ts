import { AnalysisInputError } from '../errors.js';
import * as check from './validate.js';

export type KappaResult = {
  /** (po - pe) / (1 - pe); null when pe = 1 (both raters used one and the same category throughout). */
  kappa: number | null;
  /** po: share of pairs where the raters agree. */
  observedAgreement: number;
  /** pe: agreement expected by chance from each rater's own category shares. */
  expectedAgreement: number;
};

/**
 * Cohen's kappa for two raters (e.g. the original abstraction and a re-abstraction of the same cases).
 *
 * Definition: kappa = (po - pe) / (1 - pe), po = share of pairs that agree, pe = sum over categories
 * of pA(k) pB(k), the categories being the union of both raters' labels (Cohen J, Educ Psychol Meas
 * 1960;20:37-46). Computed from whole-number counts, (n * agree - S) / (n^2 - S) with
 * S = sum nA(k) nB(k), so that no rounding appears before the last division. Labels are compared
 * exactly (case and spaces matter). Read kappa with landisKochBand.
 *
 * @param pairs one [rater A label, rater B label] per case, at least one pair
 * @throws AnalysisInputError for an empty list or a pair that is not two strings
 * @example cohenKappa([...12 x ['yes','yes'], ...2 x ['no','yes'], ...4 x ['yes','no'], ...2 x ['no','no']])
 *   // { kappa: 0.210526, observedAgreement: 0.7, expectedAgreement: 0.62 }
 */
export function cohenKappa(pairs: readonly (readonly [string, string])[]): KappaResult {
  const fn = 'cohenKappa';
  const list = check.nonEmptyArray<unknown>(fn, 'pairs', pairs);
  const countA = new Map<string, number>();
  const countB = new Map<string, number>();
  let agree = 0;
  list.forEach((pair, i) => {
    if (!Array.isArray(pair) || pair.length !== 2 || typeof pair[0] !== 'string' || typeof pair[1] !== 'string') {
      throw new AnalysisInputError(fn, `pairs[${i}]`, 'must be a pair of two labels (strings), [rater A, rater B]');
    }
    const [a, b] = pair as [string, string];
    countA.set(a, (countA.get(a) ?? 0) + 1);
    countB.set(b, (countB.get(b) ?? 0) + 1);
    if (a === b) agree += 1;
  });
  const n = list.length;
  let s = 0;
  for (const [label, ca] of countA) s += ca * (countB.get(label) ?? 0);
  const nn = n * n;
  return {
    kappa: s === nn ? null : (n * agree - s) / (nn - s),
    observedAgreement: agree / n,
    expectedAgreement: s / nn,
  };
}
