/**
 * Outcome evidence as observations: each finding with its value, unit and date, never a ticked
 * conclusion. The definitions in `analysis/clinical/` (CDC/NHSN PNU1, EPCO, Melbourne Group
 * Scale) derive which criteria are met from these and their dates.
 *
 * Every observation has an `id` (so results can cite it) and a `date` (ISO calendar date) or a
 * `postoperativeDay` (0 = day of surgery), or both; the analysis turns a post-operative day
 * into a date from the surgery date and rejects the two when they disagree.
 */
import { z } from 'zod';
import { PpcEventTypeSchema } from './codes.js';
import { IsoDateSchema, PostoperativeDaySchema } from './dates.js';
import { QUANTITIES, UNIT_LABELS, toStoredUnit, type MeasuredQuantity, type MeasurementUnit } from './units.js';

// --- Code lists used inside observations --------------------------------------------------------

export const ImagingModalitySchema = z.enum(['radiograph', 'ct', 'ultrasound']);
export type ImagingModality = z.infer<typeof ImagingModalitySchema>;
export const IMAGING_MODALITY_LABELS: Record<ImagingModality, string> = {
  radiograph: 'Chest radiograph',
  ct: 'Chest CT',
  ultrasound: 'Lung ultrasound',
};

/** What a chest image shows. `collapse-with-shift` is the EPCO atelectasis picture. */
export const ImagingFindingTypeSchema = z.enum([
  'infiltrate',
  'consolidation',
  'cavitation',
  'collapse-with-shift',
  'collapse',
  'effusion',
  'pneumothorax',
  'none',
]);
export type ImagingFindingType = z.infer<typeof ImagingFindingTypeSchema>;
export const IMAGING_FINDING_TYPE_LABELS: Record<ImagingFindingType, string> = {
  infiltrate: 'Infiltrate',
  consolidation: 'Consolidation',
  cavitation: 'Cavitation',
  'collapse-with-shift':
    'Collapse: opacification with shift of mediastinum, hilum or hemidiaphragm toward it and compensatory over-inflation',
  collapse: 'Collapse or atelectasis (without those signs)',
  effusion: 'Pleural effusion',
  pneumothorax: 'Pneumothorax',
  none: 'No abnormality',
};

/** Course of a finding compared with earlier images. */
export const ImagingCourseSchema = z.enum(['new', 'progressive', 'persistent']);
export type ImagingCourse = z.infer<typeof ImagingCourseSchema>;
export const IMAGING_COURSE_LABELS: Record<ImagingCourse, string> = {
  new: 'New',
  progressive: 'Progressive',
  persistent: 'Persistent',
};

export const ChestImagingFindingSchema = z.object({
  type: ImagingFindingTypeSchema,
  course: ImagingCourseSchema.optional(),
});
export type ChestImagingFinding = z.infer<typeof ChestImagingFindingSchema>;

export const BreathingSchema = z.enum(['room-air', 'supplemental-oxygen']);
export type Breathing = z.infer<typeof BreathingSchema>;

export const OxygenSupportChangeSchema = z.enum(['started', 'increased', 'ventilator-demand-increased']);
export type OxygenSupportChange = z.infer<typeof OxygenSupportChangeSchema>;

export const SputumColourSchema = z.enum(['clear', 'white', 'yellow', 'green', 'brown', 'blood-stained']);
export type SputumColour = z.infer<typeof SputumColourSchema>;

export const RespiratorySignSchema = z.enum(['cough', 'dyspnoea', 'tachypnoea']);
export type RespiratorySign = z.infer<typeof RespiratorySignSchema>;

export const AuscultationFindingSchema = z.enum([
  'normal',
  'rales',
  'bronchial-breath-sounds',
  'wheeze',
  'reduced-breath-sounds',
  'other-abnormal',
]);
export type AuscultationFinding = z.infer<typeof AuscultationFindingSchema>;

export const AntibioticIndicationSchema = z.enum(['suspected-respiratory-infection', 'other-infection', 'prophylaxis']);
export type AntibioticIndication = z.infer<typeof AntibioticIndicationSchema>;

/** How inhalation of gastric contents is known. */
export const AspirationEvidenceSchema = z.enum(['witnessed', 'suctioned-from-airway', 'suspected']);
export type AspirationEvidence = z.infer<typeof AspirationEvidenceSchema>;

// --- Observation schemas ------------------------------------------------------------------------

const base = {
  id: z.string().trim().min(1, 'each observation needs an id').max(64),
  date: IsoDateSchema.optional(),
  postoperativeDay: PostoperativeDaySchema.optional(),
};

/** `value` + `unit` for a measured quantity; the unit list comes from `units.ts`. */
function measured<Q extends MeasuredQuantity>(quantity: Q) {
  const accepted = QUANTITIES[quantity].accepted as [MeasurementUnit, ...MeasurementUnit[]];
  return {
    value: z.number({ error: 'enter a number' }).finite('enter a finite number'),
    unit: z.enum(accepted, { error: `use ${accepted.map((u) => UNIT_LABELS[u]).join(' or ')}` }),
  };
}

/** Rejects a value outside the quantity's possible range (checked in the stored unit). */
function inPossibleRange(quantity: MeasuredQuantity) {
  const spec = QUANTITIES[quantity];
  return (o: { value: number; unit: MeasurementUnit }, ctx: z.RefinementCtx) => {
    if (!Number.isFinite(o.value) || !spec.accepted.includes(o.unit)) return;
    const stored = toStoredUnit(quantity, o.value, o.unit);
    if (stored < spec.possible.min || stored > spec.possible.max) {
      ctx.addIssue({
        code: 'custom',
        path: ['value'],
        message: `${spec.label} ${o.value} ${UNIT_LABELS[o.unit]} is outside the possible range ${spec.possible.min}–${spec.possible.max} ${UNIT_LABELS[spec.stored]}; check the number and its unit`,
      });
    }
  };
}

export const ChestImagingObservationSchema = z
  .object({
    ...base,
    kind: z.literal('chest-imaging'),
    modality: ImagingModalitySchema,
    findings: z.array(ChestImagingFindingSchema).min(1, 'record at least one finding ("none" when normal)').max(10),
    /** The report is definitive (not "possible" or "cannot exclude"); NHSN accepts one such image in patients without underlying cardiac or pulmonary disease. */
    definitive: z.boolean().optional(),
  })
  .superRefine((o, ctx) => {
    if (o.findings.some((f) => f.type === 'none') && o.findings.length > 1) {
      ctx.addIssue({ code: 'custom', path: ['findings'], message: '"No abnormality" cannot be combined with other findings' });
    }
  });

export const TemperatureMaxObservationSchema = z
  .object({ ...base, kind: z.literal('temperature-max'), ...measured('temperature') })
  .superRefine(inPossibleRange('temperature'));

export const WbcObservationSchema = z
  .object({ ...base, kind: z.literal('wbc'), which: z.enum(['lowest', 'highest']), ...measured('wbc') })
  .superRefine(inPossibleRange('wbc'));

export const PfRatioObservationSchema = z
  .object({ ...base, kind: z.literal('pf-ratio'), ...measured('pf-ratio') })
  .superRefine(inPossibleRange('pf-ratio'));

export const Pao2ObservationSchema = z
  .object({ ...base, kind: z.literal('pao2'), ...measured('pao2'), breathing: BreathingSchema })
  .superRefine(inPossibleRange('pao2'));

export const Spo2ObservationSchema = z.object({
  ...base,
  kind: z.literal('spo2'),
  percent: z.number().min(50, 'SpO2 below 50% is not a usable reading').max(100, 'SpO2 cannot exceed 100%'),
  breathing: BreathingSchema,
});

export const SupplementalOxygenObservationSchema = z.object({
  ...base,
  kind: z.literal('supplemental-oxygen'),
  change: OxygenSupportChangeSchema,
});

export const SputumObservationSchema = z.object({
  ...base,
  kind: z.literal('sputum'),
  newPurulent: z.boolean(),
  changedCharacter: z.boolean(),
  increasedSecretionsOrSuctioning: z.boolean(),
  colour: SputumColourSchema.optional(),
});

export const RespiratorySignObservationSchema = z.object({
  ...base,
  kind: z.literal('respiratory-sign'),
  sign: RespiratorySignSchema,
  onset: z.enum(['new', 'worse']),
});

export const AuscultationObservationSchema = z.object({
  ...base,
  kind: z.literal('auscultation'),
  finding: AuscultationFindingSchema,
  /** Different from the pre-operative assessment. */
  newSinceBaseline: z.boolean(),
});

export const MentalStatusObservationSchema = z.object({
  ...base,
  kind: z.literal('mental-status'),
  altered: z.boolean(),
  otherRecognisedCause: z.boolean(),
});

export const SputumCultureObservationSchema = z.object({
  ...base,
  kind: z.literal('sputum-culture'),
  organismsGrown: z.boolean(),
  /** Organism name only (no identifiers). */
  organism: z.string().trim().max(60).optional(),
});

export const AntibioticsStartedObservationSchema = z.object({
  ...base,
  kind: z.literal('antibiotics-started'),
  indication: AntibioticIndicationSchema,
});

export const BronchodilatorGivenObservationSchema = z.object({ ...base, kind: z.literal('bronchodilator-given') });

export const AspirationObservationSchema = z.object({
  ...base,
  kind: z.literal('aspiration'),
  evidence: AspirationEvidenceSchema,
});

export const PhysicianDiagnosisObservationSchema = z.object({
  ...base,
  kind: z.literal('physician-diagnosis'),
  diagnosis: PpcEventTypeSchema,
});

/** One observation of any kind; it needs a date or a post-operative day. */
export const ObservationSchema = z
  .discriminatedUnion('kind', [
    ChestImagingObservationSchema,
    TemperatureMaxObservationSchema,
    WbcObservationSchema,
    PfRatioObservationSchema,
    Pao2ObservationSchema,
    Spo2ObservationSchema,
    SupplementalOxygenObservationSchema,
    SputumObservationSchema,
    RespiratorySignObservationSchema,
    AuscultationObservationSchema,
    MentalStatusObservationSchema,
    SputumCultureObservationSchema,
    AntibioticsStartedObservationSchema,
    BronchodilatorGivenObservationSchema,
    AspirationObservationSchema,
    PhysicianDiagnosisObservationSchema,
  ])
  .superRefine((o, ctx) => {
    if (o.date === undefined && o.postoperativeDay === undefined) {
      ctx.addIssue({ code: 'custom', path: ['date'], message: 'enter the date of the observation or its post-operative day' });
    }
  });
export type Observation = z.infer<typeof ObservationSchema>;
export type ObservationOf<K extends Observation['kind']> = Extract<Observation, { kind: K }>;

/** The evidence of one outcome event: observation ids must be unique. */
export const ObservationListSchema = z
  .array(ObservationSchema)
  .max(500)
  .superRefine((list, ctx) => {
    const seen = new Set<string>();
    list.forEach((o, i) => {
      if (seen.has(o.id)) ctx.addIssue({ code: 'custom', path: [i, 'id'], message: `observation id "${o.id}" is used twice` });
      seen.add(o.id);
    });
  });
