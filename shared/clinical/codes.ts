/**
 * Coded values of the registry: one zod enum per code list, its inferred type, the list of
 * values and the labels shown to people. Codes are our own plain words; trade terms (ASA
 * class, ARISCAT, Clavien–Dindo) keep their published spelling.
 */
import { z } from 'zod';

// --- Patient --------------------------------------------------------------------------------

/** Sex used for predicted body weight (the ARDS Network formula has a male and a female form). */
export const SexSchema = z.enum(['female', 'male']);
export type Sex = z.infer<typeof SexSchema>;
export const SEXES = SexSchema.options;
export const SEX_LABELS: Record<Sex, string> = { female: 'Female', male: 'Male' };

/**
 * ASA physical status class I–VI (American Society of Anesthesiologists). The E (emergency)
 * modifier is a separate boolean on the case (`asaEmergency`); VI never takes an E.
 */
export const AsaClassSchema = z.enum(['I', 'II', 'III', 'IV', 'V', 'VI']);
export type AsaClass = z.infer<typeof AsaClassSchema>;
export const ASA_CLASSES = AsaClassSchema.options;
export const ASA_CLASS_LABELS: Record<AsaClass, string> = {
  I: 'ASA I — a normal healthy patient',
  II: 'ASA II — mild systemic disease',
  III: 'ASA III — severe systemic disease',
  IV: 'ASA IV — severe systemic disease that is a constant threat to life',
  V: 'ASA V — moribund, not expected to survive without the operation',
  VI: 'ASA VI — declared brain-dead, organs removed for donation',
};

export const SmokingStatusSchema = z.enum(['never', 'former', 'current']);
export type SmokingStatus = z.infer<typeof SmokingStatusSchema>;
export const SMOKING_STATUSES = SmokingStatusSchema.options;
export const SMOKING_STATUS_LABELS: Record<SmokingStatus, string> = {
  never: 'Never smoked',
  former: 'Former smoker',
  current: 'Current smoker',
};

/** Functional status before the operation (activities of daily living). */
export const FunctionalStatusSchema = z.enum(['independent', 'partly-dependent', 'fully-dependent']);
export type FunctionalStatus = z.infer<typeof FunctionalStatusSchema>;
export const FUNCTIONAL_STATUSES = FunctionalStatusSchema.options;
export const FUNCTIONAL_STATUS_LABELS: Record<FunctionalStatus, string> = {
  independent: 'Independent',
  'partly-dependent': 'Partly dependent on others',
  'fully-dependent': 'Fully dependent on others',
};

// --- Operation ------------------------------------------------------------------------------

/** Procedure categories: our own list (no open standard lists surgical categories this way). */
export const ProcedureCategorySchema = z.enum([
  'upper-gastrointestinal',
  'hepatobiliary-pancreatic',
  'colorectal',
  'abdominal-wall-hernia',
  'thoracic',
  'cardiac',
  'vascular',
  'orthopaedic',
  'spinal',
  'urological',
  'gynaecological',
  'head-and-neck',
  'neurosurgical',
  'breast-and-plastic',
  'other',
]);
export type ProcedureCategory = z.infer<typeof ProcedureCategorySchema>;
export const PROCEDURE_CATEGORIES = ProcedureCategorySchema.options;
export const PROCEDURE_CATEGORY_LABELS: Record<ProcedureCategory, string> = {
  'upper-gastrointestinal': 'Upper gastrointestinal (oesophagus, stomach)',
  'hepatobiliary-pancreatic': 'Liver, bile ducts and pancreas',
  colorectal: 'Colorectal',
  'abdominal-wall-hernia': 'Abdominal wall and hernia',
  thoracic: 'Thoracic (lung, pleura, mediastinum)',
  cardiac: 'Cardiac',
  vascular: 'Vascular',
  orthopaedic: 'Orthopaedic (limbs and joints)',
  spinal: 'Spinal',
  urological: 'Urological',
  gynaecological: 'Gynaecological',
  'head-and-neck': 'Head and neck',
  neurosurgical: 'Neurosurgical (intracranial)',
  'breast-and-plastic': 'Breast and plastic',
  other: 'Other',
};

/** The three incision classes ARISCAT scores (Canet J et al., Anesthesiology 2010;113:1338-50). */
export const AriscatIncisionSchema = z.enum(['peripheral', 'upper-abdominal', 'intrathoracic']);
export type AriscatIncision = z.infer<typeof AriscatIncisionSchema>;
export const ARISCAT_INCISIONS = AriscatIncisionSchema.options;
export const ARISCAT_INCISION_LABELS: Record<AriscatIncision, string> = {
  peripheral: 'Peripheral',
  'upper-abdominal': 'Upper abdominal',
  intrathoracic: 'Intrathoracic',
};

/** Incision site as the registry records it; each maps to one ARISCAT class below. */
export const IncisionSiteSchema = z.enum([
  'peripheral',
  'head-neck',
  'intracranial',
  'spine',
  'chest-wall-breast',
  'lower-abdominal',
  'upper-abdominal',
  'upper-and-lower-abdominal',
  'intrathoracic',
  'thoraco-abdominal',
]);
export type IncisionSite = z.infer<typeof IncisionSiteSchema>;
export const INCISION_SITES = IncisionSiteSchema.options;
export const INCISION_SITE_LABELS: Record<IncisionSite, string> = {
  peripheral: 'Peripheral (limbs, skin, superficial)',
  'head-neck': 'Head and neck',
  intracranial: 'Intracranial',
  spine: 'Spine',
  'chest-wall-breast': 'Chest wall or breast (pleura not opened)',
  'lower-abdominal': 'Lower abdominal (below the umbilicus), pelvic or inguinal',
  'upper-abdominal': 'Upper abdominal (above the umbilicus)',
  'upper-and-lower-abdominal': 'Upper and lower abdominal (e.g. full midline laparotomy)',
  intrathoracic: 'Intrathoracic (pleura or mediastinum opened)',
  'thoraco-abdominal': 'Thoraco-abdominal',
};

/**
 * Explicit mapping to the ARISCAT incision class. ARISCAT scores only upper abdominal and
 * intrathoracic incisions; everything else, lower abdominal included, is "peripheral"
 * (Canet 2010). An incision that crosses into a higher class takes the higher class.
 */
export const INCISION_SITE_TO_ARISCAT: Readonly<Record<IncisionSite, AriscatIncision>> = {
  peripheral: 'peripheral',
  'head-neck': 'peripheral',
  intracranial: 'peripheral',
  spine: 'peripheral',
  'chest-wall-breast': 'peripheral',
  'lower-abdominal': 'peripheral',
  'upper-abdominal': 'upper-abdominal',
  'upper-and-lower-abdominal': 'upper-abdominal',
  intrathoracic: 'intrathoracic',
  'thoraco-abdominal': 'intrathoracic',
};

export const ApproachSchema = z.enum(['open', 'laparoscopic', 'robotic']);
export type Approach = z.infer<typeof ApproachSchema>;
export const APPROACHES = ApproachSchema.options;
export const APPROACH_LABELS: Record<Approach, string> = {
  open: 'Open',
  laparoscopic: 'Laparoscopic or thoracoscopic',
  robotic: 'Robot-assisted',
};

/** Urgency of the operation; ARISCAT's emergency factor comes from this field alone. */
export const UrgencySchema = z.enum(['elective', 'emergency']);
export type Urgency = z.infer<typeof UrgencySchema>;
export const URGENCIES = UrgencySchema.options;
export const URGENCY_LABELS: Record<Urgency, string> = { elective: 'Elective', emergency: 'Emergency' };

export const AnaesthesiaSchema = z.enum(['general', 'regional']);
export type Anaesthesia = z.infer<typeof AnaesthesiaSchema>;
export const ANAESTHESIA_TYPES = AnaesthesiaSchema.options;
export const ANAESTHESIA_LABELS: Record<Anaesthesia, string> = { general: 'General', regional: 'Regional' };

// --- Lung-expansion therapy ----------------------------------------------------------------

/** Therapy modalities; each has its own table in `modalities.ts`. */
export const TherapyModalitySchema = z.enum([
  'incentive-spirometry',
  'pep',
  'pap-device',
  'cpap',
  'ippb',
  'chest-physiotherapy',
  'early-mobilisation',
]);
export type TherapyModality = z.infer<typeof TherapyModalitySchema>;
export const THERAPY_MODALITIES = TherapyModalitySchema.options;
export const THERAPY_MODALITY_LABELS: Record<TherapyModality, string> = {
  'incentive-spirometry': 'Incentive spirometry',
  pep: 'Positive expiratory pressure (PEP, threshold resistor)',
  'pap-device': 'Positive airway pressure device',
  cpap: 'CPAP (lung expansion)',
  ippb: 'Intermittent positive pressure breathing (IPPB)',
  'chest-physiotherapy': 'Chest physiotherapy',
  'early-mobilisation': 'Early mobilisation',
};

export const TherapyInterfaceSchema = z.enum(['mouthpiece', 'mask']);
export type TherapyInterface = z.infer<typeof TherapyInterfaceSchema>;
export const THERAPY_INTERFACES = TherapyInterfaceSchema.options;
export const THERAPY_INTERFACE_LABELS: Record<TherapyInterface, string> = {
  mouthpiece: 'Mouthpiece',
  mask: 'Mask',
};

export const SourceGasSchema = z.enum(['air', 'oxygen']);
export type SourceGas = z.infer<typeof SourceGasSchema>;
export const SOURCE_GASES = SourceGasSchema.options;
export const SOURCE_GAS_LABELS: Record<SourceGas, string> = { air: 'Air', oxygen: 'Oxygen' };

// --- Outcomes -------------------------------------------------------------------------------

/** Post-operative pulmonary complication types (the EPCO and ARISCAT components plus two reported apart). */
export const PpcEventTypeSchema = z.enum([
  'atelectasis',
  'respiratory-infection',
  'respiratory-failure',
  'reintubation',
  'bronchospasm',
  'aspiration-pneumonitis',
  'pleural-effusion',
  'pneumothorax',
  'ards',
]);
export type PpcEventType = z.infer<typeof PpcEventTypeSchema>;
export const PPC_EVENT_TYPES = PpcEventTypeSchema.options;
export const PPC_EVENT_TYPE_LABELS: Record<PpcEventType, string> = {
  atelectasis: 'Atelectasis',
  'respiratory-infection': 'Respiratory infection or pneumonia',
  'respiratory-failure': 'Respiratory failure',
  reintubation: 'Reintubation',
  bronchospasm: 'Bronchospasm',
  'aspiration-pneumonitis': 'Aspiration pneumonitis',
  'pleural-effusion': 'Pleural effusion',
  pneumothorax: 'Pneumothorax',
  ards: 'ARDS',
};

/**
 * Clavien–Dindo grade (Dindo D, Demartines N, Clavien PA, Ann Surg 2004;240:205-13). The "d"
 * suffix (disability at discharge) is a separate boolean where it is recorded.
 */
export const ClavienDindoGradeSchema = z.enum(['I', 'II', 'IIIa', 'IIIb', 'IVa', 'IVb', 'V']);
export type ClavienDindoGrade = z.infer<typeof ClavienDindoGradeSchema>;
export const CLAVIEN_DINDO_GRADES = ClavienDindoGradeSchema.options;
export const CLAVIEN_DINDO_LABELS: Record<ClavienDindoGrade, string> = {
  I: 'I — deviation from the normal course without specific treatment',
  II: 'II — needed drug treatment (including antibiotics, transfusion)',
  IIIa: 'IIIa — intervention not under general anaesthesia',
  IIIb: 'IIIb — intervention under general anaesthesia',
  IVa: 'IVa — life-threatening, single-organ dysfunction (ICU)',
  IVb: 'IVb — life-threatening, multi-organ dysfunction (ICU)',
  V: 'V — death',
};

export const ReadmissionCauseSchema = z.enum(['respiratory', 'other']);
export type ReadmissionCause = z.infer<typeof ReadmissionCauseSchema>;
export const READMISSION_CAUSES = ReadmissionCauseSchema.options;
export const READMISSION_CAUSE_LABELS: Record<ReadmissionCause, string> = {
  respiratory: 'Respiratory',
  other: 'Other',
};

/** Kinds of outcome evidence observation (schemas in `observations.ts`). */
export const ObservationKindSchema = z.enum([
  'chest-imaging',
  'temperature-max',
  'wbc',
  'pf-ratio',
  'pao2',
  'spo2',
  'supplemental-oxygen',
  'sputum',
  'respiratory-sign',
  'auscultation',
  'mental-status',
  'sputum-culture',
  'antibiotics-started',
  'bronchodilator-given',
  'aspiration',
  'physician-diagnosis',
]);
export type ObservationKind = z.infer<typeof ObservationKindSchema>;
export const OBSERVATION_KINDS = ObservationKindSchema.options;
export const OBSERVATION_KIND_LABELS: Record<ObservationKind, string> = {
  'chest-imaging': 'Chest imaging',
  'temperature-max': 'Maximum temperature',
  wbc: 'White-cell count',
  'pf-ratio': 'PaO2/FiO2 ratio',
  pao2: 'PaO2',
  spo2: 'SpO2',
  'supplemental-oxygen': 'Oxygen or ventilator support',
  sputum: 'Sputum',
  'respiratory-sign': 'Cough, dyspnoea or tachypnoea',
  auscultation: 'Auscultation',
  'mental-status': 'Mental status',
  'sputum-culture': 'Sputum culture',
  'antibiotics-started': 'Antibiotics started',
  'bronchodilator-given': 'Bronchodilator given',
  aspiration: 'Inhalation of gastric contents',
  'physician-diagnosis': 'Physician diagnosis',
};

// --- Workflow -------------------------------------------------------------------------------

/** Case status in the abstraction workflow. Which statuses count in analyses: `ppc-composite.ts`. */
export const CaseStatusSchema = z.enum(['draft', 'complete', 'verified', 'locked', 'withdrawn']);
export type CaseStatus = z.infer<typeof CaseStatusSchema>;
export const CASE_STATUSES = CaseStatusSchema.options;
export const CASE_STATUS_LABELS: Record<CaseStatus, string> = {
  draft: 'Draft',
  complete: 'Complete',
  verified: 'Verified',
  locked: 'Locked',
  withdrawn: 'Withdrawn',
};
