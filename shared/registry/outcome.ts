/**
 * Outcome events: one post-operative pulmonary complication each, with its evidence entered as
 * dated observations (shared/clinical/observations.ts), never as ticked conclusions. The server
 * evaluates the published definitions over the observations and stores each result with the
 * definition's name and version; a later version can be re-applied as a reviewed list of
 * differences (`ReevaluationQuerySchema`, `ReevaluationApplySchema`).
 */
import { z } from 'zod';
import { CLAVIEN_DINDO_LABELS, ClavienDindoGradeSchema, PPC_EVENT_TYPE_LABELS, PpcEventTypeSchema } from '../clinical/codes.js';
import { ObservationListSchema } from '../clinical/observations.js';
import { described } from './meta.js';
import { freeText, ReasonSchema } from './text.js';

const DINDO = 'Dindo D, Demartines N, Clavien PA, Ann Surg 2004;240:205-13';
const EPCO = 'Jammer I et al., Eur J Anaesthesiol 2015;32:88-105 (EPCO)';

/** Each event field with its dictionary metadata. */
export const OUTCOME_FIELDS = {
  type: described(PpcEventTypeSchema, { exportable: true, label: 'Complication', section: 'outcomes', definition: 'Type of post-operative pulmonary complication (reintubation and ARDS are outside the "any PPC" composite).', source: EPCO, valueLabels: PPC_EVENT_TYPE_LABELS }),
  onsetPostoperativeDay: described(
    z.number({ error: 'enter the post-operative day of onset' }).int('enter a whole number').min(0, 'the onset cannot be before surgery (day 0); a complication before surgery is not post-operative').max(30, 'the onset is after day 30, outside the 30-day follow-up window'),
    { exportable: true, label: 'Onset', section: 'outcomes', unit: 'post-operative day', definition: 'Post-operative day the complication began (0 = day of surgery).', source: 'common practice (no source)' },
  ),
  clavienDindo: described(ClavienDindoGradeSchema, { exportable: true, label: 'Severity (Clavien–Dindo)', section: 'outcomes', definition: 'Clavien–Dindo grade of the complication.', source: DINDO, valueLabels: CLAVIEN_DINDO_LABELS }),
  clavienDindoDisability: described(z.boolean({ error: 'answer yes or no' }), { exportable: true, label: 'Disability at discharge ("d")', section: 'outcomes', definition: 'The complication left a disability at discharge (Clavien–Dindo suffix d).', source: DINDO }),
  observations: described(ObservationListSchema, { label: 'Evidence (observations)', section: 'outcomes', definition: 'Dated observations: chest images and findings, maximum temperature, white-cell counts, PaO2/FiO2 or SpO2, sputum, cough, auscultation, mental status; values in their units.', source: 'CDC NHSN Patient Safety Component Manual 2022, ch. 6; ' + EPCO }),
  notes: described(freeText(300), { label: 'Event notes', section: 'outcomes', definition: 'Short notes on the event.', freeText: true }),
} as const;

export const OutcomeEventFieldsSchema = z.strictObject({
  type: OUTCOME_FIELDS.type,
  onsetPostoperativeDay: OUTCOME_FIELDS.onsetPostoperativeDay,
  clavienDindo: OUTCOME_FIELDS.clavienDindo.nullable().optional(),
  clavienDindoDisability: OUTCOME_FIELDS.clavienDindoDisability.nullable().optional(),
  observations: OUTCOME_FIELDS.observations.default([]),
  notes: OUTCOME_FIELDS.notes.nullable().optional(),
});
export type OutcomeEventFields = z.infer<typeof OutcomeEventFieldsSchema>;

/** Contradictions inside one event. */
export function outcomeContradictions(e: Partial<OutcomeEventFields>): { path: string; message: string }[] {
  const out: { path: string; message: string }[] = [];
  if (e.clavienDindo === 'V' && e.clavienDindoDisability) out.push({ path: 'clavienDindoDisability', message: 'grade V (death) takes no disability suffix' });
  return out;
}

function refine(e: Partial<OutcomeEventFields>, ctx: z.RefinementCtx) {
  for (const x of outcomeContradictions(e)) ctx.addIssue({ code: 'custom', path: x.path.split('.').map((p) => (/^\d+$/.test(p) ? Number(p) : p)), message: x.message });
}

export const OutcomeEventFormSchema = OutcomeEventFieldsSchema.superRefine(refine);

/** POST /api/cases/:id/outcomes. */
export const OutcomeEventCreateSchema = OutcomeEventFieldsSchema.extend({
  caseVersion: z.number({ error: 'send the case version you read' }).int().min(1),
  amendmentReason: ReasonSchema.optional(),
}).superRefine(refine);
export type OutcomeEventCreate = z.infer<typeof OutcomeEventCreateSchema>;

/** PATCH /api/cases/:id/outcomes/:eventId (observations, when sent, replace the list). */
export const OutcomeEventUpdateSchema = z
  .strictObject({
    type: OUTCOME_FIELDS.type.optional(),
    onsetPostoperativeDay: OUTCOME_FIELDS.onsetPostoperativeDay.optional(),
    clavienDindo: OUTCOME_FIELDS.clavienDindo.nullable().optional(),
    clavienDindoDisability: OUTCOME_FIELDS.clavienDindoDisability.nullable().optional(),
    observations: OUTCOME_FIELDS.observations.optional(),
    notes: OUTCOME_FIELDS.notes.nullable().optional(),
    caseVersion: z.number({ error: 'send the case version you read' }).int().min(1),
    amendmentReason: ReasonSchema.optional(),
  })
  .superRefine(refine);
export type OutcomeEventUpdate = z.infer<typeof OutcomeEventUpdateSchema>;

/** The definitions Alveolog evaluates on outcome events. */
export const DefinitionIdSchema = z.enum(['nhsn-pnu1', 'epco', 'melbourne']);
export type DefinitionId = z.infer<typeof DefinitionIdSchema>;
export const DEFINITION_LABELS: Record<DefinitionId, string> = {
  'nhsn-pnu1': 'CDC/NHSN clinically defined pneumonia (PNU1)',
  epco: 'European Perioperative Clinical Outcome (EPCO) definitions',
  melbourne: 'Melbourne Group Scale',
};

/** One definition's stored result on an event: which definition, which version, and the result. */
export const DefinitionEvaluationSchema = z.object({
  definition: DefinitionIdSchema,
  name: z.string(),
  version: z.string(),
  source: z.string(),
  /** The definition is met on this event's evidence. */
  met: z.boolean(),
  /** The definition's own result (criteria met, missing and why). */
  result: z.unknown(),
  /** Why it could not be evaluated (e.g. the case has no admission date yet). */
  error: z.string().nullable(),
  evaluatedAt: z.string(),
});
export type DefinitionEvaluation = z.infer<typeof DefinitionEvaluationSchema>;

export const OutcomeEventSchema = z.object({
  id: z.uuid(),
  caseId: z.uuid(),
  type: PpcEventTypeSchema,
  onsetPostoperativeDay: z.number(),
  clavienDindo: ClavienDindoGradeSchema.nullable(),
  clavienDindoDisability: z.boolean().nullable(),
  observations: z.array(z.unknown()),
  notes: z.string().nullable(),
  /** The definition the event is judged under (PNU1 for respiratory infection, EPCO otherwise) and its version. */
  definition: DefinitionIdSchema,
  definitionVersion: z.string(),
  evaluations: z.array(DefinitionEvaluationSchema),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type OutcomeEvent = z.infer<typeof OutcomeEventSchema>;

/** GET /api/outcomes/reevaluation: which events' stored results differ under the current definitions. */
export const ReevaluationQuerySchema = z.strictObject({
  definition: DefinitionIdSchema,
  siteId: z.uuid().optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});

/** POST /api/outcomes/reevaluation: apply the current definition to the reviewed events. */
export const ReevaluationApplySchema = z.strictObject({
  definition: DefinitionIdSchema,
  eventIds: z.array(z.uuid()).min(1, 'choose at least one event').max(500),
  reason: ReasonSchema,
});

export const RemoveRecordReasonSchema = ReasonSchema;
