import { describe, expect, it } from 'vitest';
import { CaseCreateSchema } from '../../../shared/registry/case.js';
import { CaseFormSchema, changedCaseFields, emptyForm, findConflicts, mergeAfterConflict, type CaseFormValues } from '../../../src/features/cases/form-model.js';

const SITE = '7b0c1f0e-8a3a-4c36-9a52-1f6a7f6b3c01';
const base: CaseFormValues = { ...emptyForm(SITE), surgeryDate: '2026-10-06', age: 65, weightKg: 82, icuDays: 0, therapy: [{ recordId: 'e1', modality: 'pep', sessionsPrescribed: 20, sessionsDelivered: 10 }] };

describe('the form checks what the server checks', () => {
  const paths = (r: { success: boolean; error?: { issues: { path: PropertyKey[] }[] } }) => (r.error?.issues ?? []).map((i) => i.path.join('.')).sort();

  it('when dates contradict each other, then the form names the same fields as the server schema', () => {
    // The server's CaseCreateSchema is the reference: the form may not accept what it refuses.
    const input = { ...emptyForm(SITE), surgeryDate: '2026-10-06', admissionDate: '2026-10-08', dischargeDate: '2026-10-01', therapy: [], outcomes: [] };
    const { therapy: _t, outcomes: _o, amendmentReason: _a, localIdentifier: _l, ...caseOnly } = input;
    const server = CaseCreateSchema.safeParse(Object.fromEntries(Object.entries(caseOnly).filter(([, v]) => v !== null)));
    const client = CaseFormSchema.safeParse(input);
    expect(client.success).toBe(false);
    expect(paths(client)).toEqual(paths(server));
    expect(paths(client)).toEqual(['admissionDate', 'dischargeDate']);
  });

  it('when a setting does not apply to the modality, then the episode is refused as the server refuses it', () => {
    // Incentive spirometry has a volume target and no flow or pressure (AARC incentive spirometry guideline 2011).
    const r = CaseFormSchema.safeParse({ ...base, therapy: [{ modality: 'incentive-spirometry', flowLpm: 5 }], outcomes: [] });
    expect(r.success).toBe(false);
    expect(paths(r)).toEqual(['therapy.0.flowLpm']);
  });

  it('when more sessions were delivered than prescribed without a reason, then the episode says so', () => {
    const r = CaseFormSchema.safeParse({ ...base, therapy: [{ modality: 'pep', sessionsPrescribed: 10, sessionsDelivered: 12 }], outcomes: [] });
    expect(paths(r)).toContain('therapy.0.deliveredAbovePrescribedReason');
  });
});

describe('a 409 conflict resolved as a three-way merge', () => {
  // Three-way merge against the common ancestor (the version read), as diff3 does: a change made
  // on one side only is taken; a field changed differently on both sides is a conflict for the
  // user to decide (Khanna, Kunal, Pierce, "A formal investigation of diff3", FSTTCS 2007; from memory).
  const mine: CaseFormValues = { ...base, weightKg: 84, age: 66, therapy: [{ ...base.therapy[0], sessionsDelivered: 12 }, { modality: 'cpap' }] };
  const theirs: CaseFormValues = { ...base, weightKg: 80, icuDays: 1, therapy: [{ ...base.therapy[0], sessionsDelivered: 14 }] };

  it('when both changed the same fields, then only those are conflicts, with both values', () => {
    expect(findConflicts(mine, base, theirs).map((c) => [c.path, c.mine, c.theirs])).toEqual([
      ['weightKg', 84, 80],
      ['therapy.0.sessionsDelivered', 12, 14],
    ]);
  });

  it('when the user keeps theirs for one conflict, then every other change of theirs and of mine survives', () => {
    const merged = mergeAfterConflict(mine, base, theirs, new Set(['weightKg']));
    expect(merged.weightKg).toBe(80); // chosen: theirs
    expect(merged.age).toBe(66); // only I changed it
    expect(merged.icuDays).toBe(1); // only they changed it
    expect(merged.therapy[0].sessionsDelivered).toBe(12); // conflict, mine kept (default)
    expect(merged.therapy[1]).toEqual({ modality: 'cpap' }); // my unsaved new episode is not lost
    // What the next save sends against their version: only my side of the merge.
    expect(changedCaseFields(merged, theirs)).toEqual(['age']);
  });

  it('when nobody changed a field, then it is no conflict', () => {
    expect(findConflicts(base, base, base)).toEqual([]);
  });
});
