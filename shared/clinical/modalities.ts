/**
 * One table per lung-expansion therapy modality: which episode fields apply, their units, the
 * usual range (a value outside it is stored with a warning), the possible range (a value
 * outside it is rejected), defaults, and the source of every figure.
 *
 * These figures support surveillance and quality improvement only: local protocol and the
 * clinician's judgement decide the bedside settings. `checkTherapyEpisode` in
 * `analysis/clinical/therapy-checks.ts` applies the tables.
 *
 * CPAP used for obstructive sleep apnoea is not lung-expansion therapy: it is recorded on the
 * case as a risk factor (obstructive sleep apnoea), never as a therapy episode.
 */
import { z } from 'zod';
import {
  SourceGasSchema,
  THERAPY_MODALITY_LABELS,
  TherapyInterfaceSchema,
  TherapyModalitySchema,
  type TherapyInterface,
  type TherapyModality,
} from './codes.js';

// --- Sources ----------------------------------------------------------------------------------

export const THERAPY_SOURCES = {
  aarcPap1993:
    'AARC Clinical Practice Guideline: use of positive airway pressure adjuncts to bronchial hygiene therapy. Respir Care 1993;38:516-21 (pages from memory)',
  aarcIs1991: 'AARC Clinical Practice Guideline: incentive spirometry. Respir Care 1991;36:1402-5 (from memory)',
  aarcIs2011: 'Restrepo RD et al. AARC clinical practice guideline: incentive spirometry 2011. Respir Care 2011;56:1600-4',
  aarcAirwayClearance2013:
    'Strickland SL et al. AARC clinical practice guideline: effectiveness of nonpharmacologic airway clearance therapies in hospitalized patients. Respir Care 2013;58:2187-93',
  aarcIppb2003: 'AARC Clinical Practice Guideline: intermittent positive pressure breathing, 2003 revision. Respir Care 2003;48:540-6 (pages from memory)',
  commonPractice: 'common practice (no source)',
} as const;

// --- Episode fields ---------------------------------------------------------------------------

/** Every field a therapy episode can carry; each modality table lists those that apply. */
export const TherapyEpisodeFieldSchema = z.enum([
  'startPostoperativeDay',
  'sessionsPrescribed',
  'sessionsDelivered',
  'sessionMinutes',
  'interface',
  'noseClip',
  'aerosolMedication',
  'sourceGas',
  'flowLpm',
  'expiratoryPressureCmH2O',
  'volumeTargetMl',
  'inspiratoryCapacityMl',
  'vitalCapacityMl',
  'predictedBodyWeightKg',
]);
export type TherapyEpisodeField = z.infer<typeof TherapyEpisodeFieldSchema>;

export const NUMERIC_EPISODE_FIELDS = [
  'startPostoperativeDay',
  'sessionsPrescribed',
  'sessionsDelivered',
  'sessionMinutes',
  'flowLpm',
  'expiratoryPressureCmH2O',
  'volumeTargetMl',
  'inspiratoryCapacityMl',
  'vitalCapacityMl',
  'predictedBodyWeightKg',
] as const satisfies readonly TherapyEpisodeField[];
export type NumericEpisodeField = (typeof NUMERIC_EPISODE_FIELDS)[number];

export const THERAPY_EPISODE_FIELD_LABELS: Record<TherapyEpisodeField, string> = {
  startPostoperativeDay: 'Post-operative day started',
  sessionsPrescribed: 'Sessions prescribed',
  sessionsDelivered: 'Sessions delivered',
  sessionMinutes: 'Length of one session',
  interface: 'Interface',
  noseClip: 'Nose clip',
  aerosolMedication: 'Aerosol medication given with it',
  sourceGas: 'Source gas',
  flowLpm: 'Flowmeter setting',
  expiratoryPressureCmH2O: 'Expiratory pressure reached',
  volumeTargetMl: 'Volume target',
  inspiratoryCapacityMl: 'Inspiratory capacity (measured)',
  vitalCapacityMl: 'Vital capacity (measured)',
  predictedBodyWeightKg: 'Predicted body weight used',
};

/**
 * The episode fields the checks read. Every setting is optional (null from the database is
 * accepted); `deliveredAbovePrescribedReason` explains more sessions delivered than prescribed.
 */
export const TherapyEpisodeCheckInputSchema = z.object({
  modality: TherapyModalitySchema,
  startPostoperativeDay: z.number().nullish(),
  sessionsPrescribed: z.number().nullish(),
  sessionsDelivered: z.number().nullish(),
  deliveredAbovePrescribedReason: z.string().max(200).nullish(),
  sessionMinutes: z.number().nullish(),
  interface: TherapyInterfaceSchema.nullish(),
  noseClip: z.boolean().nullish(),
  aerosolMedication: z.boolean().nullish(),
  sourceGas: SourceGasSchema.nullish(),
  flowLpm: z.number().nullish(),
  expiratoryPressureCmH2O: z.number().nullish(),
  volumeTargetMl: z.number().nullish(),
  inspiratoryCapacityMl: z.number().nullish(),
  vitalCapacityMl: z.number().nullish(),
  predictedBodyWeightKg: z.number().nullish(),
});
export type TherapyEpisodeCheckInput = z.infer<typeof TherapyEpisodeCheckInputSchema>;

/** Network-level settings the checks use. */
export const TherapyCheckSettingsSchema = z.object({
  /** Sessions longer than this get a warning: lung-expansion therapy is given intermittently. */
  sessionLengthWarnMinutes: z.number().positive().max(1440).default(60),
});
export type TherapyCheckSettings = z.infer<typeof TherapyCheckSettingsSchema>;
export const DEFAULT_THERAPY_CHECK_SETTINGS: TherapyCheckSettings = { sessionLengthWarnMinutes: 60 };

// --- Ranges -----------------------------------------------------------------------------------

export interface RangeSpec {
  readonly min: number;
  readonly max: number;
  readonly source: string;
}

export interface NumericFieldSpec {
  /** Printed unit beside the number. */
  readonly unit: string;
  readonly integer?: boolean;
  /** Outside: rejected (cannot be a real value). */
  readonly possible: RangeSpec;
  /** Outside: stored with a warning carrying the caution. */
  readonly usual?: RangeSpec;
  /** Shown pre-filled in the form; a default, not a rule. */
  readonly default?: { readonly value: number; readonly source: string };
}

const S = THERAPY_SOURCES;

const COMMON_NUMERIC = {
  startPostoperativeDay: { unit: 'day', integer: true, possible: { min: -30, max: 365, source: S.commonPractice } },
  sessionsPrescribed: { unit: 'sessions', integer: true, possible: { min: 0, max: 1000, source: S.commonPractice } },
  sessionsDelivered: { unit: 'sessions', integer: true, possible: { min: 0, max: 1000, source: S.commonPractice } },
  sessionMinutes: { unit: 'min', possible: { min: 1, max: 1440, source: S.commonPractice } },
} as const satisfies Partial<Record<NumericEpisodeField, NumericFieldSpec>>;

const MEASURED_VOLUMES = {
  inspiratoryCapacityMl: { unit: 'mL', possible: { min: 0, max: 8000, source: S.commonPractice } },
  vitalCapacityMl: { unit: 'mL', possible: { min: 0, max: 8000, source: S.commonPractice } },
  predictedBodyWeightKg: { unit: 'kg', possible: { min: 15, max: 140, source: S.commonPractice } },
} as const satisfies Partial<Record<NumericEpisodeField, NumericFieldSpec>>;

/** Hospital flowmeters read 0–15 L/min (common practice); values outside are rejected. */
const FLOWMETER: NumericFieldSpec = { unit: 'L/min', possible: { min: 0, max: 15, source: S.commonPractice } };

/** No lung-expansion device delivers more than 30 cm H2O expiratory pressure (common practice). */
const PRESSURE_POSSIBLE: RangeSpec = { min: 0, max: 30, source: S.commonPractice };

const COMMON_FIELDS = ['startPostoperativeDay', 'sessionsPrescribed', 'sessionsDelivered', 'sessionMinutes'] as const;
const MEASURED_FIELDS = ['inspiratoryCapacityMl', 'vitalCapacityMl', 'predictedBodyWeightKg'] as const;

export interface ModalityTable {
  readonly modality: TherapyModality;
  readonly label: string;
  /** Which episode fields apply; any other field given for this modality is rejected. */
  readonly fields: readonly TherapyEpisodeField[];
  readonly numeric: Readonly<Partial<Record<NumericEpisodeField, NumericFieldSpec>>>;
  /** Interfaces that fit the modality (when `interface` applies). */
  readonly interfaces?: readonly TherapyInterface[];
  /** Warn when one session is longer than the configured length (therapy is intermittent). */
  readonly sessionLengthWarning: boolean;
  readonly notes: readonly string[];
  readonly sources: readonly string[];
}

// --- The tables -------------------------------------------------------------------------------

export const INCENTIVE_SPIROMETRY_TABLE: ModalityTable = {
  modality: 'incentive-spirometry',
  label: THERAPY_MODALITY_LABELS['incentive-spirometry'],
  fields: [...COMMON_FIELDS, 'interface', 'noseClip', 'volumeTargetMl', ...MEASURED_FIELDS],
  numeric: {
    ...COMMON_NUMERIC,
    ...MEASURED_VOLUMES,
    // Volume-oriented devices are graduated to about 4,000–5,000 mL.
    volumeTargetMl: { unit: 'mL', possible: { min: 50, max: 5000, source: S.commonPractice } },
  },
  interfaces: ['mouthpiece'],
  sessionLengthWarning: true,
  notes: [
    'Incentive spirometry has a volume target; it has no flow or pressure setting.',
    'Not recommended alone after surgery: combine with deep breathing, directed coughing and early mobilisation.',
    'Likely inadequate when the patient cannot breathe deeply (vital capacity under about 10 mL/kg): consider a positive-pressure therapy.',
  ],
  sources: [S.aarcIs1991, S.aarcIs2011],
};

export const PEP_TABLE: ModalityTable = {
  modality: 'pep',
  label: THERAPY_MODALITY_LABELS.pep,
  fields: [...COMMON_FIELDS, 'interface', 'noseClip', 'aerosolMedication', 'expiratoryPressureCmH2O', ...MEASURED_FIELDS],
  numeric: {
    ...COMMON_NUMERIC,
    ...MEASURED_VOLUMES,
    expiratoryPressureCmH2O: { unit: 'cm H2O', possible: PRESSURE_POSSIBLE, usual: { min: 10, max: 20, source: S.aarcPap1993 } },
  },
  interfaces: ['mouthpiece', 'mask'],
  sessionLengthWarning: true,
  notes: ['Positive expiratory pressure and threshold resistors: usually 10–20 cm H2O.'],
  sources: [S.aarcPap1993, S.aarcAirwayClearance2013],
};

export const PAP_DEVICE_TABLE: ModalityTable = {
  modality: 'pap-device',
  label: THERAPY_MODALITY_LABELS['pap-device'],
  fields: [
    ...COMMON_FIELDS,
    'interface',
    'noseClip',
    'aerosolMedication',
    'sourceGas',
    'flowLpm',
    'expiratoryPressureCmH2O',
    ...MEASURED_FIELDS,
  ],
  numeric: {
    ...COMMON_NUMERIC,
    ...MEASURED_VOLUMES,
    flowLpm: { ...FLOWMETER, default: { value: 5, source: S.commonPractice } },
    expiratoryPressureCmH2O: { unit: 'cm H2O', possible: PRESSURE_POSSIBLE, usual: { min: 5, max: 20, source: S.aarcPap1993 } },
  },
  interfaces: ['mouthpiece', 'mask'],
  sessionLengthWarning: true,
  notes: [
    'Flow-driven positive airway pressure device: usually 5–20 cm H2O.',
    'A usual starting flow is 5 L/min: shown as the default, not a rule.',
  ],
  sources: [S.aarcPap1993],
};

export const CPAP_TABLE: ModalityTable = {
  modality: 'cpap',
  label: THERAPY_MODALITY_LABELS.cpap,
  fields: [...COMMON_FIELDS, 'interface', 'aerosolMedication', 'sourceGas', 'flowLpm', 'expiratoryPressureCmH2O', ...MEASURED_FIELDS],
  numeric: {
    ...COMMON_NUMERIC,
    ...MEASURED_VOLUMES,
    flowLpm: FLOWMETER,
    expiratoryPressureCmH2O: { unit: 'cm H2O', possible: PRESSURE_POSSIBLE, usual: { min: 5, max: 20, source: S.aarcPap1993 } },
  },
  interfaces: ['mask', 'mouthpiece'],
  sessionLengthWarning: true,
  notes: [
    'CPAP for lung expansion: usually 5–20 cm H2O, given intermittently.',
    'CPAP for obstructive sleep apnoea is a risk factor recorded on the case (obstructive sleep apnoea), not a therapy episode.',
    'The flowmeter setting is that of the flowmeter feeding the circuit (0–15 L/min).',
  ],
  sources: [S.aarcPap1993],
};

export const IPPB_TABLE: ModalityTable = {
  modality: 'ippb',
  label: THERAPY_MODALITY_LABELS.ippb,
  fields: [...COMMON_FIELDS, 'interface', 'noseClip', 'aerosolMedication', 'sourceGas', 'flowLpm', ...MEASURED_FIELDS],
  numeric: { ...COMMON_NUMERIC, ...MEASURED_VOLUMES, flowLpm: FLOWMETER },
  interfaces: ['mouthpiece', 'mask'],
  sessionLengthWarning: true,
  notes: [
    'IPPB when simpler therapies have failed or the patient cannot cooperate with them.',
    'Its pressure is inspiratory; no usual pressure range is recorded here: local protocol decides.',
  ],
  sources: [S.aarcIppb2003],
};

export const CHEST_PHYSIOTHERAPY_TABLE: ModalityTable = {
  modality: 'chest-physiotherapy',
  label: THERAPY_MODALITY_LABELS['chest-physiotherapy'],
  fields: [...COMMON_FIELDS],
  numeric: { ...COMMON_NUMERIC },
  sessionLengthWarning: true,
  notes: ['Deep breathing, directed coughing and airway clearance by a physiotherapist; no device settings.'],
  sources: [S.aarcAirwayClearance2013],
};

export const EARLY_MOBILISATION_TABLE: ModalityTable = {
  modality: 'early-mobilisation',
  label: THERAPY_MODALITY_LABELS['early-mobilisation'],
  fields: [...COMMON_FIELDS],
  numeric: { ...COMMON_NUMERIC },
  // Walking for longer is not a concern: no session-length warning.
  sessionLengthWarning: false,
  notes: ['Sitting out and walking from the first post-operative days; no device settings.'],
  sources: [S.aarcIs2011],
};

/** The tables by modality. */
export const MODALITY_TABLES: Readonly<Record<TherapyModality, ModalityTable>> = {
  'incentive-spirometry': INCENTIVE_SPIROMETRY_TABLE,
  pep: PEP_TABLE,
  'pap-device': PAP_DEVICE_TABLE,
  cpap: CPAP_TABLE,
  ippb: IPPB_TABLE,
  'chest-physiotherapy': CHEST_PHYSIOTHERAPY_TABLE,
  'early-mobilisation': EARLY_MOBILISATION_TABLE,
};

/** Whether a field applies to a modality. */
export function fieldAppliesTo(modality: TherapyModality, field: TherapyEpisodeField): boolean {
  return MODALITY_TABLES[modality].fields.includes(field);
}

/**
 * The values a new episode of this modality starts with in the form (defaults, not rules):
 * e.g. a positive airway pressure device starts at 5 L/min (common practice).
 */
export function modalityDefaults(modality: TherapyModality): Partial<Record<NumericEpisodeField, number>> {
  const out: Partial<Record<NumericEpisodeField, number>> = {};
  for (const [field, spec] of Object.entries(MODALITY_TABLES[modality].numeric) as [NumericEpisodeField, NumericFieldSpec][]) {
    if (spec.default) out[field] = spec.default.value;
  }
  return out;
}
