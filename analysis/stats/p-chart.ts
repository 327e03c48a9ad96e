import { buildChart, type ControlChart } from './control-chart.js';
import type { Count } from './types.js';
import * as check from './validate.js';

/**
 * p-chart (proportion defective) with limits for each subgroup's size.
 *
 * Definition: centre p = sum of events / sum of totals over the first `baseline` subgroups
 * (default all); for subgroup i, value events_i / total_i, limits p -+ 3 sqrt(p(1 - p) / total_i),
 * the lower clamped at 0 and the upper at 1 (Provost LP, Murray SK, The Health Care Data Guide,
 * 2011, ch. 6; Montgomery DC, Introduction to Statistical Quality Control, 7th ed. 2013, sec. 7.2).
 * `outside` is strictly beyond a limit; `signals` are the special-cause rules (SPECIAL_CAUSE_RULES),
 * judged against each subgroup's own sigma.
 *
 * @param points subgroups in time order: events (whole number >= 0) of total (whole number >= 1)
 * @param options.baseline how many leading subgroups set the centre, 1..points.length; default all
 * @throws AnalysisInputError for no subgroup, an invalid count (negative, fractional, events above
 *   total, total 0) or a baseline out of range
 * @example pChart([{ events: 2, total: 20 }, { events: 4, total: 20 }]).centre // 0.15; limits 0 to 0.389531
 */
export function pChart(points: readonly Readonly<Count>[], options?: { readonly baseline?: number }): ControlChart {
  const fn = 'pChart';
  const opts = check.options(fn, options);
  const list = check.nonEmptyArray<unknown>(fn, 'points', points).map((p, i) => {
    const o = check.object(fn, `points[${i}]`, p);
    return check.eventsOfTotal(fn, `points[${i}].`, o.events, o.total);
  });
  const baseline = check.baseline(fn, opts.baseline, list.length, 'subgroups');
  let events = 0;
  let total = 0;
  for (const p of list.slice(0, baseline)) {
    events += p.events;
    total += p.total;
  }
  const centre = events / total;
  return buildChart<number>(
    centre,
    list.map((p) => p.events / p.total),
    list.map((p) => Math.sqrt((centre * (1 - centre)) / p.total)),
    0,
    1,
  );
}
