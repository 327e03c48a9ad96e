/**
 * Body measures and the lung-expansion indication check.
 */
import { CLINICAL_CAUTION } from '../../shared/clinical/checks.js';
import { SEXES, type Sex } from '../../shared/clinical/codes.js';
import { AnalysisInputError } from '../errors.js';
import { requireNumber, requireObject, requireOneOf } from './require.js';

/** Adult heights the formulas are used for (the PBW formula turns negative below about 102 cm). */
const HEIGHT = { min: 120, max: 230, unit: 'cm' } as const;

export const PBW_SOURCE =
  'ARDS Network, N Engl J Med 2000;342:1301-8 (men 50 + 0.91 × (height cm − 152.4); women 45.5 + 0.91 × (height cm − 152.4))';

/**
 * Predicted body weight (kg).
 *
 * Definition: ARDS Network, "Ventilation with lower tidal volumes…", N Engl J Med
 * 2000;342:1301-8: men 50 + 0.91 × (height cm − 152.4); women 45.5 + 0.91 × (height cm − 152.4).
 *
 * @param heightCm 120–230 cm
 * @param sex 'female' | 'male'
 * @throws AnalysisInputError for a missing, non-finite or out-of-range height or an unknown sex
 * @example predictedBodyWeight(175, 'male') // 70.566
 */
export function predictedBodyWeight(heightCm: number, sex: Sex): number {
  const fn = 'predictedBodyWeight';
  const h = requireNumber(fn, 'heightCm', heightCm, HEIGHT);
  const s = requireOneOf(fn, 'sex', sex, SEXES);
  return (s === 'male' ? 50 : 45.5) + 0.91 * (h - 152.4);
}

/**
 * Body-mass index, kg/m² (weight / height²; WHO definition).
 * @param heightCm 120–230 cm
 * @param weightKg 20–400 kg
 * @throws AnalysisInputError for missing or out-of-range input
 * @example bmi(175, 70) // 22.857…
 */
export function bmi(heightCm: number, weightKg: number): number {
  const fn = 'bmi';
  const h = requireNumber(fn, 'heightCm', heightCm, HEIGHT) / 100;
  const w = requireNumber(fn, 'weightKg', weightKg, { min: 20, max: 400, unit: 'kg' });
  return w / (h * h);
}

export interface LungExpansionIndicationInput {
  /** Measured inspiratory capacity, mL. */
  readonly inspiratoryCapacityMl?: number | null;
  /** Measured vital capacity, mL. */
  readonly vitalCapacityMl?: number | null;
  readonly heightCm: number;
  readonly sex: Sex;
}

export interface LungExpansionCriterion {
  readonly id: 'inspiratory-capacity-below-10-ml-per-kg' | 'vital-capacity-below-10-ml-per-kg';
  readonly thresholdMlPerKg: number;
  /** null when that volume was not measured. */
  readonly valueMlPerKg: number | null;
  readonly met: boolean;
  readonly reason: string;
  readonly source: string;
}

export interface LungExpansionIndication {
  readonly predictedBodyWeightKg: number;
  readonly criteria: readonly LungExpansionCriterion[];
  /** Either criterion met: incentive spirometry alone is likely inadequate. */
  readonly incentiveSpirometryLikelyInadequate: boolean;
  /** What to show when flagged (null otherwise); always shown with `caution`. */
  readonly message: string | null;
  readonly caution: string;
}

export const IC_THRESHOLD_SOURCE = 'common practice (no source)';
export const VC_THRESHOLD_SOURCE = 'AARC Clinical Practice Guideline: incentive spirometry, Respir Care 1991;36:1402-5 (from memory)';

/**
 * Flags a patient for whom incentive spirometry alone is likely inadequate, so that a
 * positive-pressure therapy is worth considering.
 *
 * Method: volumes per kg of predicted body weight (ARDS Network formula, `predictedBodyWeight`):
 * - inspiratory capacity < 10 mL/kg PBW (common practice, no source);
 * - vital capacity < 10 mL/kg (AARC incentive-spirometry guideline 1991: "VC under about
 *   10 mL/kg"; from memory). Exactly 10 mL/kg is not flagged.
 * Supports surveillance and quality improvement only: local protocol and the clinician's
 * judgement decide (the result carries that caution).
 *
 * @param input.inspiratoryCapacityMl mL, 0–8000 (optional)
 * @param input.vitalCapacityMl mL, 0–8000 (optional)
 * @param input.heightCm 120–230 cm; input.sex 'female' | 'male'
 * @throws AnalysisInputError when neither volume is given, or an input is missing or out of range
 * @example lungExpansionIndication({ inspiratoryCapacityMl: 450, heightCm: 152.4, sex: 'male' })
 *   // PBW 50 kg, IC 9 mL/kg -> incentiveSpirometryLikelyInadequate: true
 */
export function lungExpansionIndication(input: LungExpansionIndicationInput): LungExpansionIndication {
  const fn = 'lungExpansionIndication';
  requireObject(fn, 'input', input);
  const pbw = predictedBodyWeight(input.heightCm, input.sex);
  const icGiven = input.inspiratoryCapacityMl !== undefined && input.inspiratoryCapacityMl !== null;
  const vcGiven = input.vitalCapacityMl !== undefined && input.vitalCapacityMl !== null;
  if (!icGiven && !vcGiven) {
    throw new AnalysisInputError(fn, 'inspiratoryCapacityMl', 'and vitalCapacityMl are both missing; enter at least one measured volume in mL');
  }
  const volume = { min: 0, max: 8000, unit: 'mL' } as const;
  const ic = icGiven ? requireNumber(fn, 'inspiratoryCapacityMl', input.inspiratoryCapacityMl, volume) / pbw : null;
  const vc = vcGiven ? requireNumber(fn, 'vitalCapacityMl', input.vitalCapacityMl, volume) / pbw : null;

  const criterion = (
    id: LungExpansionCriterion['id'],
    name: string,
    value: number | null,
    source: string,
  ): LungExpansionCriterion => {
    const met = value !== null && value < 10;
    const reason =
      value === null
        ? `missing: ${name} not measured`
        : `${name} ${value.toFixed(1)} mL/kg PBW is ${met ? 'below' : 'not below'} 10 mL/kg`;
    return { id, thresholdMlPerKg: 10, valueMlPerKg: value, met, reason, source };
  };
  const criteria = [
    criterion('inspiratory-capacity-below-10-ml-per-kg', 'inspiratory capacity', ic, IC_THRESHOLD_SOURCE),
    criterion('vital-capacity-below-10-ml-per-kg', 'vital capacity', vc, VC_THRESHOLD_SOURCE),
  ];
  const flagged = criteria.some((c) => c.met);
  return {
    predictedBodyWeightKg: pbw,
    criteria,
    incentiveSpirometryLikelyInadequate: flagged,
    message: flagged
      ? 'Incentive spirometry alone is likely inadequate at this volume; a positive-pressure therapy is worth considering.'
      : null,
    caution: CLINICAL_CAUTION,
  };
}
