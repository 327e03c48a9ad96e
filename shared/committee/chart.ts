/**
 * The chart API's query and answer: a measure's monthly (or quarterly) series for one site or
 * the network, split into phases at re-basing months, each phase with its run-chart analysis
 * and its control chart, and every signal explained in words.
 */
import { z } from 'zod';
import { MeasureKeySchema, MonthSchema } from './measures.js';

/** `site` is a site id or 'network'; `rebase` lists annotated months that start a new phase. */
export const ChartQuerySchema = z.strictObject({
  site: z.union([z.literal('network'), z.string().uuid('choose a site id or "network"')]).default('network'),
  view: z.enum(['monthly', 'quarterly']).default('monthly'),
  from: MonthSchema.optional(),
  to: MonthSchema.optional(),
  rebase: z.preprocess((v) => (v === undefined || v === '' ? [] : Array.isArray(v) ? v : String(v).split(',')), z.array(MonthSchema).max(12, 'at most 12 re-basing months')),
});
export type ChartQuery = z.infer<typeof ChartQuerySchema>;

export const ChartPointSchema = z.object({
  /** YYYY-MM, or YYYY-Qn in the quarterly view. */
  period: z.string(),
  numerator: z.number(),
  denominator: z.number(),
  /** The plotted value in the measure's unit (% for proportions); null when the denominator is 0. */
  value: z.number().nullable(),
  provisional: z.boolean(),
  phase: z.number().int(),
  inBaseline: z.boolean(),
  centre: z.number().nullable(),
  lower: z.number().nullable(),
  upper: z.number().nullable(),
  /** Run-chart median of the point's phase. */
  median: z.number().nullable(),
  outside: z.boolean(),
  /** Ids of the signals this point is part of. */
  signals: z.array(z.string()),
  smallCount: z.boolean(),
});
export type ChartPoint = z.infer<typeof ChartPointSchema>;

export const ChartSignalSchema = z.object({
  id: z.string(),
  chart: z.enum(['run', 'control']),
  rule: z.string(),
  label: z.string(),
  phase: z.number().int(),
  startPeriod: z.string(),
  endPeriod: z.string(),
  /** above/below the centre line or median, rising/falling, or none (a run-count rule). */
  direction: z.enum(['above', 'below', 'rising', 'falling', 'none']),
  /** Whether the direction is the better one for the measure, or null when it has no direction. */
  favourable: z.boolean().nullable(),
  explanation: z.string(),
  provisional: z.boolean(),
});
export type ChartSignal = z.infer<typeof ChartSignalSchema>;

export const ChartPhaseSchema = z.object({
  index: z.number().int(),
  startPeriod: z.string(),
  endPeriod: z.string(),
  baselinePoints: z.number().int(),
  median: z.number().nullable(),
  centre: z.number().nullable(),
  useful: z.number().int(),
  longestRun: z.number().int(),
  longestRunLimit: z.number().nullable(),
  crossings: z.number().int(),
  crossingsLimit: z.number().nullable(),
});
export type ChartPhase = z.infer<typeof ChartPhaseSchema>;

export const AnnotationSchema = z.object({
  id: z.string().uuid(),
  siteId: z.string().uuid().nullable(),
  siteCode: z.string().nullable(),
  month: MonthSchema,
  text: z.string(),
  createdBy: z.string().nullable(),
  createdAt: z.string(),
});
export type Annotation = z.infer<typeof AnnotationSchema>;

export const ChartResponseSchema = z.object({
  measure: z.object({ key: MeasureKeySchema, label: z.string(), short: z.string(), kind: z.enum(['proportion', 'rate', 'individuals']), unit: z.string(), better: z.enum(['lower', 'higher']), chart: z.string() }),
  scope: z.object({ site: z.string(), label: z.string() }),
  view: z.enum(['monthly', 'quarterly']),
  points: z.array(ChartPointSchema),
  phases: z.array(ChartPhaseSchema),
  signals: z.array(ChartSignalSchema),
  annotations: z.array(AnnotationSchema),
  /** Shown when the site is small and the measure is a rare event: try the g-chart or the quarterly view. */
  rareEventAdvice: z.string().nullable(),
  summary: z.string(),
});
export type ChartResponse = z.infer<typeof ChartResponseSchema>;

export const GChartResponseSchema = z.object({
  measure: z.object({ key: MeasureKeySchema, label: z.string() }),
  scope: z.object({ site: z.string(), label: z.string() }),
  /** One point per event: the cases operated between the previous event and this one. */
  points: z.array(z.object({ eventMonth: z.string(), between: z.number().int(), lower: z.number(), upper: z.number(), outside: z.boolean() })),
  centre: z.number().nullable(),
  /** Cases since the last event (not yet a point). */
  sinceLast: z.number().int(),
  signals: z.array(ChartSignalSchema),
  summary: z.string(),
});
export type GChartResponse = z.infer<typeof GChartResponseSchema>;

export const AnnotationCreateSchema = z.strictObject({
  siteId: z.string().uuid('choose a site, or leave empty for the network').nullable(),
  month: MonthSchema,
  text: z.string().trim().min(3, 'write at least a few words').max(200, 'keep the note under 200 characters'),
});
export type AnnotationCreate = z.infer<typeof AnnotationCreateSchema>;
