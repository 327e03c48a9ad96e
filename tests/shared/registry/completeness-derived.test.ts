import { describe, expect, it } from 'vitest';
import { caseCompleteness, ELIGIBLE_CASE_RULES } from '../../../shared/registry/completeness.js';
import { deriveCase, episodeAdherence, patientDays, todayIn } from '../../../shared/registry/derived.js';
import { TRANSITIONS, findTransition } from '../../../shared/registry/status.js';

const full: Record<string, unknown> = {
  eligible: true, admissionDate: '2025-03-09', age: 70, sex: 'female', heightCm: 160, weightKg: 60, asaClass: 'II', asaEmergency: false, smokingStatus: 'never', copd: false,
  obstructiveSleepApnoea: false, heartFailure: false, preopSpO2: 97, preopHaemoglobin: { value: 12, unit: 'g/dL' }, respiratoryInfectionLastMonth: false, functionalStatus: 'independent',
  surgeryDate: '2025-03-10', procedureCategory: 'colorectal', incisionSite: 'lower-abdominal', approach: 'laparoscopic', urgency: 'elective', anaesthesia: 'general', durationMinutes: 140,
  therapyGiven: false, complicationsReviewed: true, dischargeDate: '2025-03-15', icuDays: 0, ventilatorDays: 0, readmitted30d: false, died30d: false, followUpCompletedOn: '2025-04-10',
};

describe('completeness', () => {
  it('when every required field is filled, then the case is complete', () => {
    expect(caseCompleteness(full, [], [])).toMatchObject({ complete: true, missing: [] });
  });

  it('when each required field in turn is emptied, then exactly that field is reported in its section', () => {
    for (const r of ELIGIBLE_CASE_RULES.filter((x) => !x.when)) {
      const c = caseCompleteness({ ...full, [r.field]: null }, [], []);
      expect(c.missing.map((m) => m.field), r.field).toEqual([r.field]);
    }
  });

  it('when readmitted or died, then the cause and date become required', () => {
    expect(caseCompleteness({ ...full, readmitted30d: true }, [], []).missing.map((m) => m.field)).toEqual(['readmissionCause']);
    expect(caseCompleteness({ ...full, died30d: true }, [], []).missing.map((m) => m.field)).toEqual(['deathDate']);
  });

  it('when the complications review is answered "no", then the outcomes section is not complete', () => {
    expect(caseCompleteness({ ...full, complicationsReviewed: false }, [], []).sections.outcomes).toBe(1);
  });

  it('when the case is not eligible, then only eligibility, the reason and the surgery date are required', () => {
    expect(caseCompleteness({ eligible: false, exclusionReason: 'day case', surgeryDate: '2025-03-10' }, [], []).complete).toBe(true);
    expect(caseCompleteness({ eligible: false, surgeryDate: '2025-03-10' }, [], []).missing.map((m) => m.field)).toEqual(['exclusionReason']);
  });

  it('when therapy was given, then at least one episode with its counts is required', () => {
    expect(caseCompleteness({ ...full, therapyGiven: true }, [], []).missing.map((m) => m.field)).toEqual(['therapy.episodes']);
    const c = caseCompleteness({ ...full, therapyGiven: true }, [{ id: 'e1', modality: 'pep', startPostoperativeDay: 1, sessionsPrescribed: null, sessionsDelivered: 4 }], []);
    expect(c.missing.map((m) => m.field)).toEqual(['therapy.e1.sessionsPrescribed']);
  });
});

describe('derived measures', () => {
  const c = { status: 'verified' as const, admissionDate: '2025-03-09', surgeryDate: '2025-03-10', dischargeDate: '2025-03-15', heightCm: 160, weightKg: 64 };

  it('when a case is derived, then stays, window and composite follow the stated rules', () => {
    const d = deriveCase(c, [{ startPostoperativeDay: 2 }, { startPostoperativeDay: 1 }], [{ type: 'reintubation' }, { type: 'pleural-effusion' }], '2025-04-10');
    // Calendar days: admission 03-09 to discharge 03-15 = 6; surgery 03-10 to discharge = 5.
    expect(d.lengthOfStayDays).toBe(6);
    expect(d.postoperativeStayDays).toBe(5);
    // BMI = 64 / 1.6^2 = 25.0 kg/m2 (WHO definition).
    expect(d.bmi).toBe(25);
    // Window: day 0 (2025-03-10) to day 30 (2025-04-09); closed from day 31.
    expect(d.followUpWindowEnd).toBe('2025-04-09');
    expect(d.followUpClosed).toBe(true);
    expect(d.daysToFirstTherapy).toBe(1);
    expect(d.anyPpc).toBe(true);
    expect(d.reintubation).toBe(true);
    expect(d.countsInAnalysis).toBe(true);
    expect(d.surveillanceMonth).toBe('2025-03');
  });

  it('when only reintubation or ARDS is recorded, then "any PPC" is false (they are reported apart; Canet 2010, Jammer 2015)', () => {
    expect(deriveCase(c, [], [{ type: 'reintubation' }, { type: 'ards' }], '2025-04-10').anyPpc).toBe(false);
  });

  it('when a case is a draft or withdrawn, then it does not count in analyses', () => {
    expect(deriveCase({ ...c, status: 'draft' }, [], [], '2025-04-10').countsInAnalysis).toBe(false);
    expect(deriveCase({ ...c, status: 'withdrawn' }, [], [], '2025-04-10').countsInAnalysis).toBe(false);
  });

  it('when a date is missing, then the measure is empty rather than an error', () => {
    const d = deriveCase({ ...c, dischargeDate: null, admissionDate: null }, [], [], '2025-03-20');
    expect(d.lengthOfStayDays).toBeNull();
    expect(patientDays(c.surgeryDate, null)).toBeNull();
    expect(d.followUpClosed).toBe(false);
  });

  it('when nothing was prescribed, then adherence is empty; more than prescribed caps at 1', () => {
    expect(episodeAdherence({ sessionsDelivered: 3, sessionsPrescribed: 0 })).toBeNull();
    expect(episodeAdherence({ sessionsDelivered: 12, sessionsPrescribed: 10 })).toBe(1);
    expect(episodeAdherence({ sessionsDelivered: 9, sessionsPrescribed: 12 })).toBe(0.75);
  });

  it('when it is 23:30 UTC on 31 March 2024, then it is already 1 April in Lisbon (summer time, UTC+1)', () => {
    // EU summer time starts on the last Sunday of March at 01:00 UTC (Directive 2000/84/EC):
    // 2024-03-31 01:00 UTC; Portugal is then UTC+1 (from memory).
    expect(todayIn('Europe/Lisbon', new Date('2024-03-31T23:30:00Z'))).toBe('2024-04-01');
    expect(todayIn('Europe/Lisbon', new Date('2024-01-31T23:30:00Z'))).toBe('2024-01-31');
  });
});

describe('workflow table', () => {
  it('when the moves are listed, then a draft cannot be verified, only a verified case can be locked, and withdrawal needs a reason', () => {
    expect(findTransition('draft', 'verified')).toBeUndefined();
    expect(TRANSITIONS.filter((x) => x.to === 'locked').flatMap((x) => x.from)).toEqual(['verified']);
    expect(TRANSITIONS.filter((x) => x.to === 'withdrawn').every((x) => x.needsReason)).toBe(true);
    expect(findTransition('complete', 'verified')!.roles).not.toContain('committee');
    expect(TRANSITIONS.some((x) => x.roles.includes('researcher'))).toBe(false);
  });
});
