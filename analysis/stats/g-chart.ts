import { mean } from 'simple-statistics';
import { buildChart, type ControlChart } from './control-chart.js';
import * as check from './validate.js';

/**
 * g-chart for rare events: the number of cases (or days) between consecutive events.
 *
 * Definition: centre g = the mean of the first `baseline` counts (default all); limits
 * g -+ 3 sqrt(g(g + 1)), the lower clamped at 0 (so it is always 0), from the geometric
 * distribution of the count between events (Benneyan JC, Health Care Manag Sci 2001;4:305-18;
 * Provost LP, Murray SK, The Health Care Data Guide, 2011, ch. 8). A point above the upper limit
 * is a long gap, i.e. a signal of improvement. The zone and run rules are applied as for the other
 * charts, but the geometric distribution is skewed, so read them as prompts, not proof.
 *
 * @param between counts between events in time order, finite numbers >= 0, at least one
 * @param options.baseline how many leading counts set the centre, 1..between.length; default all
 * @throws AnalysisInputError for an empty series, a negative or non-finite count or a baseline out of range
 * @example gChart([10, 30, 20]).centre // 20; limits 0 to 20 + 3 sqrt(420) = 81.4817
 */
export function gChart(between: readonly number[], options?: { readonly baseline?: number }): ControlChart {
  const fn = 'gChart';
  const opts = check.options(fn, options);
  const list = check.nonEmptyArray<unknown>(fn, 'between', between).map((v, i) => check.nonNegativeNumber(fn, `between[${i}]`, v));
  const baseline = check.baseline(fn, opts.baseline, list.length, 'counts');
  const centre = mean(list.slice(0, baseline));
  const sigma = Math.sqrt(centre * (centre + 1));
  return buildChart<number>(centre, list, list.map(() => sigma), 0, Infinity);
}
