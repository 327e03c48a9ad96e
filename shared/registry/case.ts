/**
 * The surgical case: request bodies for create and update, the stored record, and the
 * cross-field rules (contradictions) shared by the form and the server.
 *
 * Every field is optional while the case is a draft; which fields a complete case needs is
 * in `completeness.ts`. Units: haemoglobin is entered in g/dL or g/L and stored in g/dL
 * (shared/clinical/units.ts); all other quantities have one unit.
 */
import { z } from 'zod';
import {
  ANAESTHESIA_LABELS,
  APPROACH_LABELS,
  ASA_CLASS_LABELS,
  AnaesthesiaSchema,
  ApproachSchema,
  AsaClassSchema,
  FUNCTIONAL_STATUS_LABELS,
  FunctionalStatusSchema,
  INCISION_SITE_LABELS,
  IncisionSiteSchema,
  PROCEDURE_CATEGORY_LABELS,
  ProcedureCategorySchema,
  READMISSION_CAUSE_LABELS,
  ReadmissionCauseSchema,
  SEX_LABELS,
  SMOKING_STATUS_LABELS,
  SexSchema,
  SmokingStatusSchema,
  URGENCY_LABELS,
  UrgencySchema,
} from '../clinical/codes.js';
import { IsoDateSchema } from '../clinical/dates.js';
import { quantityMeasurementSchema } from '../clinical/units.js';
import { described } from './meta.js';
import { freeText, ReasonSchema } from './text.js';

const CANET = 'Canet J et al., Anesthesiology 2010;113:1338-50 (ARISCAT)';
const COMMON = 'common practice (no source)';

const date = (label: string, section: 'patient' | 'operation' | 'follow-up', definition: string) =>
  described(IsoDateSchema.refine((d) => d >= '2000-01-01', 'the date is before 2000-01-01; check the year'), { label, section, unit: 'date (YYYY-MM-DD)', definition, source: COMMON });
const yesNo = (label: string, section: 'patient' | 'operation' | 'therapy' | 'outcomes' | 'follow-up', definition: string, source = COMMON) =>
  described(z.boolean({ error: 'answer yes or no' }), { label, section, definition, source, exportable: true });
const whole = (min: number, max: number, unit: string) =>
  z.number({ error: 'enter a number' }).int('enter a whole number').min(min, `must be at least ${min} ${unit}`).max(max, `must be at most ${max} ${unit}`);

/** Each editable case field with its dictionary metadata. */
export const CASE_FIELDS = {
  // --- Patient (and surveillance population) ---
  eligible: yesNo('Eligible for surveillance', 'patient', "Meets the site's inclusion criteria and none of its exclusion criteria."),
  exclusionReason: described(freeText(200), { label: 'Reason excluded', section: 'patient', definition: 'Which exclusion criterion applies (when not eligible).', freeText: true }),
  admissionDate: date('Admission date', 'patient', 'Calendar day of hospital admission for this operation.'),
  age: described(whole(0, 120, 'years'), { label: 'Age', section: 'patient', unit: 'years', definition: 'Age in whole years on the day of surgery.', source: CANET }),
  sex: described(SexSchema, { exportable: true, label: 'Sex', section: 'patient', definition: 'Sex as recorded (used for predicted body weight).', valueLabels: SEX_LABELS }),
  heightCm: described(z.number({ error: 'enter a number' }).min(50, 'must be at least 50 cm').max(250, 'must be at most 250 cm'), { exportable: true, label: 'Height', section: 'patient', unit: 'cm', definition: 'Measured or stated height.' }),
  weightKg: described(z.number({ error: 'enter a number' }).min(2, 'must be at least 2 kg').max(400, 'must be at most 400 kg'), { exportable: true, label: 'Weight', section: 'patient', unit: 'kg', definition: 'Weight before surgery.' }),
  asaClass: described(AsaClassSchema, { exportable: true, label: 'ASA physical status', section: 'patient', definition: 'ASA physical status class I–VI.', source: 'American Society of Anesthesiologists, ASA Physical Status Classification System', valueLabels: ASA_CLASS_LABELS }),
  asaEmergency: yesNo('ASA E modifier', 'patient', 'The ASA class carries the E (emergency) modifier; ARISCAT takes emergency from urgency alone.', 'American Society of Anesthesiologists, ASA Physical Status Classification System'),
  smokingStatus: described(SmokingStatusSchema, { exportable: true, label: 'Smoking status', section: 'patient', definition: 'Tobacco smoking before admission.', valueLabels: SMOKING_STATUS_LABELS }),
  copd: yesNo('COPD', 'patient', 'Chronic obstructive pulmonary disease recorded before surgery.'),
  obstructiveSleepApnoea: yesNo('Obstructive sleep apnoea', 'patient', 'Known obstructive sleep apnoea (home CPAP for it is this risk factor, not lung-expansion therapy).'),
  heartFailure: yesNo('Heart failure', 'patient', 'Heart failure recorded before surgery.'),
  preopSpO2: described(whole(50, 100, '%'), { exportable: true, label: 'Pre-operative SpO2 on room air', section: 'patient', unit: '%', definition: 'Oxygen saturation by pulse oximetry, sitting, breathing room air, before surgery.', source: CANET }),
  preopHaemoglobin: described(quantityMeasurementSchema('haemoglobin'), { exportable: true, label: 'Pre-operative haemoglobin', section: 'patient', unit: 'g/dL', enteredUnits: ['g/dL', 'g/L'], definition: 'Last haemoglobin before surgery; stored in g/dL (ARISCAT anaemia: 10 g/dL or less).', source: CANET }),
  respiratoryInfectionLastMonth: yesNo('Respiratory infection in the last month', 'patient', 'Upper or lower respiratory infection treated with antibiotics, or with fever, in the month before surgery.', CANET),
  functionalStatus: described(FunctionalStatusSchema, { exportable: true, label: 'Functional status', section: 'patient', definition: 'Dependence on others for activities of daily living before admission.', valueLabels: FUNCTIONAL_STATUS_LABELS }),
  // --- Operation ---
  surgeryDate: date('Surgery date', 'operation', 'Calendar day of the operation (post-operative day 0); the case belongs to this month.'),
  unitId: described(z.uuid('choose a unit of the site'), { label: 'Unit', section: 'operation', definition: 'Ward or unit the patient went to after surgery (one of the site\u2019s units).' }),
  procedureCategory: described(ProcedureCategorySchema, { exportable: true, label: 'Procedure category', section: 'operation', definition: 'Category of the main procedure (Alveolog\u2019s own list).', valueLabels: PROCEDURE_CATEGORY_LABELS }),
  incisionSite: described(IncisionSiteSchema, { exportable: true, label: 'Incision site', section: 'operation', definition: 'Site of the surgical incision; each maps to one ARISCAT incision class.', source: CANET, valueLabels: INCISION_SITE_LABELS }),
  approach: described(ApproachSchema, { exportable: true, label: 'Approach', section: 'operation', definition: 'Open, laparoscopic/thoracoscopic or robot-assisted.', valueLabels: APPROACH_LABELS }),
  urgency: described(UrgencySchema, { exportable: true, label: 'Urgency', section: 'operation', definition: 'Elective or emergency; ARISCAT\u2019s emergency factor comes from this field.', source: CANET, valueLabels: URGENCY_LABELS }),
  anaesthesia: described(AnaesthesiaSchema, { exportable: true, label: 'Anaesthesia', section: 'operation', definition: 'General or regional anaesthesia.', valueLabels: ANAESTHESIA_LABELS }),
  durationMinutes: described(whole(1, 2880, 'min'), { exportable: true, label: 'Duration of surgery', section: 'operation', unit: 'min', definition: 'From incision to closure, in minutes.', source: CANET }),
  // --- Therapy and outcomes (case-level answers; episodes and events are their own records) ---
  therapyGiven: yesNo('Lung-expansion therapy given', 'therapy', 'Any lung-expansion therapy episode after surgery (record each as an episode).'),
  complicationsReviewed: yesNo('Pulmonary complications reviewed', 'outcomes', 'The record was reviewed for post-operative pulmonary complications up to discharge or day 30; each one is recorded as an event.'),
  // --- Follow-up ---
  dischargeDate: date('Discharge date', 'follow-up', 'Calendar day of discharge from hospital (or of death in hospital).'),
  icuDays: described(whole(0, 365, 'days'), { exportable: true, label: 'ICU days', section: 'follow-up', unit: 'days', definition: 'Calendar days in intensive care after surgery.' }),
  ventilatorDays: described(whole(0, 365, 'days'), { exportable: true, label: 'Ventilator days', section: 'follow-up', unit: 'days', definition: 'Calendar days on invasive mechanical ventilation after surgery.' }),
  readmitted30d: yesNo('Readmitted within 30 days', 'follow-up', 'Readmitted to hospital within 30 days of surgery.'),
  readmissionCause: described(ReadmissionCauseSchema, { exportable: true, label: 'Cause of readmission', section: 'follow-up', definition: 'Main cause of the readmission.', valueLabels: READMISSION_CAUSE_LABELS }),
  died30d: yesNo('Died within 30 days', 'follow-up', 'Death from any cause within 30 days of surgery.'),
  deathDate: date('Date of death', 'follow-up', 'Calendar day of death (within 30 days of surgery).'),
  followUpCompletedOn: date('30-day follow-up done on', 'follow-up', 'Day the 30-day follow-up (readmission and vital status) was completed.'),
  notes: described(freeText(500), { label: 'Notes', section: 'registry', definition: 'Short abstraction notes.', freeText: true }),
} as const;

export type CaseFieldName = keyof typeof CASE_FIELDS;
export const CASE_FIELD_NAMES = Object.keys(CASE_FIELDS) as CaseFieldName[];

type Nullable<T extends Record<string, z.ZodType>> = { [K in keyof T]: z.ZodOptional<z.ZodNullable<T[K]>> };
const nullableShape = Object.fromEntries(
  Object.entries(CASE_FIELDS).map(([k, s]) => [k, (s as z.ZodType).nullable().optional()]),
) as Nullable<typeof CASE_FIELDS>;

/** The editable fields, each optional and nullable (a draft may leave anything empty). */
export const CaseFieldsSchema = z.strictObject(nullableShape);
export type CaseFields = z.infer<typeof CaseFieldsSchema>;

/** The hospital's own identifier, typed only to detect duplicates: hashed by the server, never stored or echoed. */
export const LocalIdentifierSchema = z
  .string({ error: 'enter the identifier as text' })
  .trim()
  .min(1, 'leave it empty or enter the identifier')
  .max(64, 'the identifier is at most 64 characters');

/** A case's editable values in stored units (haemoglobin already in g/dL). */
export interface CaseValues extends Omit<CaseFields, 'preopHaemoglobin'> {
  preopHaemoglobinGdl?: number | null;
}

export interface Contradiction { path: string; message: string }

const after = (a: string | null | undefined, b: string | null | undefined) => !!a && !!b && a > b;

/**
 * Contradictions between fields of one case (each is a 400 naming its field). Takes the
 * fields after merging an update into the stored case, so a change to one date is checked
 * against the others already stored.
 */
export function caseContradictions(c: Partial<CaseFields>): Contradiction[] {
  const out: Contradiction[] = [];
  if (after(c.admissionDate, c.surgeryDate)) out.push({ path: 'admissionDate', message: 'the admission date is after the surgery date; check both dates' });
  if (after(c.surgeryDate, c.dischargeDate)) out.push({ path: 'dischargeDate', message: 'the discharge date is before the surgery date; check both dates' });
  if (after(c.admissionDate, c.dischargeDate) && !after(c.surgeryDate, c.dischargeDate)) out.push({ path: 'dischargeDate', message: 'the discharge date is before the admission date; check both dates' });
  if (after(c.surgeryDate, c.deathDate)) out.push({ path: 'deathDate', message: 'the date of death is before the surgery date; check both dates' });
  if (after(c.dischargeDate, c.deathDate)) out.push({ path: 'dischargeDate', message: 'the discharge date is after the date of death; check both dates' });
  if (c.deathDate && c.died30d === false) out.push({ path: 'deathDate', message: 'a date of death is entered but "died within 30 days" is no; correct one of them' });
  if (c.deathDate && c.surgeryDate && daysFrom(c.surgeryDate, c.deathDate) > 30) out.push({ path: 'deathDate', message: 'the date of death is more than 30 days after surgery; record deaths within the 30-day window only' });
  if (c.readmissionCause && c.readmitted30d === false) out.push({ path: 'readmissionCause', message: 'a readmission cause is entered but "readmitted within 30 days" is no; correct one of them' });
  if (c.exclusionReason && c.eligible === true) out.push({ path: 'exclusionReason', message: 'a reason for exclusion is entered but the case is eligible; clear the reason or mark the case not eligible' });
  if (c.asaClass === 'VI' && c.asaEmergency === true) out.push({ path: 'asaEmergency', message: 'ASA VI takes no E modifier; clear the E modifier or correct the ASA class' });
  const stay = c.surgeryDate && c.dischargeDate && c.dischargeDate >= c.surgeryDate ? daysFrom(c.surgeryDate, c.dischargeDate) : null;
  if (stay != null && c.icuDays != null && c.icuDays > stay + 1) out.push({ path: 'icuDays', message: `ICU days (${c.icuDays}) exceed the post-operative stay (${stay} days); check both` });
  if (c.followUpCompletedOn && c.surgeryDate && c.followUpCompletedOn < c.surgeryDate) out.push({ path: 'followUpCompletedOn', message: 'the follow-up date is before the surgery date; check both dates' });
  else if (c.followUpCompletedOn && c.surgeryDate && c.died30d !== true && daysFrom(c.surgeryDate, c.followUpCompletedOn) < 30) {
    out.push({ path: 'followUpCompletedOn', message: 'the 30-day follow-up can be completed from post-operative day 30 on (or once the patient has died); check the date' });
  }
  return out;
}

function daysFrom(a: string, b: string): number {
  return Math.round((Date.parse(`${b}T00:00:00Z`) - Date.parse(`${a}T00:00:00Z`)) / 86_400_000);
}

function refineContradictions(c: Partial<CaseFields>, ctx: z.RefinementCtx) {
  for (const x of caseContradictions(c)) ctx.addIssue({ code: 'custom', path: x.path.split('.'), message: x.message });
}

/** POST /api/cases: site and surgery date are needed to number the case; the rest may follow. */
export const CaseCreateSchema = CaseFieldsSchema.extend({
  siteId: z.uuid('choose the site'),
  surgeryDate: CASE_FIELDS.surgeryDate,
  localIdentifier: LocalIdentifierSchema.optional(),
  /** Save even though the same patient already has a case on this surgery date. */
  acknowledgeDuplicate: z.boolean().optional(),
}).superRefine(refineContradictions);
export type CaseCreate = z.infer<typeof CaseCreateSchema>;

/**
 * PATCH /api/cases/:id: the version read (optimistic concurrency), the changed fields, and
 * for a locked case the amendment reason. Contradictions are checked after merging.
 */
export const CaseUpdateSchema = CaseFieldsSchema.extend({
  version: z.number({ error: 'send the version you read' }).int().min(1),
  localIdentifier: LocalIdentifierSchema.nullable().optional(),
  acknowledgeDuplicate: z.boolean().optional(),
  amendmentReason: ReasonSchema.optional(),
});
export type CaseUpdate = z.infer<typeof CaseUpdateSchema>;

/** The form's own schema (client side): the create body without the identifier flags. */
export const CaseFormSchema = CaseFieldsSchema.superRefine(refineContradictions);
