import { buildChart, type ControlChart } from './control-chart.js';
import type { ExposureCount } from './types.js';
import * as check from './validate.js';

/**
 * u-chart (events per unit of exposure, e.g. pneumonias per 1,000 patient-days).
 *
 * Definition: subgroup size n_i = exposure_i / per; centre u = sum of events / sum of exposure
 * * per over the first `baseline` subgroups (default all); for subgroup i, value
 * events_i / exposure_i * per, limits u -+ 3 sqrt(u / n_i), the lower clamped at 0 (Provost LP,
 * Murray SK, The Health Care Data Guide, 2011, ch. 6; Montgomery DC, Introduction to Statistical
 * Quality Control, 7th ed. 2013, sec. 7.3). `outside` is strictly beyond a limit; `signals` are the
 * special-cause rules (SPECIAL_CAUSE_RULES), judged against each subgroup's own sigma.
 *
 * @param points subgroups in time order: events (whole number >= 0) over exposure (> 0)
 * @param options.per units of exposure the rate is expressed per, > 0, default 1000
 * @param options.baseline how many leading subgroups set the centre, 1..points.length; default all
 * @throws AnalysisInputError for no subgroup, a negative or fractional count, an exposure <= 0 or
 *   not finite, a per <= 0 or a baseline out of range
 * @example uChart([{ events: 3, exposure: 1000 }, { events: 5, exposure: 1000 }]).centre // 4; limits 0 to 10
 */
export function uChart(
  points: readonly Readonly<ExposureCount>[],
  options?: { readonly per?: number; readonly baseline?: number },
): ControlChart {
  const fn = 'uChart';
  const opts = check.options(fn, options);
  const per = opts.per === undefined ? 1000 : check.positiveNumber(fn, 'options.per', opts.per);
  const list = check.nonEmptyArray<unknown>(fn, 'points', points).map((p, i) => {
    const o = check.object(fn, `points[${i}]`, p);
    return {
      events: check.count(fn, `points[${i}].events`, o.events),
      exposure: check.positiveNumber(fn, `points[${i}].exposure`, o.exposure),
    };
  });
  const baseline = check.baseline(fn, opts.baseline, list.length, 'subgroups');
  let events = 0;
  let exposure = 0;
  for (const p of list.slice(0, baseline)) {
    events += p.events;
    exposure += p.exposure;
  }
  const centre = (events / exposure) * per;
  return buildChart<number>(
    centre,
    list.map((p) => (p.events / p.exposure) * per),
    list.map((p) => Math.sqrt(centre / (p.exposure / per))),
    0,
    Infinity,
  );
}
