/**
 * Predicted body weight, BMI and the lung-expansion indication.
 * - PBW: ARDS Network, N Engl J Med 2000;342:1301-8; men 50 + 0.91 (h − 152.4), women
 *   45.5 + 0.91 (h − 152.4). TRADE.md marks the formula "memory: verify". Cross-check: the
 *   same network's inch form, 50 (or 45.5) + 2.3 × (inches − 60) (from memory), agrees within
 *   0.3 kg across adult heights (2.3 kg/in ≈ 0.91 kg/cm × 2.54).
 * - BMI: weight / height² (WHO definition).
 * - Indication: IC < 10 mL/kg PBW (common practice, no source); VC < 10 mL/kg (AARC
 *   incentive-spirometry CPG, Respir Care 1991; from memory).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { bmi, lungExpansionIndication, predictedBodyWeight } from '../../../analysis/clinical/body.js';
import { AnalysisInputError } from '../../../analysis/errors.js';
import { CLINICAL_CAUTION } from '../../../shared/clinical/checks.js';
import type { Sex } from '../../../shared/clinical/codes.js';

describe('predictedBodyWeight', () => {
  it('when height is 152.4 cm (60 in), then PBW is the formula intercept: 50 kg men, 45.5 kg women', () => {
    expect(predictedBodyWeight(152.4, 'male')).toBeCloseTo(50, 10);
    expect(predictedBodyWeight(152.4, 'female')).toBeCloseTo(45.5, 10);
  });

  it('when a man is 175 cm, then PBW is 50 + 0.91 × 22.6 = 70.566 kg', () => {
    expect(predictedBodyWeight(175, 'male')).toBeCloseTo(70.566, 6);
  });

  it('when a woman is 162.56 cm (64 in), then PBW is 54.7456 kg (inch form 54.7 kg, from memory)', () => {
    expect(predictedBodyWeight(162.56, 'female')).toBeCloseTo(54.7456, 6);
    expect(Math.abs(predictedBodyWeight(162.56, 'female') - (45.5 + 2.3 * 4))).toBeLessThan(0.1);
  });

  it('when any adult height is given, then the cm form agrees with the inch form within 0.3 kg', () => {
    fc.assert(
      fc.property(fc.double({ min: 140, max: 210, noNaN: true }), fc.constantFrom<Sex>('female', 'male'), (h, sex) => {
        const inchForm = (sex === 'male' ? 50 : 45.5) + 2.3 * (h / 2.54 - 60);
        expect(Math.abs(predictedBodyWeight(h, sex) - inchForm)).toBeLessThan(0.3);
      }),
    );
  });

  it('when height is missing, out of range or sex unknown, then it throws', () => {
    expect(() => predictedBodyWeight(undefined as unknown as number, 'male')).toThrow(AnalysisInputError);
    expect(() => predictedBodyWeight(100, 'male')).toThrow(/heightCm/);
    expect(() => predictedBodyWeight(175, 'unknown' as Sex)).toThrow(/sex/);
  });
});

describe('bmi', () => {
  it('when 70 kg and 175 cm, then BMI is 70 / 1.75² = 22.857 kg/m² (WHO definition)', () => {
    expect(bmi(175, 70)).toBeCloseTo(22.857, 3);
  });

  it('when 100 kg and 200 cm, then BMI is 25 kg/m²', () => {
    expect(bmi(200, 100)).toBeCloseTo(25, 10);
  });

  it('when weight is missing or impossible, then it throws', () => {
    expect(() => bmi(175, Number.NaN)).toThrow(AnalysisInputError);
    expect(() => bmi(175, 5)).toThrow(/weightKg/);
  });
});

describe('lungExpansionIndication', () => {
  // 152.4 cm man: PBW exactly 50 kg, so 500 mL is exactly 10 mL/kg.
  const base = { heightCm: 152.4, sex: 'male' as const };

  it('when IC is exactly 10 mL/kg PBW, then it is not flagged (the mark is "under 10", common practice)', () => {
    const r = lungExpansionIndication({ ...base, inspiratoryCapacityMl: 500 });
    expect(r.predictedBodyWeightKg).toBeCloseTo(50, 10);
    expect(r.criteria[0].valueMlPerKg).toBeCloseTo(10, 10);
    expect(r.criteria[0].met).toBe(false);
    expect(r.incentiveSpirometryLikelyInadequate).toBe(false);
    expect(r.message).toBeNull();
  });

  it('when IC is 9.98 mL/kg PBW, then incentive spirometry alone is flagged as likely inadequate', () => {
    const r = lungExpansionIndication({ ...base, inspiratoryCapacityMl: 499 });
    expect(r.criteria[0].met).toBe(true);
    expect(r.incentiveSpirometryLikelyInadequate).toBe(true);
    expect(r.message).toMatch(/positive-pressure/);
    expect(r.caution).toBe(CLINICAL_CAUTION);
  });

  it('when only VC is measured and it is below 10 mL/kg (AARC IS CPG 1991, from memory), then flagged', () => {
    const r = lungExpansionIndication({ ...base, vitalCapacityMl: 450 });
    expect(r.criteria[0]).toMatchObject({ met: false, valueMlPerKg: null });
    expect(r.criteria[0].reason).toMatch(/missing/);
    expect(r.criteria[1]).toMatchObject({ met: true });
    expect(r.criteria[1].valueMlPerKg).toBeCloseTo(9, 10);
    expect(r.incentiveSpirometryLikelyInadequate).toBe(true);
  });

  it('when both volumes are well above 10 mL/kg, then not flagged and the caution is still carried', () => {
    const r = lungExpansionIndication({ heightCm: 175, sex: 'female', inspiratoryCapacityMl: 2000, vitalCapacityMl: 3000 });
    expect(r.incentiveSpirometryLikelyInadequate).toBe(false);
    expect(r.caution).toBe(CLINICAL_CAUTION);
  });

  it('when neither volume is given, then it throws naming both', () => {
    expect(() => lungExpansionIndication(base)).toThrow(AnalysisInputError);
    expect(() => lungExpansionIndication(base)).toThrow(/vitalCapacityMl/);
  });

  it('when a volume is impossible, then it throws', () => {
    expect(() => lungExpansionIndication({ ...base, inspiratoryCapacityMl: -5 })).toThrow(/inspiratoryCapacityMl/);
  });
});
