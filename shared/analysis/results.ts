/**
 * Request options and response shapes of the analysis routes (/api/analysis/*): what the server
 * sends and the client draws. Counts may be null for a researcher: suppressed because they are
 * from 1 to 10 or would reveal such a count (CMS cell-size suppression policy).
 */
import { z } from 'zod';
import { MeasureKeySchema } from './measures.js';

export const ConfidenceLevelSchema = z.coerce
  .number({ error: 'level must be 0.90, 0.95 or 0.99' })
  .refine((l) => [0.9, 0.95, 0.99].includes(l), 'level must be 0.90, 0.95 or 0.99');
export const CONFIDENCE_LEVELS = [0.9, 0.95, 0.99] as const;

export const GroupingSchema = z.enum(['month', 'quarter'], { error: 'grouping must be month or quarter' });
export type Grouping = z.infer<typeof GroupingSchema>;

/** Expected events of a risk-adjusted comparison come from the reference cohort's ARISCAT class rates, or from ARISCAT's published class risks. */
export const ExpectedFromSchema = z.enum(['reference', 'ariscat-published'], { error: 'expected must be reference or ariscat-published' });
export type ExpectedFrom = z.infer<typeof ExpectedFromSchema>;

/** Options in the query string beside the cohort filter. */
export const AnalysisOptionsSchema = z.object({
  level: ConfidenceLevelSchema.default(0.95),
  grouping: GroupingSchema.default('month'),
  measure: MeasureKeySchema.default('any-ppc'),
  expected: ExpectedFromSchema.default('reference'),
  /** Second cohort of a comparison: "rest" = the rest of the network (every counted case not in A). */
  b: z.enum(['cohort', 'rest']).default('cohort'),
});
export type AnalysisOptions = z.infer<typeof AnalysisOptionsSchema>;

const nint = z.number().int().nullable();
const nnum = z.number().nullable();
export const IntervalOutSchema = z.object({ estimate: nnum, lower: nnum, upper: nnum });

/** How the viewer sees other sites (DESIGN.md role table). */
export const SiteVisibilitySchema = z.enum(['named', 'own-sites', 'coded']);
export type SiteVisibility = z.infer<typeof SiteVisibilitySchema>;

export const MeasureResultSchema = z.object({
  key: MeasureKeySchema,
  label: z.string(),
  kind: z.enum(['proportion', 'rate']),
  unit: z.string(),
  events: nint,
  /** Cases (proportion) or patient-days (rate). */
  denominator: nint,
  interval: IntervalOutSchema,
  /** Plain-words cautions (few events, suppressed). */
  notes: z.array(z.string()),
});
export type MeasureResult = z.infer<typeof MeasureResultSchema>;

export const CompletenessSchema = z.object({
  cases: nint,
  verified: nint,
  verifiedShare: nnum,
  discharged: nint,
  dischargedShare: nnum,
  warning: z.string().nullable(),
});

export const RatesResultSchema = z.object({
  size: nint,
  completeness: CompletenessSchema,
  measures: z.array(MeasureResultSchema),
  level: z.number(),
  source: z.enum(['roll-up', 'fact-table']),
  methods: z.array(z.string()),
});
export type RatesResult = z.infer<typeof RatesResultSchema>;

export const StratumSchema = z.object({ key: z.string(), label: z.string(), cases: nint, measures: z.array(MeasureResultSchema) });
export type Stratum = z.infer<typeof StratumSchema>;

export const LosSummarySchema = z.object({
  cases: nint,
  median: nnum,
  q1: nnum,
  q3: nnum,
  /** Frequency of each length of stay in days (days >= `capAt` pooled into the last bin for the histogram). */
  histogram: z.array(z.object({ days: z.string(), count: nint })),
});
export type LosSummary = z.infer<typeof LosSummarySchema>;

export const CohortPageSchema = RatesResultSchema.extend({
  los: LosSummarySchema,
  byAriscat: z.array(StratumSchema),
  bySite: z.array(StratumSchema),
  siteVisibility: SiteVisibilitySchema,
});
export type CohortPage = z.infer<typeof CohortPageSchema>;

export const OutcomeComparisonSchema = z.object({
  key: MeasureKeySchema,
  label: z.string(),
  a: z.object({ events: nint, total: nint }),
  b: z.object({ events: nint, total: nint }),
  difference: IntervalOutSchema,
  riskRatio: IntervalOutSchema,
  oddsRatio: IntervalOutSchema,
  fisherP: nnum,
  /** Observed/expected in A with the exact Poisson interval (risk adjusted over ARISCAT classes). */
  observedExpected: z.object({ observed: nint, expected: nnum, ratio: IntervalOutSchema, note: z.string().nullable() }),
  /** Mantel-Haenszel risk ratio of A vs B across ARISCAT classes (Greenland-Robins interval). */
  mantelHaenszel: IntervalOutSchema,
  notes: z.array(z.string()),
});
export type OutcomeComparison = z.infer<typeof OutcomeComparisonSchema>;

export const ComparisonSchema = z.object({
  level: z.number(),
  expected: ExpectedFromSchema,
  bIsRest: z.boolean(),
  a: RatesResultSchema,
  b: RatesResultSchema,
  outcomes: z.array(OutcomeComparisonSchema),
  los: z.object({ medianA: nnum, medianB: nnum, u: nnum, p: nnum, note: z.string().nullable() }),
  methods: z.array(z.string()),
});
export type Comparison = z.infer<typeof ComparisonSchema>;

export const SeriesPointSchema = z.object({
  period: z.string(),
  events: nint,
  denominator: nint,
  value: nnum,
  lower: nnum,
  upper: nnum,
  /** Control limits (p-chart for proportions, u-chart for rates), when the period has cases. */
  lcl: nnum,
  ucl: nnum,
  outside: z.boolean(),
});
export const SeriesSchema = z.object({
  measure: MeasureKeySchema,
  label: z.string(),
  unit: z.string(),
  grouping: GroupingSchema,
  level: z.number(),
  centre: nnum,
  points: z.array(SeriesPointSchema),
  signals: z.array(z.object({ rule: z.string(), start: z.number(), end: z.number(), startPeriod: z.string(), endPeriod: z.string() })),
  runChart: z.object({ median: nnum, shifts: z.array(z.object({ start: z.number(), end: z.number() })), trends: z.array(z.object({ start: z.number(), end: z.number() })) }).nullable(),
  methods: z.array(z.string()),
});
export type Series = z.infer<typeof SeriesSchema>;

export const FunnelSchema = z.object({
  measure: MeasureKeySchema,
  label: z.string(),
  target: nnum,
  siteVisibility: SiteVisibilitySchema,
  sites: z.array(z.object({
    key: z.string(),
    label: z.string(),
    events: nint,
    total: nint,
    proportion: nnum,
    /** 'within', 'above-95', 'above-99.8', 'below-95', 'below-99.8'. */
    position: z.string().nullable(),
  })),
  curve: z.array(z.object({ size: z.number(), lower95: z.number(), upper95: z.number(), lower998: z.number(), upper998: z.number() })),
  methods: z.array(z.string()),
});
export type Funnel = z.infer<typeof FunnelSchema>;
