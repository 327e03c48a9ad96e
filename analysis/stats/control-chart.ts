import { specialCauseSignals, type Signal } from './special-cause-rules.js';

/** One subgroup of a Shewhart chart: its value, its 3-sigma limits and whether it lies strictly beyond one. */
export type ControlChartPoint<Limit extends number | null = number> = {
  value: number;
  lower: Limit;
  upper: Limit;
  outside: boolean;
};

/** A Shewhart chart: centre line, per-point limits and the special-cause signals that fired. */
export type ControlChart<Limit extends number | null = number> = {
  centre: number;
  points: ControlChartPoint<Limit>[];
  signals: Signal[];
};

/**
 * Builds a chart from each point's value and sigma around one centre line: limits centre -+ 3 sigma,
 * clamped to [floor, ceiling]; `outside` is strictly beyond a limit; then the special-cause rules.
 * A null sigma (undefined spread) gives null limits and never `outside`. `halfWidths` overrides
 * 3 sigma where a chart defines its limits directly (the individuals chart's 2.66 MRbar).
 */
export function buildChart<Limit extends number | null>(
  centre: number,
  values: readonly number[],
  sigmas: readonly (number | null)[],
  floor: number,
  ceiling: number,
  halfWidths?: readonly number[],
): ControlChart<Limit> {
  const points = values.map((value, i) => {
    const sigma = sigmas[i];
    if (sigma === null) return { value, lower: null, upper: null, outside: false };
    const half = halfWidths ? halfWidths[i] : 3 * sigma;
    const lower = Math.max(floor, centre - half);
    const upper = Math.min(ceiling, centre + half);
    return { value, lower, upper, outside: value > upper || value < lower };
  });
  const signals = specialCauseSignals(points.map((p, i) => ({ value: p.value, centre, sigma: sigmas[i], outside: p.outside })));
  return { centre, points: points as ControlChartPoint<Limit>[], signals };
}
