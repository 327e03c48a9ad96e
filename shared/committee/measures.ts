/**
 * The committee's measures catalogue: each measure's definition (numerator, denominator,
 * exclusions, source), the chart it is watched on, and which monthly SQL inputs it reads.
 * The first four keys, and their words, are the analysis issue's (shared/analysis/measures.ts);
 * this module adds the committee's own. Cases that count follow the registry's derived-measure
 * rules (shared/registry/derived.ts): status complete, verified or locked; month of surgery.
 */
import { z } from 'zod';
import { ANALYSED_CASE_STATUSES } from '../registry/derived.js';
import { measureByKey as analysisMeasure, type MeasureKey as AnalysisMeasureKey } from '../analysis/measures.js';

export const MeasureKeySchema = z.enum([
  'any-ppc',
  'atelectasis',
  'pneumonia',
  'pneumonia-per-1000-patient-days',
  'respiratory-readmission-30d',
  'median-length-of-stay',
  'early-therapy-at-risk',
  'therapy-adherence',
]);
export type MeasureKey = z.infer<typeof MeasureKeySchema>;
export const MEASURE_KEYS = MeasureKeySchema.options;

/**
 * proportion -> p-chart; rate -> u-chart (events per `per` units of exposure);
 * individuals -> XmR chart of one monthly statistic (a median or a mean).
 */
export type MeasureKind = 'proportion' | 'rate' | 'individuals';

/** The additive monthly inputs the database returns per site and month (server/measures/monthly-sql.ts). */
export const MONTHLY_INPUTS = [
  'cases', 'anyPpc', 'atelectasis', 'pneumonia', 'pneumoniaDischarged', 'dischargedCases', 'patientDays',
  'followedUp', 'respiratoryReadmissions', 'atRisk', 'earlyTherapy', 'adherenceCases', 'adherenceSum',
] as const;
export type MonthlyInput = (typeof MONTHLY_INPUTS)[number];

export interface MeasureDefinition {
  key: MeasureKey;
  label: string;
  short: string;
  kind: MeasureKind;
  /** Unit of the plotted value, written beside every number. */
  unit: '%' | 'per 1,000 patient-days' | 'days';
  /** Exposure multiplier of a rate. */
  per?: number;
  /** Which direction is better, for the words that explain a signal. */
  better: 'lower' | 'higher';
  numerator: string;
  denominator: string;
  exclusions: string;
  source: string;
  /** The monthly inputs giving numerator and denominator (individuals charts: sum and count, or a frequency table). */
  inputs: { numerator: MonthlyInput; denominator: MonthlyInput } | { frequencies: 'lengthOfStay' };
  /** Rare enough at a small site to offer the g-chart (cases between events) and the quarterly view. */
  rareEvent: boolean;
  /** Clinical caution shown on the definition page of process measures. */
  caution?: boolean;
}

const COUNTED = `Cases whose status is ${ANALYSED_CASE_STATUSES.join(', ')}, by month of surgery.`;
const EXCLUDED = 'Draft and withdrawn cases; removed outcome events and therapy episodes.';

/** The words of a measure the analysis issue defined, so both pages say the same. */
function shared(key: AnalysisMeasureKey) {
  const m = analysisMeasure(key);
  return { label: m.label, short: m.shortLabel, numerator: m.numerator, denominator: m.denominator, source: m.source };
}

export const MEASURES: readonly MeasureDefinition[] = [
  {
    key: 'any-ppc', ...shared('any-ppc'), kind: 'proportion', unit: '%', better: 'lower', exclusions: EXCLUDED,
    inputs: { numerator: 'anyPpc', denominator: 'cases' }, rareEvent: false,
  },
  {
    key: 'atelectasis', ...shared('atelectasis'), kind: 'proportion', unit: '%', better: 'lower', exclusions: EXCLUDED,
    inputs: { numerator: 'atelectasis', denominator: 'cases' }, rareEvent: true,
  },
  {
    key: 'pneumonia', ...shared('pneumonia'), kind: 'proportion', unit: '%', better: 'lower', exclusions: EXCLUDED,
    inputs: { numerator: 'pneumonia', denominator: 'cases' }, rareEvent: true,
  },
  {
    key: 'pneumonia-per-1000-patient-days', ...shared('pneumonia-per-1000-patient-days'), kind: 'rate', unit: 'per 1,000 patient-days', per: 1000, better: 'lower',
    exclusions: `${EXCLUDED} Cases not yet discharged (their patient-days are not known).`,
    inputs: { numerator: 'pneumoniaDischarged', denominator: 'patientDays' }, rareEvent: true,
  },
  {
    key: 'respiratory-readmission-30d', label: '30-day readmission for a respiratory cause', short: 'Respiratory readmission', kind: 'proportion', unit: '%', better: 'lower',
    numerator: 'Cases readmitted within 30 days of surgery with the cause recorded as respiratory.',
    denominator: `${COUNTED} A case whose readmission is not recorded counts as not readmitted (as in the analysis pages' 30-day readmission).`,
    exclusions: EXCLUDED,
    source: 'common practice (no source); 30-day window from the day of surgery (day 0 to day 30)',
    inputs: { numerator: 'respiratoryReadmissions', denominator: 'cases' }, rareEvent: true,
  },
  {
    key: 'median-length-of-stay', label: 'Median length of stay', short: 'Median LOS', kind: 'individuals', unit: 'days', better: 'lower',
    numerator: 'The median, per month, of length of stay (discharge date minus admission date, calendar days) of discharged cases.',
    denominator: 'Discharged cases with both dates recorded (the count is shown beside each month).',
    exclusions: `${EXCLUDED} Cases not yet discharged or without an admission date.`,
    source: 'Individuals (XmR) chart: Provost LP, Murray SK, The Health Care Data Guide, 2011, ch. 7',
    inputs: { frequencies: 'lengthOfStay' }, rareEvent: false,
  },
  {
    key: 'early-therapy-at-risk', label: 'Intermediate- and high-risk patients starting lung-expansion therapy by post-operative day 1', short: 'Early therapy (at risk)', kind: 'proportion', unit: '%', better: 'higher',
    numerator: 'Of the denominator, cases with a therapy episode starting on or before post-operative day 1 (day 0 is the day of surgery).',
    denominator: `${COUNTED} Only cases with an ARISCAT class of intermediate (26-44 points) or high (45 or more).`,
    exclusions: `${EXCLUDED} Low-risk cases and cases without an ARISCAT class.`,
    source: 'ARISCAT classes: Canet J et al., Anesthesiology 2010;113:1338-50; process measure (common practice, no source)',
    inputs: { numerator: 'earlyTherapy', denominator: 'atRisk' }, rareEvent: false, caution: true,
  },
  {
    key: 'therapy-adherence', label: 'Therapy adherence (sessions delivered / prescribed, capped at 100%)', short: 'Adherence', kind: 'individuals', unit: '%', better: 'higher',
    numerator: 'The mean, per month, of each case\'s adherence: over its episodes with sessions prescribed, the sessions delivered (each episode capped at its prescription, so at most 100%) divided by the sessions prescribed.',
    denominator: 'Cases with at least one episode with sessions prescribed and delivered recorded (the count is shown beside each month).',
    exclusions: `${EXCLUDED} Episodes with no sessions prescribed.`,
    source: 'Individuals (XmR) chart: Provost LP, Murray SK, The Health Care Data Guide, 2011, ch. 7; adherence definition: common practice (no source)',
    inputs: { numerator: 'adherenceSum', denominator: 'adherenceCases' }, rareEvent: false, caution: true,
  },
];

export function measureByKey(key: MeasureKey): MeasureDefinition {
  const m = MEASURES.find((x) => x.key === key);
  if (!m) throw new Error(`unknown measure ${key}`);
  return m;
}

export function chartKindLabel(kind: MeasureKind): string {
  return kind === 'proportion' ? 'p-chart' : kind === 'rate' ? 'u-chart' : 'individuals (XmR) chart';
}

/** YYYY-MM, the surveillance month. */
export const MonthSchema = z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'use the form YYYY-MM, e.g. 2025-03');

/** What an admin may change: on or off, and the baseline period (first and last month). */
export const MeasureSettingsUpdateSchema = z.strictObject({
  enabled: z.boolean().optional(),
  baselineStart: MonthSchema.nullable().optional(),
  baselineEnd: MonthSchema.nullable().optional(),
}).refine((v) => !(v.baselineStart && v.baselineEnd && v.baselineStart > v.baselineEnd), { message: 'the baseline must end on or after its first month', path: ['baselineEnd'] });
export type MeasureSettingsUpdate = z.infer<typeof MeasureSettingsUpdateSchema>;

export const MeasureSettingsSchema = z.object({
  enabled: z.boolean(),
  baselineStart: MonthSchema.nullable(),
  baselineEnd: MonthSchema.nullable(),
});
export type MeasureSettings = z.infer<typeof MeasureSettingsSchema>;

/** Baseline when none is set: the first 12 months of each phase (common practice, no source). */
export const DEFAULT_BASELINE_MONTHS = 12;
