import { AnalysisInputError } from '../errors.js';
import { binomialPmf } from './distributions.js';
import * as check from './validate.js';

/** The funnel at one unit size: for each level, the lower and upper limit of the observed proportion. */
export type FunnelPoint = { size: number; limits: { level: number; lower: number; upper: number }[] };

/**
 * Funnel-plot control limits for a proportion against a target, by the exact binomial with
 * interpolation.
 *
 * Definition: for a unit of size n and a tail probability p (p = (1 - level)/2 for the lower limit,
 * (1 + level)/2 for the upper), r_p is the p-quantile of Binomial(n, target): the smallest r with
 * P(R <= r) >= p. The discrete limit is smoothed by
 * alpha = (P(R <= r_p) - p) / P(R = r_p), limit = (r_p - alpha) / n
 * (Spiegelhalter DJ, Stat Med 2005;24:1185-1202, appendix A.1.1). The interpolated value can fall
 * just below 0 when r_p = 0; limits are clamped to [0, 1], the range of a proportion.
 * Levels 0.95 and 0.998 are the usual "2 and 3 sigma" funnels.
 *
 * @param target the target proportion, from 0 to 1
 * @param sizes unit sizes (whole numbers >= 1), at least one
 * @param options.levels levels in (0, 1), at least one; default [0.95, 0.998]
 * @throws AnalysisInputError for a target outside [0, 1], no size, a size that is not a whole
 *   number >= 1, or a level outside (0, 1)
 * @example funnelLimits(0.1, [100], { levels: [0.95] }) // [{ size: 100, limits: [{ level: 0.95, lower: 0.040381, upper: 0.157719 }] }]
 */
export function funnelLimits(
  target: number,
  sizes: readonly number[],
  options?: { readonly levels?: readonly number[] },
): FunnelPoint[] {
  const fn = 'funnelLimits';
  const opts = check.options(fn, options);
  const theta = check.finiteNumber(fn, 'target', target);
  if (theta < 0 || theta > 1) throw new AnalysisInputError(fn, 'target', `must be a proportion from 0 to 1 (got ${theta})`);
  const ns = check.nonEmptyArray<unknown>(fn, 'sizes', sizes).map((n, i) => check.positiveCount(fn, `sizes[${i}]`, n));
  const levels =
    opts.levels === undefined
      ? [0.95, 0.998]
      : check.nonEmptyArray<unknown>(fn, 'options.levels', opts.levels).map((l, i) => check.level(fn, l, `options.levels[${i}]`));
  const cache = new Map<number, FunnelPoint>();
  return ns.map((n) => {
    const hit = cache.get(n);
    if (hit) return { size: n, limits: hit.limits.map((l) => ({ ...l })) };
    // The window holds every term that is not 0 to double precision; below it P(R <= r) is 0.
    const { lo, probabilities: pmf } = binomialPmf(n, theta);
    const cdf = new Float64Array(pmf.length);
    let run = 0;
    for (let i = 0; i < pmf.length; i += 1) {
      run += pmf[i];
      cdf[i] = run;
    }
    const limit = (p: number): number => {
      if (theta === 0 || theta === 1) return theta;
      const fuzz = p * (1 - 64 * Number.EPSILON);
      let i = 0;
      while (i < pmf.length - 1 && cdf[i] < fuzz) i += 1;
      const alpha = pmf[i] > 0 ? (cdf[i] - p) / pmf[i] : 0;
      return Math.min(1, Math.max(0, (lo + i - alpha) / n));
    };
    const point = { size: n, limits: levels.map((l) => ({ level: l, lower: limit((1 - l) / 2), upper: limit((1 + l) / 2) })) };
    cache.set(n, point);
    return point;
  });
}
