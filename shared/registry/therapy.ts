/**
 * Lung-expansion therapy episodes (many per case). Which settings apply to a modality, and
 * their usual and possible ranges, are in shared/clinical/modalities.ts; the server applies
 * them with `checkTherapyEpisode` (analysis/clinical) on top of this schema. Surveillance and
 * quality improvement only: local protocol and the clinician's judgement decide the settings.
 */
import { z } from 'zod';
import {
  SOURCE_GAS_LABELS,
  SourceGasSchema,
  THERAPY_INTERFACE_LABELS,
  THERAPY_MODALITY_LABELS,
  TherapyInterfaceSchema,
  TherapyModalitySchema,
} from '../clinical/codes.js';
import { THERAPY_SOURCES } from '../clinical/modalities.js';
import { described } from './meta.js';
import { freeText, ReasonSchema } from './text.js';

export const ToleranceSchema = z.enum(['good', 'fair', 'poor', 'not-tolerated']);
export type Tolerance = z.infer<typeof ToleranceSchema>;
export const TOLERANCE_LABELS: Record<Tolerance, string> = {
  good: 'Good',
  fair: 'Fair (needed coaching or breaks)',
  poor: 'Poor (sessions cut short)',
  'not-tolerated': 'Not tolerated',
};

export const TherapyAdverseEventSchema = z.enum([
  'none',
  'dizziness-or-hyperventilation',
  'discomfort-or-pain',
  'nausea-or-vomiting',
  'desaturation',
  'haemodynamic-instability',
  'suspected-barotrauma',
  'fatigue',
  'other',
]);
export type TherapyAdverseEvent = z.infer<typeof TherapyAdverseEventSchema>;
export const THERAPY_ADVERSE_EVENT_LABELS: Record<TherapyAdverseEvent, string> = {
  none: 'None',
  'dizziness-or-hyperventilation': 'Dizziness or hyperventilation',
  'discomfort-or-pain': 'Discomfort or pain',
  'nausea-or-vomiting': 'Nausea or vomiting',
  desaturation: 'Desaturation',
  'haemodynamic-instability': 'Haemodynamic instability',
  'suspected-barotrauma': 'Suspected barotrauma',
  fatigue: 'Fatigue',
  other: 'Other',
};

export const TherapyStopReasonSchema = z.enum([
  'course-completed',
  'discharged',
  'changed-modality',
  'no-longer-indicated',
  'not-tolerated',
  'declined',
  'complication',
  'died',
  'other',
]);
export type TherapyStopReason = z.infer<typeof TherapyStopReasonSchema>;
export const THERAPY_STOP_REASON_LABELS: Record<TherapyStopReason, string> = {
  'course-completed': 'Course completed',
  discharged: 'Discharged',
  'changed-modality': 'Changed to another modality',
  'no-longer-indicated': 'No longer indicated',
  'not-tolerated': 'Not tolerated',
  declined: 'Declined by the patient',
  complication: 'Complication',
  died: 'Died',
  other: 'Other',
};

const S = THERAPY_SOURCES;
const num = (label: string, unit: string, definition: string, source: string = S.commonPractice) =>
  described(z.number({ error: 'enter a number' }).finite('enter a finite number').min(0, 'cannot be negative'), { label, section: 'therapy', unit, definition, source, exportable: true });
const count = (label: string, definition: string) =>
  described(z.number({ error: 'enter a number' }).int('enter a whole number').min(0, 'cannot be negative').max(1000, 'must be at most 1000'), { label, section: 'therapy', unit: 'sessions', definition, source: S.commonPractice, exportable: true });
const yesNo = (label: string, definition: string) => described(z.boolean({ error: 'answer yes or no' }), { label, section: 'therapy', definition, source: S.commonPractice, exportable: true });
const day = (label: string, definition: string) =>
  described(z.number({ error: 'enter the post-operative day' }).int('enter a whole number').min(0, 'therapy after surgery starts on day 0 or later').max(365, 'must be at most day 365'), { label, section: 'therapy', unit: 'post-operative day', definition, source: S.commonPractice, exportable: true });

/** Each episode field with its dictionary metadata. */
export const THERAPY_FIELDS = {
  modality: described(TherapyModalitySchema, { exportable: true, label: 'Modality', section: 'therapy', definition: 'Lung-expansion therapy given (CPAP for sleep apnoea is a risk factor, not an episode).', source: S.aarcPap1993, valueLabels: THERAPY_MODALITY_LABELS }),
  startPostoperativeDay: day('Post-operative day started', 'Day of the first session (0 = day of surgery).'),
  endPostoperativeDay: day('Post-operative day of the last session', 'Day of the last session, when the episode has ended.'),
  prescribedSessionsPerDay: described(z.number({ error: 'enter a number' }).int('enter a whole number').min(1, 'at least 1 a day').max(48, 'at most 48 a day'), { exportable: true, label: 'Prescribed frequency', section: 'therapy', unit: 'sessions/day', definition: 'Sessions a day as prescribed.', source: S.commonPractice }),
  sessionsPrescribed: count('Sessions prescribed', 'Sessions prescribed over the whole episode.'),
  sessionsDelivered: count('Sessions delivered', 'Sessions documented as given; adherence = delivered / prescribed.'),
  deliveredAbovePrescribedReason: described(freeText(200), { label: 'Why more sessions than prescribed', section: 'therapy', definition: 'Needed when more sessions were delivered than prescribed.', freeText: true }),
  sessionMinutes: num('Length of one session', 'min', 'Typical length of one session; therapy is given intermittently.'),
  interface: described(TherapyInterfaceSchema, { exportable: true, label: 'Interface', section: 'therapy', definition: 'Mouthpiece or mask.', valueLabels: THERAPY_INTERFACE_LABELS }),
  noseClip: yesNo('Nose clip', 'A nose clip was used with a mouthpiece.'),
  aerosolMedication: yesNo('Aerosol medication given with it', 'Nebulised medication delivered through the same circuit.'),
  sourceGas: described(SourceGasSchema, { exportable: true, label: 'Source gas', section: 'therapy', definition: 'Gas driving the device.', valueLabels: SOURCE_GAS_LABELS }),
  flowLpm: num('Flowmeter setting', 'L/min', 'Flowmeter setting feeding the device (hospital flowmeters read 0–15 L/min).'),
  expiratoryPressureCmH2O: num('Expiratory pressure reached', 'cm H2O', 'Expiratory pressure reached during the session.', S.aarcPap1993),
  volumeTargetMl: num('Volume target', 'mL', 'Incentive spirometry volume target.', S.aarcIs2011),
  inspiratoryCapacityMl: num('Inspiratory capacity (measured)', 'mL', 'Measured inspiratory capacity; under 10 mL/kg of predicted body weight incentive spirometry alone is likely inadequate.', S.aarcIs1991),
  vitalCapacityMl: num('Vital capacity (measured)', 'mL', 'Measured vital capacity (under about 10 mL/kg: consider a positive-pressure therapy).', S.aarcIs1991),
  predictedBodyWeightKg: num('Predicted body weight used', 'kg', 'Predicted body weight from height and sex (ARDS Network formula).', 'ARDS Network, N Engl J Med 2000;342:1301-8'),
  tolerance: described(ToleranceSchema, { exportable: true, label: 'Tolerance', section: 'therapy', definition: 'How well the sessions were tolerated.', valueLabels: TOLERANCE_LABELS }),
  adverseEvents: described(z.array(TherapyAdverseEventSchema).max(9), { exportable: true, label: 'Adverse events', section: 'therapy', definition: 'Adverse events during sessions ("none" when none).', valueLabels: THERAPY_ADVERSE_EVENT_LABELS }),
  adverseEventNote: described(freeText(200), { label: 'Adverse event note', section: 'therapy', definition: 'Short description when "other".', freeText: true }),
  stopReason: described(TherapyStopReasonSchema, { exportable: true, label: 'Reason stopped', section: 'therapy', definition: 'Why the episode ended (empty while it continues).', valueLabels: THERAPY_STOP_REASON_LABELS }),
} as const;

export type TherapyFieldName = keyof typeof THERAPY_FIELDS;

const optionalShape = Object.fromEntries(
  Object.entries(THERAPY_FIELDS).map(([k, s]) => [k, k === 'modality' ? s : (s as z.ZodType).nullable().optional()]),
) as { modality: typeof THERAPY_FIELDS.modality } & { [K in Exclude<TherapyFieldName, 'modality'>]: z.ZodOptional<z.ZodNullable<(typeof THERAPY_FIELDS)[K]>> };

export const TherapyEpisodeFieldsSchema = z.strictObject(optionalShape);
export type TherapyEpisodeFields = z.infer<typeof TherapyEpisodeFieldsSchema>;

/** Contradictions inside one episode (after merging an update). */
export function therapyContradictions(e: Partial<TherapyEpisodeFields>): { path: string; message: string }[] {
  const out: { path: string; message: string }[] = [];
  if (e.sessionsDelivered != null && e.sessionsPrescribed != null && e.sessionsDelivered > e.sessionsPrescribed && !e.deliveredAbovePrescribedReason) {
    out.push({ path: 'deliveredAbovePrescribedReason', message: `more sessions were delivered (${e.sessionsDelivered}) than prescribed (${e.sessionsPrescribed}); give the reason or correct the counts` });
  }
  if (e.endPostoperativeDay != null && e.startPostoperativeDay != null && e.endPostoperativeDay < e.startPostoperativeDay) {
    out.push({ path: 'endPostoperativeDay', message: 'the last session is before the first; check both days' });
  }
  if (e.adverseEvents && e.adverseEvents.includes('none') && e.adverseEvents.length > 1) {
    out.push({ path: 'adverseEvents', message: '"None" cannot be combined with adverse events' });
  }
  if (e.adverseEvents && new Set(e.adverseEvents).size !== e.adverseEvents.length) out.push({ path: 'adverseEvents', message: 'an adverse event is listed twice' });
  if (e.stopReason === 'not-tolerated' && e.tolerance && e.tolerance !== 'not-tolerated' && e.tolerance !== 'poor') {
    out.push({ path: 'tolerance', message: 'the episode stopped as not tolerated, but tolerance is recorded as fair or good; correct one of them' });
  }
  return out;
}

function refine(e: Partial<TherapyEpisodeFields>, ctx: z.RefinementCtx) {
  for (const x of therapyContradictions(e)) ctx.addIssue({ code: 'custom', path: [x.path], message: x.message });
}

/** The episode part of the form (client side). */
export const TherapyEpisodeFormSchema = TherapyEpisodeFieldsSchema.superRefine(refine);

/** POST /api/cases/:id/therapy. `caseVersion` is the case version read (any change raises it). */
export const TherapyEpisodeCreateSchema = TherapyEpisodeFieldsSchema.extend({
  caseVersion: z.number({ error: 'send the case version you read' }).int().min(1),
  amendmentReason: ReasonSchema.optional(),
}).superRefine(refine);
export type TherapyEpisodeCreate = z.infer<typeof TherapyEpisodeCreateSchema>;

/** PATCH /api/cases/:id/therapy/:episodeId: changed fields only; checked after merging. */
export const TherapyEpisodeUpdateSchema = TherapyEpisodeFieldsSchema.partial().extend({
  caseVersion: z.number({ error: 'send the case version you read' }).int().min(1),
  amendmentReason: ReasonSchema.optional(),
});
export type TherapyEpisodeUpdate = z.infer<typeof TherapyEpisodeUpdateSchema>;

/** DELETE /api/cases/:id/therapy/:episodeId and outcome removal: nothing is hard-deleted. */
export const RecordRemoveSchema = z.strictObject({
  caseVersion: z.number({ error: 'send the case version you read' }).int().min(1),
  reason: ReasonSchema,
});
export type RecordRemove = z.infer<typeof RecordRemoveSchema>;

export const TherapyEpisodeSchema = TherapyEpisodeFieldsSchema.extend({
  id: z.uuid(),
  caseId: z.uuid(),
  /** Sessions delivered / prescribed, or null when either is missing or nothing was prescribed. */
  adherence: z.number().nullable(),
  /** Range and indication warnings (each carries the clinical caution). */
  warnings: z.array(z.object({ path: z.string(), message: z.string() })),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type TherapyEpisode = z.infer<typeof TherapyEpisodeSchema>;
