/**
 * Measure keys: what a rate, a chart or a comparison counts. The first set (issue 4) is here;
 * the committee work extends `MEASURES` (add an entry, never change a published key).
 *
 * A measure counts cases with a case-level outcome flag (`outcome`) among the cohort's
 * counted cases (a proportion), or the same cases per 1,000 post-operative patient-days (a
 * rate). The server maps each outcome flag to one column of its fact table
 * (server/analysis/facts.ts); the definitions below are the words shown beside the figures.
 */
import { z } from 'zod';

/** Case-level outcome flags the analysis fact table keeps (one boolean each). */
export const OutcomeFlagSchema = z.enum([
  'anyPpc',
  'atelectasis',
  'pneumoniaNhsn',
  'respiratoryInfection',
  'respiratoryFailure',
  'reintubation',
  'ards',
  'readmitted30d',
  'died30d',
]);
export type OutcomeFlag = z.infer<typeof OutcomeFlagSchema>;

export const MeasureKindSchema = z.enum(['proportion', 'rate']);
export type MeasureKind = z.infer<typeof MeasureKindSchema>;

export interface MeasureDefinition {
  key: string;
  label: string;
  /** Short label for chart axes and table headers. */
  shortLabel: string;
  kind: MeasureKind;
  outcome: OutcomeFlag;
  /** For rates: the events are expressed per this many patient-days. */
  per?: number;
  /** Unit printed beside the value. */
  unit: string;
  numerator: string;
  denominator: string;
  /** Published source of the definition, or "common practice (no source)". */
  source: string;
}

const CANET_JAMMER = 'Canet J et al., Anesthesiology 2010;113:1338-50; Jammer I et al., Eur J Anaesthesiol 2015;32:88-105';
const NHSN = 'CDC NHSN Patient Safety Component Manual 2022, ch. 6 (PNU1)';
const COMMON = 'common practice (no source)';
const COUNTED = 'Counted cases of the cohort (status complete, verified or locked).';

export const MEASURES = [
  {
    key: 'any-ppc', label: 'Any post-operative pulmonary complication', shortLabel: 'Any PPC', kind: 'proportion', outcome: 'anyPpc', unit: '%',
    numerator: 'Cases with at least one event of: respiratory infection, respiratory failure, bronchospasm, atelectasis, pleural effusion, pneumothorax, aspiration pneumonitis (reintubation and ARDS are reported apart).',
    denominator: COUNTED, source: CANET_JAMMER,
  },
  {
    key: 'atelectasis', label: 'Atelectasis', shortLabel: 'Atelectasis', kind: 'proportion', outcome: 'atelectasis', unit: '%',
    numerator: 'Cases with at least one atelectasis event.', denominator: COUNTED, source: 'Jammer I et al., Eur J Anaesthesiol 2015;32:88-105',
  },
  {
    key: 'pneumonia', label: 'Pneumonia (surveillance definition PNU1)', shortLabel: 'Pneumonia', kind: 'proportion', outcome: 'pneumoniaNhsn', unit: '%',
    numerator: 'Cases with at least one respiratory-infection event whose stored PNU1 evaluation is met.', denominator: COUNTED, source: NHSN,
  },
  {
    key: 'pneumonia-per-1000-patient-days', label: 'Pneumonia per 1,000 post-operative patient-days', shortLabel: 'Pneumonia per 1,000 patient-days', kind: 'rate', outcome: 'pneumoniaNhsn', per: 1000, unit: 'per 1,000 patient-days',
    numerator: 'Cases with a PNU1 pneumonia among counted cases with a discharge date.', denominator: 'Post-operative patient-days (midnights in hospital after surgery) of counted cases with a discharge date.', source: NHSN,
  },
  {
    key: 'respiratory-failure', label: 'Respiratory failure', shortLabel: 'Respiratory failure', kind: 'proportion', outcome: 'respiratoryFailure', unit: '%',
    numerator: 'Cases with at least one respiratory-failure event.', denominator: COUNTED, source: 'Jammer I et al., Eur J Anaesthesiol 2015;32:88-105',
  },
  {
    key: 'readmission-30d', label: 'Readmission within 30 days', shortLabel: '30-day readmission', kind: 'proportion', outcome: 'readmitted30d', unit: '%',
    numerator: 'Cases readmitted within 30 days of surgery (any cause).', denominator: COUNTED, source: COMMON,
  },
  {
    key: 'death-30d', label: 'Death within 30 days', shortLabel: '30-day death', kind: 'proportion', outcome: 'died30d', unit: '%',
    numerator: 'Cases that died within 30 days of surgery.', denominator: COUNTED, source: COMMON,
  },
] as const satisfies readonly MeasureDefinition[];

export type MeasureKey = (typeof MEASURES)[number]['key'];
export const MEASURE_KEYS = MEASURES.map((m) => m.key) as [MeasureKey, ...MeasureKey[]];
export const MeasureKeySchema = z.enum(MEASURE_KEYS, { error: `measure must be one of: ${MEASURE_KEYS.join(', ')}` });

/** The outcomes a cohort page and a comparison show, in order (issue 6). */
export const COHORT_PAGE_MEASURES: readonly MeasureKey[] = ['any-ppc', 'atelectasis', 'pneumonia', 'respiratory-failure', 'readmission-30d', 'death-30d'];

export function measureByKey(key: MeasureKey): MeasureDefinition {
  const m = MEASURES.find((x) => x.key === key);
  if (!m) throw new Error(`unknown measure "${key}"; use one of ${MEASURE_KEYS.join(', ')}`);
  return m;
}

/**
 * ARISCAT's published PPC risk by class (Canet J et al., Anesthesiology 2010;113:1338-50,
 * validation subsample: low 1.6%, intermediate 13.3%, high 42.1%); the "published class risks"
 * reference of a risk-adjusted comparison. Only meaningful for the any-PPC composite.
 */
export const ARISCAT_PUBLISHED_CLASS_RISK = { low: 0.016, intermediate: 0.133, high: 0.421 } as const;
