import { zForLevel } from './distributions.js';
import type { Count, NullableInterval } from './types.js';
import * as check from './validate.js';

/**
 * Mantel-Haenszel risk ratio of A versus B over strata (e.g. ARISCAT risk classes), with the
 * Greenland-Robins confidence interval.
 *
 * Definition: for stratum i with a_i events of n1_i in A, b_i events of n0_i in B, N_i = n1_i + n0_i:
 * RR_MH = R / S with R = sum a_i n0_i / N_i and S = sum b_i n1_i / N_i (Mantel N, Haenszel W,
 * J Natl Cancer Inst 1959;22:719-48). Variance of ln RR_MH =
 * sum((n1_i n0_i (a_i + b_i) - a_i b_i N_i) / N_i^2) / (R S) (Greenland S, Robins JM, Biometrics
 * 1985;41:55-68); interval exp(ln RR_MH -+ z sqrt(var)).
 * Undefined parts are null: no events in either group gives all null (0/0); no events in B gives a
 * null estimate and limits (an infinite ratio); no events in A gives estimate 0, lower 0 and a null
 * upper limit (the log interval has no finite upper end).
 *
 * @param strata one { a, b } per stratum, each an events/total count with total >= 1; at least one
 * @param options.level confidence level in (0, 1), default 0.95
 * @throws AnalysisInputError for no stratum, an invalid count (negative, fractional, events above
 *   total, total 0: leave out a stratum where a group has no cases) or a level outside (0, 1)
 * @example mantelHaenszelRiskRatio([{ a: { events: 10, total: 100 }, b: { events: 5, total: 100 } }])
 *   // { estimate: 2, lower: 0.708951, upper: 5.642136 } (one stratum: the Katz interval)
 */
export function mantelHaenszelRiskRatio(
  strata: readonly { readonly a: Readonly<Count>; readonly b: Readonly<Count> }[],
  options?: { readonly level?: number },
): NullableInterval {
  const fn = 'mantelHaenszelRiskRatio';
  const opts = check.options(fn, options);
  const list = check.nonEmptyArray<unknown>(fn, 'strata', strata).map((s, i) => {
    const o = check.object(fn, `strata[${i}]`, s);
    const a = check.object(fn, `strata[${i}].a`, o.a);
    const b = check.object(fn, `strata[${i}].b`, o.b);
    return {
      a: check.eventsOfTotal(fn, `strata[${i}].a.`, a.events, a.total),
      b: check.eventsOfTotal(fn, `strata[${i}].b.`, b.events, b.total),
    };
  });
  const level = check.level(fn, opts.level);
  let r = 0;
  let s = 0;
  let p = 0;
  for (const { a, b } of list) {
    const n = a.total + b.total;
    r += (a.events * b.total) / n;
    s += (b.events * a.total) / n;
    p += (a.total * b.total * (a.events + b.events) - a.events * b.events * n) / (n * n);
  }
  if (s === 0) return { estimate: null, lower: null, upper: null };
  if (r === 0) return { estimate: 0, lower: 0, upper: null };
  const estimate = r / s;
  const half = zForLevel(level) * Math.sqrt(p / (r * s));
  return { estimate, lower: estimate * Math.exp(-half), upper: estimate * Math.exp(half) };
}
