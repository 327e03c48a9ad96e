/**
 * Alveolog's analysis module: pure functions, no database, HTTP or clock; randomness only from the seeded generator.
 * The server computes counts with SQL aggregates and hands them here; the client only displays.
 */

// Errors and shared shapes
export { AnalysisInputError } from './errors.js';
export {
  intervalSchema,
  nullableIntervalSchema,
  countSchema,
  exposureCountSchema,
  frequencySchema,
  spanSchema,
  type Interval,
  type NullableInterval,
  type Count,
  type ExposureCount,
  type Frequency,
  type Span,
} from './stats/types.js';

// Proportions, rates and ratios with confidence intervals
export { proportionInterval, PROPORTION_METHODS, type ProportionMethod } from './stats/proportion-interval.js';
export { rateInterval } from './stats/rate-interval.js';
export { standardizedRatio } from './stats/standardized-ratio.js';

// Comparisons of two groups
export { compareProportions, type ProportionComparison } from './stats/compare-proportions.js';
export { fisherExactP } from './stats/fisher-exact-p.js';
export { compareMedians, type MedianComparison } from './stats/compare-medians.js';
export { compareMediansFromCounts } from './stats/compare-medians-from-counts.js';
export { mantelHaenszelRiskRatio } from './stats/mantel-haenszel-risk-ratio.js';

// Run charts and control charts
export { runChart, type RunChartAnalysis } from './stats/run-chart.js';
export { pChart } from './stats/p-chart.js';
export { uChart } from './stats/u-chart.js';
export { iChart, type IndividualsChart } from './stats/i-chart.js';
export { gChart } from './stats/g-chart.js';
export type { ControlChart, ControlChartPoint } from './stats/control-chart.js';
export { SPECIAL_CAUSE_RULES, type SpecialCauseRuleId, type Signal } from './stats/special-cause-rules.js';
export { funnelLimits, type FunnelPoint } from './stats/funnel-limits.js';

// Agreement
export { cohenKappa, type KappaResult } from './stats/cohen-kappa.js';
export { landisKochBand, LANDIS_KOCH_BANDS, type LandisKochBand } from './stats/landis-koch-band.js';
export { blandAltman, type BlandAltmanResult } from './stats/bland-altman.js';

// Disclosure control
export {
  suppressSmallCells,
  countTableSchema,
  suppressedTableSchema,
  suppressionSchema,
  type CountTable,
  type SuppressedTable,
  type Suppression,
} from './stats/suppress-small-cells.js';

export { mulberry32 } from './random/mulberry32.js';
export * from './clinical/index.js';
