import { mean } from 'simple-statistics';
import { buildChart, type ControlChart } from './control-chart.js';
import * as check from './validate.js';

export type IndividualsChart = ControlChart<number | null> & {
  /** Mean moving range over the baseline; null when the baseline has a single point. */
  movingRangeMean: number | null;
};

/**
 * Individuals (XmR) chart, e.g. for monthly medians of length of stay or mean adherence.
 *
 * Definition: over the first `baseline` points (default all), centre = their mean and
 * MRbar = the mean of the moving ranges |x_i - x_(i-1)| between consecutive baseline points; limits
 * centre -+ 2.66 MRbar (2.66 = 3 / d2, d2 = 1.128 for ranges of two), so sigma = 2.66 MRbar / 3
 * for the zone rules (Provost LP, Murray SK, The Health Care Data Guide, 2011, ch. 7; Montgomery DC,
 * Introduction to Statistical Quality Control, 7th ed. 2013, sec. 6.4). Limits are not clamped.
 * With a single baseline point MRbar is undefined: limits and MRbar are null and only the rules
 * that need no sigma can fire.
 *
 * @param values the series in time order, finite numbers, at least one
 * @param options.baseline how many leading points set centre and MRbar, 1..values.length; default all
 * @throws AnalysisInputError for an empty series, a value that is not finite or a baseline out of range
 * @example iChart([10, 12, 11, 13]) // centre 11.5, MRbar 5/3, limits 7.0667 to 15.9333
 */
export function iChart(values: readonly number[], options?: { readonly baseline?: number }): IndividualsChart {
  const fn = 'iChart';
  const opts = check.options(fn, options);
  const list = check.nonEmptyArray<unknown>(fn, 'values', values).map((v, i) => check.finiteNumber(fn, `values[${i}]`, v));
  const baseline = check.baseline(fn, opts.baseline, list.length, 'values');
  const base = list.slice(0, baseline);
  const centre = mean(base);
  let movingRangeMean: number | null = null;
  if (base.length > 1) {
    let sum = 0;
    for (let i = 1; i < base.length; i += 1) sum += Math.abs(base[i] - base[i - 1]);
    movingRangeMean = sum / (base.length - 1);
  }
  const sigma = movingRangeMean === null ? null : (2.66 * movingRangeMean) / 3;
  const halfWidth = movingRangeMean === null ? 0 : 2.66 * movingRangeMean;
  const chart = buildChart<number | null>(
    centre,
    list,
    list.map(() => sigma),
    -Infinity,
    Infinity,
    list.map(() => halfWidth),
  );
  return { ...chart, movingRangeMean };
}
