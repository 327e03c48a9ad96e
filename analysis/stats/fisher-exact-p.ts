import { hypergeometricPmf } from './distributions.js';
import type { Count } from './types.js';
import * as check from './validate.js';

/**
 * Two-sided Fisher exact p for a 2x2 table of two groups (events / non-events).
 *
 * Definition: with all margins fixed, the count of events in group A is hypergeometric; the
 * two-sided p is the sum of the probabilities of every table no more likely than the observed one
 * (Fisher RA, J R Stat Soc 1922;85:87-94; Agresti A, Stat Sci 1992;7:131-53).
 * Method: as R's fisher.test, a table counts as "no more likely" when its probability is at most
 * the observed one times (1 + 1e-7), so that rounding does not drop tables of equal probability;
 * the result is clamped to [0, 1].
 *
 * @param a group A: events and total (total >= 1)
 * @param b group B: events and total (total >= 1)
 * @throws AnalysisInputError for a negative or fractional count, events above total, a total of 0
 * @example fisherExactP({ events: 3, total: 4 }, { events: 1, total: 4 }) // 0.485714 (Fisher's tea tasting)
 */
export function fisherExactP(a: Count, b: Count): number {
  const fn = 'fisherExactP';
  const A = check.object(fn, 'a', a);
  const B = check.object(fn, 'b', b);
  const ca = check.eventsOfTotal(fn, 'a.', A.events, A.total);
  const cb = check.eventsOfTotal(fn, 'b.', B.events, B.total);
  return fisherP(ca.events, ca.total, cb.events, cb.total);
}

/** The p without input checks (counts already validated). */
export function fisherP(x1: number, n1: number, x2: number, n2: number): number {
  const { lo, probabilities } = hypergeometricPmf(n1, n2, x1 + x2);
  const observed = probabilities[x1 - lo] * (1 + 1e-7);
  let p = 0;
  for (const d of probabilities) if (d <= observed) p += d;
  return Math.max(0, Math.min(1, p));
}
