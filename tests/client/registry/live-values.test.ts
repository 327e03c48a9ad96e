import { describe, expect, it } from 'vitest';
import { emptyForm, type CaseFormValues } from '../../../src/features/cases/form-model.js';
import { liveAriscat, liveValues } from '../../../src/features/cases/live-values.js';

const form = (over: Partial<CaseFormValues>): CaseFormValues => ({ ...emptyForm('7b0c1f0e-8a3a-4c36-9a52-1f6a7f6b3c01'), ...over });
const SCORED: Partial<CaseFormValues> = {
  age: 65, preopSpO2: 94, respiratoryInfectionLastMonth: false, preopHaemoglobin: { value: 13, unit: 'g/dL' },
  incisionSite: 'upper-abdominal', durationMinutes: 150, urgency: 'elective',
};

describe('ARISCAT as the form computes it', () => {
  it('when the inputs are those of the worked example, then 42 points, intermediate', () => {
    // Canet J et al., Anesthesiology 2010;113:1338-50, Table 4: age 51-80 = 3, SpO2 91-95% = 8,
    // upper abdominal incision = 15, duration 2-3 h = 16; total 42, intermediate risk (26-44).
    const a = liveAriscat(form(SCORED));
    expect(a.result).toMatchObject({ points: 42, riskClass: 'intermediate', components: { age: 3, preopSpO2: 8, incision: 15, durationMinutes: 16, emergency: 0, preopHemoglobin: 0 } });
  });

  it('when haemoglobin is entered in g/L, then it is converted before the anaemia factor is scored', () => {
    // Canet 2010: preoperative anaemia (Hb <= 10 g/dL) = 11 points; 95 g/L = 9.5 g/dL (1 g/dL = 10 g/L, SI prefixes).
    const a = liveAriscat(form({ ...SCORED, preopHaemoglobin: { value: 95, unit: 'g/L' } }));
    expect(a.result?.components.preopHemoglobin).toBe(11);
    expect(a.result?.points).toBe(53);
    expect(a.result?.riskClass).toBe('high'); // Canet 2010: >= 45 high
  });

  it('when the incision is lower abdominal, then ARISCAT scores it as peripheral', () => {
    // Canet 2010 scores only upper abdominal (15) and intrathoracic (24) incisions; others are 0.
    expect(liveAriscat(form({ ...SCORED, incisionSite: 'lower-abdominal' })).result?.points).toBe(27);
  });

  it('when emergency comes from urgency, then 8 points are added', () => {
    // Canet 2010: emergency procedure = 8 points.
    expect(liveAriscat(form({ ...SCORED, urgency: 'emergency' })).result?.points).toBe(50);
  });

  it('when an input is missing, then no score is shown and the missing inputs are named', () => {
    const a = liveAriscat(form({ ...SCORED, preopSpO2: null, durationMinutes: null }));
    expect(a.result).toBeNull();
    expect(a.missing).toEqual(['Pre-operative SpO2 on room air', 'Duration of surgery']);
  });
});

describe('other values computed as the abstractor types', () => {
  it('when height, weight and dates are entered, then BMI, stays and the follow-up window follow', () => {
    const v = liveValues(form({ heightCm: 175, weightKg: 82, admissionDate: '2026-10-05', surgeryDate: '2026-10-06', dischargeDate: '2026-10-14' }), '2026-11-06');
    // WHO: BMI = weight / height^2 = 82 / 1.75^2 = 26.775...
    expect(v.bmi).toBeCloseTo(26.7755, 3);
    // Calendar days (common practice, no source): 5 Oct -> 14 Oct = 9; 6 Oct -> 14 Oct = 8.
    expect(v.lengthOfStayDays).toBe(9);
    expect(v.postoperativeStayDays).toBe(8);
    // Day 0 to day 30 inclusive (common practice, no source): 6 Oct + 30 days = 5 Nov; closed from 6 Nov.
    expect(v.followUpWindowEnd).toBe('2026-11-05');
    expect(v.followUpClosed).toBe(true);
  });

  it('when episodes have counts and start days, then adherence and days to first therapy follow', () => {
    const v = liveValues(form({ surgeryDate: '2026-10-06', therapy: [
      { modality: 'incentive-spirometry', startPostoperativeDay: 2, sessionsPrescribed: 30, sessionsDelivered: 24 },
      { modality: 'early-mobilisation', startPostoperativeDay: 1, sessionsPrescribed: 0, sessionsDelivered: 0 },
    ] }), '2026-10-07');
    // Adherence = delivered / prescribed (common practice, no source): 24 / 30 = 0.8; nothing prescribed -> none.
    expect(v.adherence).toEqual([0.8, null]);
    expect(v.daysToFirstTherapy).toBe(1);
  });
});
