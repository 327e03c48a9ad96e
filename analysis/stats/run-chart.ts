import { median as medianOf } from 'simple-statistics';
import { AnalysisInputError } from '../errors.js';
import { binomialQuantile } from './distributions.js';
import { monotoneRuns } from './monotone-runs.js';
import type { Span } from './types.js';
import * as check from './validate.js';

export type RunChartAnalysis = {
  /** Median of the first `baseline` non-null points: the centre line every point is judged against. */
  median: number;
  /** Useful observations: non-null points not on the median, over the whole series. */
  useful: number;
  /** Number of runs (maximal groups of useful points on the same side of the median). */
  runs: number;
  /** Length of the longest run (useful points). */
  longestRun: number;
  /** Signal when longestRun > round(log2(useful) + 3); null when there is no useful point. */
  longestRunLimit: number | null;
  /** Times the line crosses the median: runs - 1 (0 with no useful point). */
  crossings: number;
  /** Signal when crossings < qbinom(0.05, useful - 1, 0.5); null when there is no useful point. */
  crossingsLimit: number | null;
  /** Runs of 6 or more useful points on one side of the median (indices into `values`). */
  shifts: Span[];
  /** 5 or more points all rising or all falling, equal neighbours counted once (indices into `values`). */
  trends: Span[];
};

/**
 * Run-chart analysis of a series (e.g. a monthly PPC proportion).
 *
 * Definitions: the median is taken over the first `baseline` non-null points (default all) and
 * every point of the series is judged against it. Nulls (months with no data) are skipped. Points
 * on the median are not useful observations: they neither break nor extend a run. `useful` is the n
 * of Anhøj's rules: a longest run above round(log2(n) + 3) or fewer crossings than
 * qbinom(0.05, n - 1, 0.5) signals non-random variation (Anhøj J, Olesen AV, PLoS One
 * 2014;9:e113825). A shift is a run of six or more useful points on one side of the median; a trend
 * is five or more points all rising or all falling, where equal neighbours count once (Perla RJ,
 * Provost LP, Murray SK, BMJ Qual Saf 2011;20:46-51). `start`/`end` index `values`: a shift runs from
 * its first to its last useful point; a trend from where the rise or fall starts to where it stops
 * (with equal values at either end, the last of the equal starting points and the first of the
 * equal ending points). Re-basing (a new phase) is done by the caller, one call per phase.
 *
 * @param values the series in time order; null for a period with no data; other values finite
 * @param options.baseline how many leading non-null points set the median, whole number from 1 to
 *   the number of non-null points; default all
 * @throws AnalysisInputError when values is not an array, has no non-null value, holds a value
 *   that is not a finite number or null, or when baseline is out of range
 * @example runChart([1, 2, 3, 4, 5, 6, 7]).trends // [{ start: 0, end: 6 }], median 4, useful 6
 */
export function runChart(values: readonly (number | null)[], options?: { readonly baseline?: number }): RunChartAnalysis {
  const fn = 'runChart';
  const opts = check.options(fn, options);
  if (!Array.isArray(values)) throw new AnalysisInputError(fn, 'values', 'must be an array of numbers or nulls');
  const indices: number[] = [];
  const points: number[] = [];
  values.forEach((v, i) => {
    if (v === null) return;
    points.push(check.finiteNumber(fn, `values[${i}]`, v));
    indices.push(i);
  });
  if (points.length === 0) {
    throw new AnalysisInputError(fn, 'values', 'has no non-null value: a run chart needs at least one point');
  }
  const baseline = check.baseline(fn, opts.baseline, points.length, 'non-null points');
  const median = medianOf(points.slice(0, baseline));

  // Runs among useful points: side +1 above, -1 below the median.
  const runSpans: { side: number; start: number; end: number; length: number }[] = [];
  points.forEach((v, i) => {
    if (v === median) return;
    const side = v > median ? 1 : -1;
    const last = runSpans[runSpans.length - 1];
    if (last && last.side === side) {
      last.end = indices[i];
      last.length += 1;
    } else runSpans.push({ side, start: indices[i], end: indices[i], length: 1 });
  });
  const useful = runSpans.reduce((sum, r) => sum + r.length, 0);
  const runs = runSpans.length;
  return {
    median,
    useful,
    runs,
    longestRun: runSpans.reduce((max, r) => Math.max(max, r.length), 0),
    longestRunLimit: useful > 0 ? Math.round(Math.log2(useful) + 3) : null,
    crossings: Math.max(0, runs - 1),
    crossingsLimit: useful > 0 ? binomialQuantile(0.05, useful - 1, 0.5) : null,
    shifts: runSpans.filter((r) => r.length >= 6).map((r) => ({ start: r.start, end: r.end })),
    trends: monotoneRuns(indices, points, 5),
  };
}
