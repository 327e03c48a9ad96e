import { poissonLimits } from './poisson-limits.js';
import type { Interval } from './types.js';
import * as check from './validate.js';

/**
 * Incidence density (events per `per` units of exposure) with the exact Poisson interval.
 *
 * Definition: estimate = events / exposure * per, e.g. pneumonias per 1,000 patient-days.
 * Method: the event count is taken as Poisson; its exact (Garwood) limits,
 * chi2^-1(alpha/2; 2x)/2 and chi2^-1(1 - alpha/2; 2x + 2)/2 (lower 0 when x = 0), are scaled by
 * per / exposure (Garwood F, Biometrika 1936;28:437-42; Ulm K, Am J Epidemiol 1990;131:373-5).
 *
 * @param events whole number >= 0
 * @param exposure person-time at risk, > 0 (e.g. patient-days)
 * @param options.per units of exposure the rate is expressed per, > 0, default 1000
 * @param options.level confidence level in (0, 1), default 0.95
 * @throws AnalysisInputError for a negative or fractional count, an exposure <= 0 or not finite,
 *   a per <= 0, or a level outside (0, 1)
 * @example rateInterval(10, 2000) // { estimate: 5, lower: 2.3977, upper: 9.1952 } per 1,000
 */
export function rateInterval(
  events: number,
  exposure: number,
  options?: { readonly per?: number; readonly level?: number },
): Interval {
  const fn = 'rateInterval';
  const opts = check.options(fn, options);
  const x = check.count(fn, 'events', events);
  const t = check.positiveNumber(fn, 'exposure', exposure);
  const per = opts.per === undefined ? 1000 : check.positiveNumber(fn, 'options.per', opts.per);
  const level = check.level(fn, opts.level);
  const { lower, upper } = poissonLimits(x, level);
  const scale = per / t;
  return { estimate: (x / t) * per, lower: lower * scale, upper: upper * scale };
}
