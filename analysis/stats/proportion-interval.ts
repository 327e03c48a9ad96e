import { AnalysisInputError } from '../errors.js';
import { betaQuantile, zForLevel } from './distributions.js';
import type { Interval } from './types.js';
import * as check from './validate.js';

export type ProportionMethod = 'wilson' | 'exact' | 'jeffreys';
export const PROPORTION_METHODS: readonly ProportionMethod[] = ['wilson', 'exact', 'jeffreys'];

/**
 * Confidence interval for a proportion x/n.
 *
 * Definition: estimate x/n (the plain proportion, whatever the method).
 * Methods (alpha = 1 - level, z = z_{1 - alpha/2}):
 * - `wilson` (default): the score interval without continuity correction,
 *   (x + z^2/2 -+ z sqrt(x(n - x)/n + z^2/4)) / (n + z^2)
 *   (Wilson EB, J Am Stat Assoc 1927;22:209-12; method 3 of Newcombe RG, Stat Med 1998;17:857-72).
 * - `exact`: Clopper-Pearson, lower = Beta^-1(alpha/2; x, n - x + 1), upper =
 *   Beta^-1(1 - alpha/2; x + 1, n - x), with lower 0 when x = 0 and upper 1 when x = n
 *   (Clopper CJ, Pearson ES, Biometrika 1934;26:404-13).
 * - `jeffreys`: equal-tailed quantiles of Beta(x + 1/2, n - x + 1/2), with lower 0 when x = 0
 *   and upper 1 when x = n (Brown LD, Cai TT, DasGupta A, Stat Sci 2001;16:101-33).
 *
 * @param events x, whole number, 0 <= x <= total
 * @param total n, whole number >= 1
 * @param options.method 'wilson' | 'exact' | 'jeffreys' (default 'wilson')
 * @param options.level confidence level in (0, 1), default 0.95
 * @throws AnalysisInputError for a negative or fractional count, events above total, a total of 0,
 *   an unknown method or a level outside (0, 1)
 * @example proportionInterval(81, 263) // { estimate: 0.307985, lower: 0.255289, upper: 0.366210 } (Newcombe 1998: 0.2553-0.3662)
 */
export function proportionInterval(
  events: number,
  total: number,
  options?: { readonly method?: ProportionMethod; readonly level?: number },
): Interval {
  const fn = 'proportionInterval';
  const opts = check.options(fn, options);
  const { events: x, total: n } = check.eventsOfTotal(fn, '', events, total);
  const level = check.level(fn, opts.level);
  const method = opts.method ?? 'wilson';
  if (!PROPORTION_METHODS.includes(method as ProportionMethod)) {
    throw new AnalysisInputError(fn, 'options.method', `must be one of ${PROPORTION_METHODS.join(', ')} (got ${String(method)})`);
  }
  return proportionLimits(x, n, method as ProportionMethod, level);
}

/** The interval without input checks, for callers that have already validated x, n and level. */
export function proportionLimits(x: number, n: number, method: ProportionMethod, level: number): Interval {
  const estimate = x / n;
  const alpha = 1 - level;
  let lower: number;
  let upper: number;
  if (method === 'wilson') {
    const z = zForLevel(level);
    const z2 = z * z;
    const centre = (x + z2 / 2) / (n + z2);
    const half = (z * Math.sqrt((x * (n - x)) / n + z2 / 4)) / (n + z2);
    lower = x === 0 ? 0 : centre - half;
    upper = x === n ? 1 : centre + half;
  } else if (method === 'exact') {
    lower = x === 0 ? 0 : betaQuantile(alpha / 2, x, n - x + 1);
    upper = x === n ? 1 : betaQuantile(1 - alpha / 2, x + 1, n - x);
  } else {
    lower = x === 0 ? 0 : betaQuantile(alpha / 2, x + 0.5, n - x + 0.5);
    upper = x === n ? 1 : betaQuantile(1 - alpha / 2, x + 0.5, n - x + 0.5);
  }
  // Rounding must not put a limit on the wrong side of the estimate or outside [0, 1].
  return { estimate, lower: Math.max(0, Math.min(lower, estimate)), upper: Math.min(1, Math.max(upper, estimate)) };
}
