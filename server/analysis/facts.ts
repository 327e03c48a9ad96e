/**
 * The analysis tables the database keeps for itself (migration AnalysisFacts):
 *
 * - `analysis_case_facts`: one narrow row per surgical case (about 120 bytes instead of the
 *   case row's ~700): coded smallints for every filter dimension, bitmasks of the therapy
 *   modalities and outcome-event types, the outcome flags, length of stay and patient-days.
 *   Kept current by triggers on surgical_cases, therapy_episodes and outcome_events.
 * - `analysis_cells`: the roll-up, one row per site x month x status x ARISCAT class x incision
 *   site x therapy received, with the count of cases and the sum of every outcome flag and of
 *   patient-days; kept by a trigger on the fact table (old row subtracted, new row added).
 * - `analysis_los_cells`: the same key plus length of stay, with the count of cases (the
 *   frequency tables that Mann-Whitney and the LOS histogram need).
 *
 * The codes below are frozen: the migration wrote the same lists (array_position(list, value)),
 * so entries are only ever appended. tests/server/analysis/facts.test.ts checks that every
 * value of the shared code lists has a code here.
 */
import type { OutcomeFlag } from '../../shared/analysis/measures.js';

export const STATUS_CODES = ['draft', 'complete', 'verified', 'locked', 'withdrawn'] as const;
export const CATEGORY_CODES = [
  'upper-gastrointestinal', 'hepatobiliary-pancreatic', 'colorectal', 'abdominal-wall-hernia', 'thoracic', 'cardiac', 'vascular',
  'orthopaedic', 'spinal', 'urological', 'gynaecological', 'head-and-neck', 'neurosurgical', 'breast-and-plastic', 'other',
] as const;
export const INCISION_CODES = [
  'peripheral', 'head-neck', 'intracranial', 'spine', 'chest-wall-breast', 'lower-abdominal', 'upper-abdominal',
  'upper-and-lower-abdominal', 'intrathoracic', 'thoraco-abdominal',
] as const;
export const APPROACH_CODES = ['open', 'laparoscopic', 'robotic'] as const;
export const URGENCY_CODES = ['elective', 'emergency'] as const;
export const ASA_CODES = ['I', 'II', 'III', 'IV', 'V', 'VI'] as const;
export const ARISCAT_CODES = ['low', 'intermediate', 'high'] as const;
export const SEX_CODES = ['female', 'male'] as const;
/** Bit i (1 << i) of `modalities`. */
export const MODALITY_BITS = ['incentive-spirometry', 'pep', 'pap-device', 'cpap', 'ippb', 'chest-physiotherapy', 'early-mobilisation'] as const;
/** Bit i (1 << i) of `event_types`. */
export const EVENT_TYPE_BITS = [
  'atelectasis', 'respiratory-infection', 'respiratory-failure', 'reintubation', 'bronchospasm', 'aspiration-pneumonitis',
  'pleural-effusion', 'pneumothorax', 'ards',
] as const;
/** The any-PPC composite (analysis/clinical/ppc-composite.ts) as a bitmask over EVENT_TYPE_BITS. */
export const ANY_PPC_TYPES = ['respiratory-infection', 'respiratory-failure', 'bronchospasm', 'atelectasis', 'pleural-effusion', 'pneumothorax', 'aspiration-pneumonitis'] as const;

/** 1-based code of a value (0 = unknown), as the migration's array_position gives. */
export function codeOf(list: readonly string[], value: string): number {
  const i = list.indexOf(value);
  if (i < 0) throw new Error(`"${value}" has no analysis code; append it to the list in server/analysis/facts.ts and in a migration`);
  return i + 1;
}

export function bitmaskOf(list: readonly string[], values: readonly string[]): number {
  return values.reduce((m, v) => m | (1 << (codeOf(list, v) - 1)), 0);
}

export const ANY_PPC_MASK = bitmaskOf(EVENT_TYPE_BITS, ANY_PPC_TYPES);

/** Per outcome flag: the 0/1 expression on a fact row (alias f) and the summed column of a cell. */
export const OUTCOME_COLUMNS: Record<OutcomeFlag, { fact: (alias: string) => string; cell: string }> = {
  anyPpc: { fact: (a) => `(${a}.event_types & ${ANY_PPC_MASK} <> 0)`, cell: 'any_ppc' },
  atelectasis: { fact: (a) => `(${a}.event_types & ${bitmaskOf(EVENT_TYPE_BITS, ['atelectasis'])} <> 0)`, cell: 'atelectasis' },
  pneumoniaNhsn: { fact: (a) => `${a}.pneumonia`, cell: 'pneumonia' },
  respiratoryInfection: { fact: (a) => `(${a}.event_types & ${bitmaskOf(EVENT_TYPE_BITS, ['respiratory-infection'])} <> 0)`, cell: 'respiratory_infection' },
  respiratoryFailure: { fact: (a) => `(${a}.event_types & ${bitmaskOf(EVENT_TYPE_BITS, ['respiratory-failure'])} <> 0)`, cell: 'respiratory_failure' },
  reintubation: { fact: (a) => `(${a}.event_types & ${bitmaskOf(EVENT_TYPE_BITS, ['reintubation'])} <> 0)`, cell: 'reintubation' },
  ards: { fact: (a) => `(${a}.event_types & ${bitmaskOf(EVENT_TYPE_BITS, ['ards'])} <> 0)`, cell: 'ards' },
  readmitted30d: { fact: (a) => `${a}.readmitted`, cell: 'readmitted' },
  died30d: { fact: (a) => `${a}.died`, cell: 'died' },
};
export const OUTCOME_FLAGS = Object.keys(OUTCOME_COLUMNS) as OutcomeFlag[];
