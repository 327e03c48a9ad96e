/**
 * The one cohort filter of Alveolog (issues 4 and 6): which cases a rate, a comparison, a
 * chart or a saved cohort is about. One zod schema, one URL encoding (so that a link
 * reproduces a view), used by the client's cohort builder, the analysis routes, saved
 * cohorts, committee measures and exports alike.
 *
 * Every list is OR within itself and AND across fields; an empty or absent list means "no
 * restriction". Only statuses that count in analyses (complete, verified, locked) are ever
 * counted; `status` can narrow them (e.g. verified and locked only), never widen them.
 */
import { z } from 'zod';
import {
  ApproachSchema,
  AsaClassSchema,
  IncisionSiteSchema,
  PpcEventTypeSchema,
  ProcedureCategorySchema,
  SexSchema,
  TherapyModalitySchema,
  UrgencySchema,
  type CaseStatus,
} from '../clinical/codes.js';
import { IsoDateSchema } from '../clinical/dates.js';
import { AriscatRiskClassSchema } from '../clinical/scores.js';

/** Statuses that count in analyses (never draft or withdrawn); mirrors ANALYSED_CASE_STATUSES. */
export const AnalysedStatusSchema = z.enum(['complete', 'verified', 'locked'], {
  error: 'status must be complete, verified or locked (drafts and withdrawn cases never count in analyses)',
});
export type AnalysedStatus = z.infer<typeof AnalysedStatusSchema> & CaseStatus;
export const ANALYSED_STATUSES = AnalysedStatusSchema.options;

/**
 * Age bands: ARISCAT's three (Canet J et al., Anesthesiology 2010;113:1338-50: up to 50, 51-80,
 * over 80 years) and decades (common practice (no source)); 90 and over is one band, as HIPAA
 * Safe Harbor groups ages over 89 (45 CFR 164.514(b)(2)).
 */
export const AGE_BANDS = {
  'up-to-50': { min: 0, max: 50, label: 'Up to 50 years (ARISCAT)' },
  '51-80': { min: 51, max: 80, label: '51–80 years (ARISCAT)' },
  'over-80': { min: 81, max: null, label: 'Over 80 years (ARISCAT)' },
  '0-9': { min: 0, max: 9, label: '0–9 years' },
  '10-19': { min: 10, max: 19, label: '10–19 years' },
  '20-29': { min: 20, max: 29, label: '20–29 years' },
  '30-39': { min: 30, max: 39, label: '30–39 years' },
  '40-49': { min: 40, max: 49, label: '40–49 years' },
  '50-59': { min: 50, max: 59, label: '50–59 years' },
  '60-69': { min: 60, max: 69, label: '60–69 years' },
  '70-79': { min: 70, max: 79, label: '70–79 years' },
  '80-89': { min: 80, max: 89, label: '80–89 years' },
  '90-plus': { min: 90, max: null, label: '90 years and over' },
} as const satisfies Record<string, { min: number; max: number | null; label: string }>;
export const AgeBandSchema = z.enum(Object.keys(AGE_BANDS) as [keyof typeof AGE_BANDS, ...(keyof typeof AGE_BANDS)[]]);
export type AgeBand = z.infer<typeof AgeBandSchema>;
export const AGE_BAND_KEYS = AgeBandSchema.options;

/**
 * Case-level therapy adherence (sessions delivered / prescribed over all the case's episodes,
 * capped at 1) in three bands; cases without prescribed sessions are in none of them.
 * Bands: common practice (no source).
 */
export const ADHERENCE_BANDS = {
  'under-50': { min: 0, below: 0.5, label: 'Under 50%' },
  '50-79': { min: 0.5, below: 0.8, label: '50–79%' },
  '80-plus': { min: 0.8, below: null, label: '80% and more' },
} as const satisfies Record<string, { min: number; below: number | null; label: string }>;
export const AdherenceBandSchema = z.enum(['under-50', '50-79', '80-plus']);
export type AdherenceBand = z.infer<typeof AdherenceBandSchema>;
export const ADHERENCE_BAND_KEYS = AdherenceBandSchema.options;

/** Whether the case received any lung-expansion therapy episode. */
export const TherapyReceivedSchema = z.enum(['yes', 'no']);
export type TherapyReceived = z.infer<typeof TherapyReceivedSchema>;

const list = <T extends z.ZodType>(item: T, what: string) =>
  z.array(item, { error: `${what} must be a list` }).max(50, `choose at most 50 ${what}`).optional();

const day = z.number({ error: 'enter a whole number of days' }).int('enter a whole number of days').min(0, 'days cannot be negative').max(365, 'at most 365 days');

export const CohortFilterSchema = z
  .strictObject({
    /** First and last surgery date, inclusive (YYYY-MM-DD). */
    from: IsoDateSchema.optional(),
    to: IsoDateSchema.optional(),
    sites: list(z.uuid('a site id is a UUID'), 'sites'),
    units: list(z.uuid('a unit id is a UUID'), 'units'),
    procedureCategories: list(ProcedureCategorySchema, 'procedure categories'),
    incisionSites: list(IncisionSiteSchema, 'incision sites'),
    approaches: list(ApproachSchema, 'approaches'),
    urgencies: list(UrgencySchema, 'urgencies'),
    asaClasses: list(AsaClassSchema, 'ASA classes'),
    ariscatClasses: list(AriscatRiskClassSchema, 'ARISCAT classes'),
    ageBands: list(AgeBandSchema, 'age bands'),
    sexes: list(SexSchema, 'sexes'),
    /** Therapy received at all (yes / no). */
    therapy: TherapyReceivedSchema.optional(),
    /** Cases with at least one episode of any of these modalities. */
    modalities: list(TherapyModalitySchema, 'therapy modalities'),
    /** Days from surgery to the first therapy episode, inclusive bounds. */
    firstTherapyMin: day.optional(),
    firstTherapyMax: day.optional(),
    adherenceBands: list(AdherenceBandSchema, 'adherence bands'),
    statuses: list(AnalysedStatusSchema, 'statuses'),
    /** Cases with at least one outcome event of any of these types. */
    outcomeTypes: list(PpcEventTypeSchema, 'outcome types'),
  })
  .refine((f) => !f.from || !f.to || f.from <= f.to, { path: ['to'], message: 'the end date is before the start date; swap them' })
  .refine((f) => f.firstTherapyMin == null || f.firstTherapyMax == null || f.firstTherapyMin <= f.firstTherapyMax, {
    path: ['firstTherapyMax'],
    message: 'the largest day to first therapy is below the smallest; swap them',
  });
export type CohortFilter = z.infer<typeof CohortFilterSchema>;

// --- URL encoding ---------------------------------------------------------------------------

/** Filter field -> URL parameter name (short, stable: links in e-mails and minutes rely on them). */
export const COHORT_URL_PARAMS = {
  from: 'from',
  to: 'to',
  sites: 'site',
  units: 'unit',
  procedureCategories: 'category',
  incisionSites: 'incision',
  approaches: 'approach',
  urgencies: 'urgency',
  asaClasses: 'asa',
  ariscatClasses: 'ariscat',
  ageBands: 'age',
  sexes: 'sex',
  therapy: 'therapy',
  modalities: 'modality',
  firstTherapyMin: 'firstTherapyMin',
  firstTherapyMax: 'firstTherapyMax',
  adherenceBands: 'adherence',
  statuses: 'status',
  outcomeTypes: 'outcome',
} as const satisfies Record<keyof CohortFilter, string>;

const LIST_FIELDS = new Set<keyof CohortFilter>([
  'sites', 'units', 'procedureCategories', 'incisionSites', 'approaches', 'urgencies', 'asaClasses',
  'ariscatClasses', 'ageBands', 'sexes', 'modalities', 'adherenceBands', 'statuses', 'outcomeTypes',
]);
const NUMBER_FIELDS = new Set<keyof CohortFilter>(['firstTherapyMin', 'firstTherapyMax']);

/**
 * Writes a filter as URL parameters: lists comma-separated and sorted (one filter, one URL),
 * empty fields left out. `prefix` namespaces a second cohort on one page (e.g. "b.").
 */
export function encodeCohortFilter(filter: CohortFilter, prefix = '', into = new URLSearchParams()): URLSearchParams {
  for (const [field, param] of Object.entries(COHORT_URL_PARAMS) as [keyof CohortFilter, string][]) {
    const v = filter[field];
    if (v == null) continue;
    if (Array.isArray(v)) {
      if (v.length) into.set(prefix + param, [...new Set(v as string[])].sort().join(','));
    } else into.set(prefix + param, String(v));
  }
  return into;
}

/** Reads URL parameters back into a raw object (not yet validated). */
export function cohortFilterFromParams(params: URLSearchParams | Record<string, unknown>, prefix = ''): Record<string, unknown> {
  const get = (k: string): string | undefined => {
    if (params instanceof URLSearchParams) return params.get(k) ?? undefined;
    const v = params[k];
    return Array.isArray(v) ? v.join(',') : v == null ? undefined : String(v);
  };
  const raw: Record<string, unknown> = {};
  for (const [field, param] of Object.entries(COHORT_URL_PARAMS) as [keyof CohortFilter, string][]) {
    const s = get(prefix + param);
    if (s == null || s === '') continue;
    if (LIST_FIELDS.has(field)) raw[field] = s.split(',').map((x) => x.trim()).filter(Boolean);
    else if (NUMBER_FIELDS.has(field)) raw[field] = /^-?\d+$/.test(s.trim()) ? Number(s) : s;
    else raw[field] = s;
  }
  return raw;
}

/**
 * Parses URL parameters into a valid filter.
 * @throws ZodError naming the filter field (the server turns it into a 400 with field paths)
 */
export function decodeCohortFilter(params: URLSearchParams | Record<string, unknown>, prefix = ''): CohortFilter {
  return CohortFilterSchema.parse(cohortFilterFromParams(params, prefix));
}

/** Whether the URL/query carries any parameter of a cohort with this prefix. */
export function hasCohortParams(params: URLSearchParams, prefix = ''): boolean {
  return Object.values(COHORT_URL_PARAMS).some((p) => params.has(prefix + p));
}

/** The empty filter: every counted case of the network. */
export const EMPTY_COHORT_FILTER: CohortFilter = {};
