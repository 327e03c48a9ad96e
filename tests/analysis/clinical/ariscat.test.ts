/**
 * ARISCAT score. Every point value, threshold and class limit below is from
 * Canet J et al., Anesthesiology 2010;113:1338-50 (TRADE.md: checked). Where the paper writes
 * "51-80" and "91-95%" for whole numbers, Alveolog reads half-open intervals (> 50 to 80,
 * 91 to < 96) as issue 3 specifies, so fractional inputs land in one class.
 */
import { describe, expect, it } from 'vitest';
import { AnalysisInputError } from '../../../analysis/errors.js';
import {
  ariscatBreakdown,
  ariscatIncisionClass,
  ariscatRiskClass,
  ariscatScore,
  checkAsaUrgency,
} from '../../../analysis/clinical/ariscat.js';
import { INCISION_SITES, type IncisionSite } from '../../../shared/clinical/codes.js';
import type { AriscatInput } from '../../../shared/clinical/scores.js';

/** A patient scoring 0 on every factor (Canet 2010: each factor's reference category). */
const zero: AriscatInput = {
  age: 40,
  preopSpO2: 98,
  respiratoryInfectionLastMonth: false,
  preopHemoglobin: 14,
  incision: 'peripheral',
  durationMinutes: 60,
  emergency: false,
};
const with_ = (over: Partial<AriscatInput>): AriscatInput => ({ ...zero, ...over });
const points = (over: Partial<AriscatInput>) => ariscatScore(with_(over)).points;

describe('ariscatScore', () => {
  it('when every factor is in its reference category, then 0 points and low risk', () => {
    expect(ariscatScore(zero)).toEqual({ points: 0, riskClass: 'low' });
  });

  it('when every factor is at its worst, then the published maximum of 123 and high risk', () => {
    // Canet 2010: 16 + 24 + 17 + 11 + 24 + 23 + 8 = 123, the top of the published 0-123 range.
    expect(
      ariscatScore({
        age: 81,
        preopSpO2: 90,
        respiratoryInfectionLastMonth: true,
        preopHemoglobin: 10,
        incision: 'intrathoracic',
        durationMinutes: 181,
        emergency: true,
      }),
    ).toEqual({ points: 123, riskClass: 'high' });
  });

  describe('age (Canet 2010: <=50 -> 0, 51-80 -> 3, >80 -> 16)', () => {
    it.each([
      [50, 0],
      [50.5, 3],
      [51, 3],
      [80, 3],
      [80.5, 16],
      [81, 16],
    ])('when age is %s years, then %i points', (age, expected) => {
      expect(points({ age })).toBe(expected);
    });
  });

  describe('pre-operative SpO2 (Canet 2010: >=96% -> 0, 91-95% -> 8, <=90% -> 24)', () => {
    it.each([
      [96, 0],
      [95.9, 8],
      [91, 8],
      [90.9, 24],
      [90, 24],
    ])('when SpO2 is %s%%, then %i points', (preopSpO2, expected) => {
      expect(points({ preopSpO2 })).toBe(expected);
    });
  });

  it('when there was a respiratory infection in the last month, then 17 points (Canet 2010)', () => {
    expect(points({ respiratoryInfectionLastMonth: true })).toBe(17);
  });

  describe('pre-operative anaemia (Canet 2010: Hb <=10 g/dL -> 11)', () => {
    it.each([
      [10, 11],
      [10.1, 0],
      [9, 11],
    ])('when Hb is %s g/dL, then %i points', (preopHemoglobin, expected) => {
      expect(points({ preopHemoglobin })).toBe(expected);
    });
  });

  describe('incision (Canet 2010: peripheral 0, upper abdominal 15, intrathoracic 24)', () => {
    it.each([
      ['peripheral', 0],
      ['upper-abdominal', 15],
      ['intrathoracic', 24],
    ] as const)('when the incision is %s, then %i points', (incision, expected) => {
      expect(points({ incision })).toBe(expected);
    });
  });

  describe('duration (Canet 2010: <=2 h -> 0, >2 to 3 h -> 16, >3 h -> 23)', () => {
    it.each([
      [120, 0],
      [120.5, 16],
      [121, 16],
      [180, 16],
      [181, 23],
      [0, 0],
    ])('when the operation lasts %s min, then %i points', (durationMinutes, expected) => {
      expect(points({ durationMinutes })).toBe(expected);
    });
  });

  it('when the operation is an emergency, then 8 points (Canet 2010)', () => {
    expect(points({ emergency: true })).toBe(8);
  });

  describe('risk class (Canet 2010: low <26, intermediate 26-44, high >=45)', () => {
    it.each([
      // 17 (infection) + 8 (emergency) = 25
      [{ respiratoryInfectionLastMonth: true, emergency: true }, 25, 'low'],
      // 3 (age 60) + 23 (duration 200 min) = 26
      [{ age: 60, durationMinutes: 200 }, 26, 'intermediate'],
      // 3 (age 60) + 17 (infection) + 24 (intrathoracic) = 44
      [{ age: 60, respiratoryInfectionLastMonth: true, incision: 'intrathoracic' }, 44, 'intermediate'],
      // 3 (age 60) + 8 (SpO2 95) + 11 (Hb 10) + 23 (duration 181) = 45
      [{ age: 60, preopSpO2: 95, preopHemoglobin: 10, durationMinutes: 181 }, 45, 'high'],
    ] as const)('when the factors are %o, then %i points and %s risk', (over, expectedPoints, expectedClass) => {
      expect(ariscatScore(with_(over))).toEqual({ points: expectedPoints, riskClass: expectedClass });
    });

    it.each([
      [0, 'low'],
      [25, 'low'],
      [26, 'intermediate'],
      [44, 'intermediate'],
      [45, 'high'],
      [123, 'high'],
    ] as const)('when the total is %i, then the class is %s', (total, expected) => {
      expect(ariscatRiskClass(total)).toBe(expected);
    });
  });

  it('when factors combine, then the breakdown shows each and they add up to the total', () => {
    // 3 (age 65) + 8 (SpO2 94) + 15 (upper abdominal) + 16 (150 min) = 42 (Canet 2010 points)
    const b = ariscatBreakdown(with_({ age: 65, preopSpO2: 94, incision: 'upper-abdominal', durationMinutes: 150 }));
    expect(b.components).toEqual({
      age: 3,
      preopSpO2: 8,
      respiratoryInfectionLastMonth: 0,
      preopHemoglobin: 0,
      incision: 15,
      durationMinutes: 16,
      emergency: 0,
    });
    expect(b.points).toBe(42);
    expect(b.riskClass).toBe('intermediate');
  });

  describe('missing or impossible input throws rather than scoring zero', () => {
    it.each([
      ['age', { age: undefined }],
      ['age', { age: Number.NaN }],
      ['preopSpO2', { preopSpO2: undefined }],
      ['preopSpO2', { preopSpO2: 101 }],
      ['respiratoryInfectionLastMonth', { respiratoryInfectionLastMonth: undefined }],
      ['preopHemoglobin', { preopHemoglobin: undefined }],
      ['preopHemoglobin', { preopHemoglobin: 0 }],
      ['preopHemoglobin', { preopHemoglobin: Number.POSITIVE_INFINITY }],
      ['incision', { incision: undefined }],
      ['incision', { incision: 'lower-abdominal' }],
      ['durationMinutes', { durationMinutes: undefined }],
      ['durationMinutes', { durationMinutes: -1 }],
      ['emergency', { emergency: undefined }],
      ['emergency', { emergency: 'yes' }],
    ])('when %s is %o, then an AnalysisInputError names it', (field, over) => {
      const call = () => ariscatScore({ ...zero, ...(over as object) } as AriscatInput);
      expect(call).toThrow(AnalysisInputError);
      expect(call).toThrow(field);
    });

    it('when haemoglobin looks like g/L, then the error says to convert it', () => {
      expect(() => points({ preopHemoglobin: 135 })).toThrow(/g\/L/);
    });

    it('when there is no input at all, then it throws', () => {
      expect(() => ariscatScore(undefined as unknown as AriscatInput)).toThrow(AnalysisInputError);
    });
  });
});

describe('ariscatIncisionClass', () => {
  it.each([
    ['peripheral', 'peripheral'],
    // Canet 2010 scores only upper abdominal and intrathoracic incisions; lower abdominal is peripheral.
    ['lower-abdominal', 'peripheral'],
    ['head-neck', 'peripheral'],
    ['chest-wall-breast', 'peripheral'],
    ['upper-abdominal', 'upper-abdominal'],
    ['upper-and-lower-abdominal', 'upper-abdominal'],
    ['intrathoracic', 'intrathoracic'],
    ['thoraco-abdominal', 'intrathoracic'],
  ] as const)('when the incision site is %s, then the ARISCAT class is %s', (site, expected) => {
    expect(ariscatIncisionClass(site)).toBe(expected);
  });

  it('when any registry incision site is mapped, then it lands on one of the three ARISCAT classes', () => {
    for (const site of INCISION_SITES) {
      expect(['peripheral', 'upper-abdominal', 'intrathoracic']).toContain(ariscatIncisionClass(site));
    }
  });

  it('when the site is unknown, then it throws', () => {
    expect(() => ariscatIncisionClass('elbow' as IncisionSite)).toThrow(AnalysisInputError);
  });
});

describe('checkAsaUrgency', () => {
  it('when E and urgency agree, then nothing is reported', () => {
    expect(checkAsaUrgency({ asaClass: 'III', asaEmergency: true, urgency: 'emergency' })).toEqual({ errors: [], warnings: [] });
    expect(checkAsaUrgency({ asaClass: 'II', asaEmergency: false, urgency: 'elective' })).toEqual({ errors: [], warnings: [] });
  });

  it('when ASA has E but the operation is elective, then a warning on asaEmergency', () => {
    const r = checkAsaUrgency({ asaClass: 'III', asaEmergency: true, urgency: 'elective' });
    expect(r.errors).toEqual([]);
    expect(r.warnings).toHaveLength(1);
    expect(r.warnings[0].path).toBe('asaEmergency');
    expect(r.warnings[0].message).toMatch(/elective/);
  });

  it('when the operation is an emergency without E, then a warning', () => {
    const r = checkAsaUrgency({ asaClass: 'II', asaEmergency: false, urgency: 'emergency' });
    expect(r.warnings.map((w) => w.path)).toEqual(['asaEmergency']);
  });

  it('when ASA VI carries E, then an error with a hint (ASA classification: no VI E)', () => {
    const r = checkAsaUrgency({ asaClass: 'VI', asaEmergency: true, urgency: 'emergency' });
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0]).toMatchObject({ path: 'asaEmergency' });
    expect(r.errors[0].hint.length).toBeGreaterThan(0);
  });
});
