import { fisherP } from './fisher-exact-p.js';
import { proportionLimits } from './proportion-interval.js';
import { zForLevel } from './distributions.js';
import type { Count, Interval } from './types.js';
import * as check from './validate.js';

export type ProportionComparison = {
  /** pA - pB with Newcombe's hybrid score interval. */
  difference: Interval;
  /** pA / pB with the log (Katz) interval. */
  riskRatio: Interval;
  /** odds A / odds B with Woolf's logit interval. */
  oddsRatio: Interval;
  /** Two-sided Fisher exact p (as R's fisher.test). */
  fisherP: number;
};

/**
 * Compares two proportions A and B (e.g. PPC in two cohorts).
 *
 * Definitions and methods (z = z_{1 - alpha/2}, alpha = 1 - level):
 * - difference pA - pB with the hybrid score interval built from the two Wilson intervals
 *   (lA, uA), (lB, uB): d - sqrt((pA - lA)^2 + (uB - pB)^2) to d + sqrt((uA - pA)^2 + (pB - lB)^2)
 *   (method 10 of Newcombe RG, Stat Med 1998;17:873-90).
 * - risk ratio pA / pB, interval exp(ln RR -+ z sqrt(1/a - 1/nA + 1/c - 1/nB))
 *   (Katz D et al., Biometrics 1978;34:469-74).
 * - odds ratio ad / bc, interval exp(ln OR -+ z sqrt(1/a + 1/b + 1/c + 1/d)) (Woolf B, Ann Hum
 *   Genet 1955;19:251-3).
 *   When any of the four cells (a = eventsA, b = nA - a, c = eventsB, d = nB - c) is 0, 0.5 is
 *   added to every cell (Haldane JBS, Ann Hum Genet 1956;20:309-11) and both ratios, estimate
 *   and interval alike, are computed on the corrected cells, so they stay finite.
 * - fisherP: two-sided Fisher exact p, see fisherExactP.
 *
 * @param a group A: events and total (total >= 1)
 * @param b group B: events and total (total >= 1)
 * @param options.level confidence level in (0, 1), default 0.95
 * @throws AnalysisInputError for a negative or fractional count, events above total, a total of 0,
 *   or a level outside (0, 1)
 * @example compareProportions({ events: 56, total: 70 }, { events: 48, total: 80 }).difference
 *   // { estimate: 0.2, lower: 0.0524, upper: 0.3339 } (Newcombe 1998)
 */
export function compareProportions(a: Count, b: Count, options?: { readonly level?: number }): ProportionComparison {
  const fn = 'compareProportions';
  const opts = check.options(fn, options);
  const A = check.object(fn, 'a', a);
  const B = check.object(fn, 'b', b);
  const { events: xA, total: nA } = check.eventsOfTotal(fn, 'a.', A.events, A.total);
  const { events: xB, total: nB } = check.eventsOfTotal(fn, 'b.', B.events, B.total);
  const level = check.level(fn, opts.level);
  const z = zForLevel(level);

  const wa = proportionLimits(xA, nA, 'wilson', level);
  const wb = proportionLimits(xB, nB, 'wilson', level);
  const d = wa.estimate - wb.estimate;
  const difference = {
    estimate: d,
    lower: Math.max(-1, d - Math.hypot(wa.estimate - wa.lower, wb.upper - wb.estimate)),
    upper: Math.min(1, d + Math.hypot(wa.upper - wa.estimate, wb.estimate - wb.lower)),
  };

  const shift = xA === 0 || xA === nA || xB === 0 || xB === nB ? 0.5 : 0;
  const ca = xA + shift;
  const cb = nA - xA + shift;
  const cc = xB + shift;
  const cd = nB - xB + shift;

  const rr = (ca / (ca + cb)) / (cc / (cc + cd));
  const seRr = Math.sqrt(1 / ca - 1 / (ca + cb) + 1 / cc - 1 / (cc + cd));
  const or = (ca * cd) / (cb * cc);
  const seOr = Math.sqrt(1 / ca + 1 / cb + 1 / cc + 1 / cd);

  return {
    difference,
    riskRatio: logInterval(rr, seRr, z),
    oddsRatio: logInterval(or, seOr, z),
    fisherP: fisherP(xA, nA, xB, nB),
  };
}

function logInterval(estimate: number, se: number, z: number): Interval {
  const log = Math.log(estimate);
  return { estimate, lower: Math.exp(log - z * se), upper: Math.exp(log + z * se) };
}
