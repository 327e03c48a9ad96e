// The case schema's cross-field rules. The contradictions are facts of the calendar (common
// practice, no source); ASA VI takes no E modifier (ASA Physical Status Classification System;
// TRADE.md); 1 g/dL = 10 g/L (SI prefixes).
import { describe, expect, it } from 'vitest';
import { CaseCreateSchema, CaseFormSchema, CaseUpdateSchema, caseContradictions } from '../../../shared/registry/case.js';
import { identifierLikeContent, FREE_TEXT_REMINDER } from '../../../shared/registry/text.js';

const SITE = '3f1c2a4e-8b7d-4c6e-9a1b-2d3e4f5a6b7c';
const base = {
  siteId: SITE, surgeryDate: '2025-03-10', admissionDate: '2025-03-09', dischargeDate: '2025-03-15', eligible: true, age: 70,
  preopHaemoglobin: { value: 12, unit: 'g/dL' }, died30d: false, readmitted30d: false, followUpCompletedOn: '2025-04-12',
};
const paths = (r: { success: boolean; error?: { issues: { path: PropertyKey[] }[] } }) => (r.error?.issues ?? []).map((i) => i.path.join('.'));

describe('CaseCreateSchema', () => {
  it('when the case is consistent, then it parses', () => {
    expect(CaseCreateSchema.safeParse(base).success).toBe(true);
  });

  it.each([
    ['discharge before surgery', { dischargeDate: '2025-03-09' }, 'dischargeDate'],
    ['admission after surgery', { admissionDate: '2025-03-11' }, 'admissionDate'],
    ['death before surgery', { died30d: true, deathDate: '2025-03-01', dischargeDate: '2025-03-01' }, 'deathDate'],
    ['discharge after death', { died30d: true, deathDate: '2025-03-12' }, 'dischargeDate'],
    ['a death date while "died" is no', { deathDate: '2025-03-15' }, 'deathDate'],
    ['death more than 30 days after surgery', { died30d: true, deathDate: '2025-04-15', dischargeDate: '2025-04-15' }, 'deathDate'],
    ['a readmission cause without readmission', { readmissionCause: 'other' }, 'readmissionCause'],
    ['an exclusion reason for an eligible case', { exclusionReason: 'day case' }, 'exclusionReason'],
    ['ASA VI with E', { asaClass: 'VI', asaEmergency: true }, 'asaEmergency'],
    ['ICU days beyond the stay', { icuDays: 9 }, 'icuDays'],
    ['follow-up on day 29 of a living patient', { followUpCompletedOn: '2025-04-08' }, 'followUpCompletedOn'],
  ])('when it has %s, then the issue names %s', (_what, change, path) => {
    expect(paths(CaseCreateSchema.safeParse({ ...base, ...change }))).toContain(path);
  });

  it('when the follow-up is on day 30 exactly, then it is accepted (the window is day 0 to day 30)', () => {
    // 2025-03-10 + 30 days = 2025-04-09.
    expect(CaseCreateSchema.safeParse({ ...base, followUpCompletedOn: '2025-04-09' }).success).toBe(true);
  });

  it('when the patient died, then the follow-up may be done before day 30', () => {
    expect(CaseCreateSchema.safeParse({ ...base, died30d: true, deathDate: '2025-03-15', followUpCompletedOn: '2025-03-20' }).success).toBe(true);
  });

  it('when discharge is the day of surgery, then it is a valid stay of 0 days', () => {
    expect(caseContradictions({ surgeryDate: '2025-03-10', dischargeDate: '2025-03-10', admissionDate: '2025-03-10' })).toEqual([]);
  });

  it('when fields are out of range or of the wrong type, then each is named', () => {
    const r = CaseCreateSchema.safeParse({ ...base, age: 121, preopSpO2: 49, heightCm: 'tall', durationMinutes: 0, surgeryDate: '2025-13-01' });
    expect(paths(r)).toEqual(expect.arrayContaining(['age', 'preopSpO2', 'heightCm', 'durationMinutes', 'surgeryDate']));
  });

  it('when haemoglobin is 130 g/dL, then it is refused, while 130 g/L (= 13 g/dL) is accepted', () => {
    expect(paths(CaseCreateSchema.safeParse({ ...base, preopHaemoglobin: { value: 130, unit: 'g/dL' } }))).toContain('preopHaemoglobin.value');
    expect(CaseCreateSchema.safeParse({ ...base, preopHaemoglobin: { value: 130, unit: 'g/L' } }).success).toBe(true);
  });

  it('when an unknown key is sent, then parsing fails', () => {
    const r = CaseCreateSchema.safeParse({ ...base, patientName: 'x' });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0].code).toBe('unrecognized_keys');
  });

  it('when the site or surgery date is missing, then both are named', () => {
    expect(paths(CaseCreateSchema.safeParse({ age: 50 })).sort()).toEqual(['siteId', 'surgeryDate']);
  });
});

describe('CaseUpdateSchema and the form schema', () => {
  it('when an update carries no version, then it is refused naming version', () => {
    expect(paths(CaseUpdateSchema.safeParse({ age: 50 }))).toEqual(['version']);
  });

  it('when an amendment reason is too short, then it is refused', () => {
    expect(paths(CaseUpdateSchema.safeParse({ version: 3, amendmentReason: 'ok' }))).toEqual(['amendmentReason']);
  });

  it('when the form holds a contradiction, then the form schema names it too (the client checks the same rules)', () => {
    expect(paths(CaseFormSchema.safeParse({ surgeryDate: '2025-03-10', dischargeDate: '2025-03-01' }))).toEqual(['dischargeDate']);
  });
});

describe('free text', () => {
  it.each([
    ['an e-mail address', 'contact j.doe@example.org', true],
    ['a record number with spaces', 'MRN 123 456 789', true],
    ['a phone number with dashes', '06-12-34-56-78', true],
    ['a short count', 'two of 3 sessions, 12 minutes', false],
    ['a date-like short number', 'seen on day 5', false],
  ])('when the text holds %s, then identifier-like is %s', (_w, text, flagged) => {
    expect(identifierLikeContent(text) !== null).toBe(flagged);
  });

  it('when notes hold an identifier, then the message carries the reminder', () => {
    const r = CaseCreateSchema.safeParse({ ...base, notes: 'NHS 943 476 5919' });
    expect(r.error!.issues[0].message).toContain(FREE_TEXT_REMINDER);
  });
});
