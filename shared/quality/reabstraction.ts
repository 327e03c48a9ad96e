/**
 * Re-abstraction agreement: a random sample of verified cases (reproducible from the seed shown
 * on screen) is re-abstracted blind by a second abstractor, who re-enters chosen fields without
 * seeing the first values. Per field: percent agreement and Cohen's kappa with the Landis & Koch
 * words for coded fields; mean difference and limits of agreement for numbers and dates (Bland &
 * Altman 1986; dates as day differences). Disagreements are adjudicated; a value taken from the
 * re-abstraction is written to the case through the registry's audited update.
 *
 * "Not documented" (null) is a category of its own for coded fields, so a field one abstractor
 * found and the other did not counts as a disagreement; pairs with a missing number or date are
 * left out of the limits of agreement (and counted).
 */
import { z } from 'zod';
import { CASE_FIELDS, type CaseFieldName } from '../registry/case.js';
import { fieldMeta } from '../registry/meta.js';
import { ReasonSchema } from '../registry/text.js';
import { SiteListSchema } from './common.js';

export type ReabstractionKind = 'coded' | 'number' | 'date';

/** Fields that can be re-abstracted, with how their agreement is measured. */
export const REABSTRACTION_FIELDS = {
  eligible: 'coded',
  admissionDate: 'date',
  age: 'number',
  sex: 'coded',
  heightCm: 'number',
  weightKg: 'number',
  asaClass: 'coded',
  asaEmergency: 'coded',
  smokingStatus: 'coded',
  copd: 'coded',
  obstructiveSleepApnoea: 'coded',
  heartFailure: 'coded',
  preopSpO2: 'number',
  preopHaemoglobin: 'number',
  respiratoryInfectionLastMonth: 'coded',
  functionalStatus: 'coded',
  surgeryDate: 'date',
  procedureCategory: 'coded',
  incisionSite: 'coded',
  approach: 'coded',
  urgency: 'coded',
  anaesthesia: 'coded',
  durationMinutes: 'number',
  therapyGiven: 'coded',
  dischargeDate: 'date',
  icuDays: 'number',
  ventilatorDays: 'number',
  readmitted30d: 'coded',
  readmissionCause: 'coded',
  died30d: 'coded',
} as const satisfies Partial<Record<CaseFieldName, ReabstractionKind>>;
export type ReabstractionField = keyof typeof REABSTRACTION_FIELDS;
export const REABSTRACTION_FIELD_NAMES = Object.keys(REABSTRACTION_FIELDS) as ReabstractionField[];
export const ReabstractionFieldSchema = z.enum(REABSTRACTION_FIELD_NAMES as [ReabstractionField, ...ReabstractionField[]]);

export const NOT_DOCUMENTED = 'not documented';

export function fieldLabel(f: ReabstractionField): string {
  return fieldMeta(CASE_FIELDS[f])?.label ?? f;
}
export function fieldUnit(f: ReabstractionField): string | undefined {
  return REABSTRACTION_FIELDS[f] === 'date' ? 'days' : fieldMeta(CASE_FIELDS[f])?.unit;
}

/** POST /api/quality/reabstraction/samples */
export const SampleDrawSchema = z.strictObject({
  siteIds: z.array(z.uuid('a site id is not valid')).min(1, 'choose at least one site').max(50),
  size: z.number({ error: 'enter the number of cases' }).int('enter a whole number').min(2, 'draw at least 2 cases (kappa needs pairs)').max(500, 'draw at most 500 cases'),
  fields: z.array(ReabstractionFieldSchema).min(1, 'choose at least one field').max(REABSTRACTION_FIELD_NAMES.length)
    .refine((a) => new Set(a).size === a.length, 'each field once'),
  reabstractorId: z.uuid('choose the second abstractor'),
  /** Leave empty for a fresh seed (shown on the sample); give one to reproduce a draw. */
  seed: z.number().int().min(0).max(0xffffffff).optional(),
  surgeryFrom: z.iso.date({ error: 'enter a date as YYYY-MM-DD' }).optional(),
  surgeryTo: z.iso.date({ error: 'enter a date as YYYY-MM-DD' }).optional(),
}).superRefine((q, ctx) => {
  if (q.surgeryFrom && q.surgeryTo && q.surgeryFrom > q.surgeryTo) ctx.addIssue({ code: 'custom', path: ['surgeryTo'], message: 'the end of the date range is before its start' });
});
export type SampleDraw = z.infer<typeof SampleDrawSchema>;

export const SampleListQuerySchema = z.strictObject({ siteId: SiteListSchema });

export const SampleSummarySchema = z.object({
  id: z.uuid(),
  seed: z.number().int(),
  size: z.number().int(),
  poolSize: z.number().int(),
  siteCodes: z.array(z.string()),
  fields: z.array(ReabstractionFieldSchema),
  reabstractorId: z.uuid(),
  reabstractorEmail: z.string(),
  createdByEmail: z.string().nullable(),
  createdAt: z.string(),
  entered: z.number().int(),
  surgeryFrom: z.string().nullable(),
  surgeryTo: z.string().nullable(),
});
export type SampleSummary = z.infer<typeof SampleSummarySchema>;

/** What the second abstractor sees: the case to find and the fields to enter, never the first values. */
export const BlindFieldSchema = z.object({
  field: ReabstractionFieldSchema,
  label: z.string(),
  kind: z.enum(['coded', 'number', 'date']),
  unit: z.string().nullable(),
  /** Allowed values for coded fields ('true'/'false' for yes/no). */
  options: z.array(z.object({ value: z.string(), label: z.string() })).nullable(),
  /** For haemoglobin: the units it may be entered in. */
  enteredUnits: z.array(z.string()).nullable(),
});
export const BlindItemSchema = z.object({
  id: z.uuid(),
  ordinal: z.number().int(),
  caseId: z.uuid(),
  registryNumber: z.string(),
  siteCode: z.string(),
  enteredAt: z.string().nullable(),
});
export const BlindWorkSchema = z.object({
  sample: z.object({ id: z.uuid(), seed: z.number().int(), createdAt: z.string() }),
  fields: z.array(BlindFieldSchema),
  items: z.array(BlindItemSchema),
});
export type BlindWork = z.infer<typeof BlindWorkSchema>;
export type BlindField = z.infer<typeof BlindFieldSchema>;

/** POST /api/quality/reabstraction/items/:id: every chosen field, null = not documented in the source. */
export const ReabstractionEntrySchema = z.strictObject({ values: z.record(z.string(), z.unknown()) });

export const LandisKochWordSchema = z.enum(['poor', 'slight', 'fair', 'moderate', 'substantial', 'almost perfect']);

export const FieldAgreementSchema = z.object({
  field: ReabstractionFieldSchema,
  label: z.string(),
  kind: z.enum(['coded', 'number', 'date']),
  unit: z.string().nullable(),
  pairs: z.number().int(),
  agree: z.number().int(),
  percentAgreement: z.number().nullable(),
  kappa: z.number().nullable(),
  observedAgreement: z.number().nullable(),
  expectedAgreement: z.number().nullable(),
  band: LandisKochWordSchema.nullable(),
  /** Bland–Altman on pairs where both values are present (first minus second abstraction). */
  limits: z.object({ n: z.number().int(), meanDifference: z.number(), sdDifference: z.number().nullable(), lower: z.number().nullable(), upper: z.number().nullable() }).nullable(),
  pairsWithMissing: z.number().int(),
  /** Kappa is undefined when both abstractions used one and the same value throughout. */
  note: z.string().nullable(),
});
export type FieldAgreement = z.infer<typeof FieldAgreementSchema>;

export const DisagreementSchema = z.object({
  itemId: z.uuid(),
  caseId: z.uuid(),
  registryNumber: z.string(),
  siteCode: z.string(),
  field: ReabstractionFieldSchema,
  label: z.string(),
  original: z.unknown(),
  reabstracted: z.unknown(),
  originalText: z.string(),
  reabstractedText: z.string(),
  caseVersion: z.number().int(),
  caseStatus: z.string(),
  adjudication: z.object({ decision: z.enum(['original', 'reabstracted']), reason: z.string(), byEmail: z.string().nullable(), at: z.string(), written: z.boolean() }).nullable(),
});
export type Disagreement = z.infer<typeof DisagreementSchema>;

export const AgreementReportSchema = z.object({
  sample: SampleSummarySchema,
  fields: z.array(FieldAgreementSchema),
  disagreements: z.array(DisagreementSchema),
  /** Items whose second abstractor opened the case in the registry before entering (audit trail). */
  openedBeforeEntry: z.array(z.object({ registryNumber: z.string() })),
});
export type AgreementReport = z.infer<typeof AgreementReportSchema>;

/** POST /api/quality/reabstraction/items/:id/adjudications */
export const AdjudicationSchema = z.strictObject({
  field: ReabstractionFieldSchema,
  decision: z.enum(['original', 'reabstracted'], { error: 'choose which value is right: original or reabstracted' }),
  reason: ReasonSchema,
  /** The case version the adjudicator saw (optimistic concurrency when the case is changed). */
  caseVersion: z.number().int().min(1),
});
export type Adjudication = z.infer<typeof AdjudicationSchema>;
