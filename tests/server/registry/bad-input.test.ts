// Bad input (issue 3): every out-of-range, contradictory or unknown value is a 400 naming each
// field, and nothing is written. The contradictions are facts of the calendar (discharge cannot
// precede surgery, ...): common practice (no source). Each test counts cases, episodes, events
// and audit entries before and after.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers.js';
import { completeCase, counts, createCase, daysAgo, siteIds } from './factories.js';

let t: TestApp;
let site: Record<string, string>;
beforeAll(async () => {
  t = await startTestApp();
  site = await siteIds(t.ds);
});
afterAll(async () => { await t.close(); });

async function expectRefused(send: () => Promise<{ status: number; body: any }>, paths: string[]) {
  const before = await counts(t.ds);
  const r = await send();
  expect(r.status, JSON.stringify(r.body)).toBe(400);
  expect(r.body.error.hint).toMatch(/nothing was saved/);
  const got = r.body.error.fields.map((f: { path: string }) => f.path);
  for (const p of paths) expect(got, `field ${p}`).toContain(p);
  expect(await counts(t.ds)).toEqual(before);
  return r.body.error;
}

describe('case contradictions', () => {
  const cases: [string, Record<string, unknown>, string][] = [
    ['discharge before surgery', { dischargeDate: daysAgo(62) }, 'dischargeDate'],
    ['admission after surgery', { admissionDate: daysAgo(59) }, 'admissionDate'],
    ['death before surgery', { died30d: true, deathDate: daysAgo(61), dischargeDate: daysAgo(61) }, 'deathDate'],
    ['discharge after death', { died30d: true, deathDate: daysAgo(55) }, 'dischargeDate'],
    ['a date of death while "died" is no', { deathDate: daysAgo(53) }, 'deathDate'],
    ['a readmission cause without a readmission', { readmissionCause: 'respiratory' }, 'readmissionCause'],
    ['an exclusion reason for an eligible case', { exclusionReason: 'day case' }, 'exclusionReason'],
    ['ASA VI with the E modifier (ASA classification: VI takes no E)', { asaClass: 'VI', asaEmergency: true }, 'asaEmergency'],
    ['follow-up before day 30 of a living patient', { followUpCompletedOn: daysAgo(40) }, 'followUpCompletedOn'],
    ['ICU days longer than the stay', { icuDays: 20 }, 'icuDays'],
    ['a surgery date in the future', { surgeryDate: daysAgo(-3), admissionDate: daysAgo(-3), dischargeDate: null, followUpCompletedOn: null }, 'surgeryDate'],
  ];
  for (const [what, change, path] of cases) {
    it(`when a new case has ${what}, then it is refused naming ${path}`, async () => {
      const ab = await t.as('abstractor');
      await expectRefused(() => ab.post('/api/cases', completeCase(site.HBR, change)), [path]);
    });
  }

  it('when an update contradicts a stored date (discharge before the stored surgery date), then it is refused and the case is unchanged', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    await expectRefused(() => ab.patch(`/api/cases/${k.id}`, { version: k.version, dischargeDate: daysAgo(70) }), ['dischargeDate']);
    const [row] = await t.ds.query(`SELECT discharge_date::text AS d, version FROM surgical_cases WHERE id = $1`, [k.id]);
    expect(row).toEqual({ d: daysAgo(53), version: 1 });
  });
});

describe('types, ranges and unknown fields', () => {
  it('when several fields are wrong at once, then every one is named in the same answer', async () => {
    const ab = await t.as('abstractor');
    const err = await expectRefused(
      () => ab.post('/api/cases', completeCase(site.HBR, { age: 130, preopSpO2: 101, durationMinutes: -5, sex: 'unknown', heightCm: 'tall', asaClass: '7', surgeryDate: '2025-02-30' })),
      ['age', 'preopSpO2', 'durationMinutes', 'sex', 'heightCm', 'asaClass', 'surgeryDate'],
    );
    expect(err.code).toBe('validation_failed');
  });

  it('when a haemoglobin is typed in the wrong unit (130 g/dL), then it is refused; 130 g/L is accepted', async () => {
    // 130 g/dL is 1,300 g/L, beyond any real value; 130 g/L = 13 g/dL (1 g/dL = 10 g/L).
    const ab = await t.as('abstractor');
    await expectRefused(() => ab.post('/api/cases', completeCase(site.HBR, { preopHaemoglobin: { value: 130, unit: 'g/dL' } })), ['preopHaemoglobin.value']);
    await expectRefused(() => ab.post('/api/cases', completeCase(site.HBR, { preopHaemoglobin: { value: 13, unit: 'mmol/L' } })), ['preopHaemoglobin.unit']);
    const ok = await createCase(ab, completeCase(site.HBR, { preopHaemoglobin: { value: 130, unit: 'g/L' } }));
    expect(ok.preopHaemoglobin).toEqual({ value: 13, unit: 'g/dL' });
  });

  it('when an unknown field is sent, then it is refused under its own name', async () => {
    const ab = await t.as('abstractor');
    await expectRefused(() => ab.post('/api/cases', completeCase(site.HBR, { patientName: 'x', mrn: 'y' })), ['patientName', 'mrn']);
  });

  it('when free text looks like an identifier (e-mail, long number), then it is refused with the reminder', async () => {
    const ab = await t.as('abstractor');
    const err = await expectRefused(() => ab.post('/api/cases', completeCase(site.HBR, { notes: 'call back on 0612 345 678' })), ['notes']);
    expect(err.fields[0].message).toMatch(/Do not enter names, record numbers/);
    await expectRefused(() => ab.post('/api/cases', completeCase(site.HBR, { notes: 'ask j.doe@example.org' })), ['notes']);
    await expectRefused(() => ab.post('/api/cases', completeCase(site.HBR, { notes: 'x'.repeat(501) })), ['notes']);
  });

  it('when the unit is not one of the site\u2019s units, then it is refused naming unitId', async () => {
    const ab = await t.as('abstractor');
    const [other] = await t.ds.query(`SELECT id FROM units WHERE site_id = $1 LIMIT 1`, [site.KSV]);
    await expectRefused(() => ab.post('/api/cases', completeCase(site.HBR, { unitId: other.id })), ['unitId']);
  });

  it('when the version is missing from an update, then it is refused naming version', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    await expectRefused(() => ab.patch(`/api/cases/${k.id}`, { age: 40 }), ['version']);
  });

  it('when the list filter has an unknown sort field or a reversed date range, then it is refused naming it', async () => {
    const ab = await t.as('abstractor');
    const r = await ab.get('/api/cases?sort=password.asc&surgeryFrom=2025-02-01&surgeryTo=2025-01-01');
    expect(r.status).toBe(400);
    expect(r.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['sort', 'surgeryTo']);
  });
});

describe('therapy and outcome contradictions', () => {
  it('when more sessions are delivered than prescribed without a reason, then the episode is refused; with a reason it is stored', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const episode = { caseVersion: k.version, modality: 'incentive-spirometry', startPostoperativeDay: 1, sessionsPrescribed: 10, sessionsDelivered: 12 };
    await expectRefused(() => ab.post(`/api/cases/${k.id}/therapy`, episode), ['deliveredAbovePrescribedReason']);
    const ok = await ab.post(`/api/cases/${k.id}/therapy`, { ...episode, deliveredAbovePrescribedReason: 'extra sessions at the patient\u2019s request' });
    expect(ok.status).toBe(201);
    // Adherence is capped at 1 (delivered / prescribed; analysis/clinical adherence).
    expect(ok.body.therapy[0].adherence).toBe(1);
  });

  it('when a setting does not apply to the modality or is impossible, then the episode is refused naming it', async () => {
    // Incentive spirometry has no flow or pressure setting; flowmeters read 0-15 L/min
    // (common practice, no source; shared/clinical/modalities.ts).
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    await expectRefused(() => ab.post(`/api/cases/${k.id}/therapy`, { caseVersion: k.version, modality: 'incentive-spirometry', flowLpm: 5 }), ['flowLpm']);
    await expectRefused(() => ab.post(`/api/cases/${k.id}/therapy`, { caseVersion: k.version, modality: 'pap-device', flowLpm: 16 }), ['flowLpm']);
    await expectRefused(() => ab.post(`/api/cases/${k.id}/therapy`, { caseVersion: k.version, modality: 'cpap', startPostoperativeDay: 3, endPostoperativeDay: 2 }), ['endPostoperativeDay']);
  });

  it('when an outcome starts before surgery or after day 30, then it is refused naming the onset', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    await expectRefused(() => ab.post(`/api/cases/${k.id}/outcomes`, { caseVersion: k.version, type: 'atelectasis', onsetPostoperativeDay: -1 }), ['onsetPostoperativeDay']);
    await expectRefused(() => ab.post(`/api/cases/${k.id}/outcomes`, { caseVersion: k.version, type: 'atelectasis', onsetPostoperativeDay: 31 }), ['onsetPostoperativeDay']);
  });

  it('when an observation\u2019s date and post-operative day disagree, then the event is refused naming that observation', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const obs = [{ id: 'x1', kind: 'spo2', percent: 88, breathing: 'room-air', date: daysAgo(58), postoperativeDay: 5 }];
    await expectRefused(() => ab.post(`/api/cases/${k.id}/outcomes`, { caseVersion: k.version, type: 'respiratory-failure', onsetPostoperativeDay: 2, observations: obs }), ['observations.0.postoperativeDay']);
  });

  it('when an observation has an impossible value or unknown kind, then it is refused naming it', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    await expectRefused(
      () => ab.post(`/api/cases/${k.id}/outcomes`, { caseVersion: k.version, type: 'respiratory-infection', onsetPostoperativeDay: 2, observations: [{ id: 't', kind: 'temperature-max', value: 58, unit: 'degC', postoperativeDay: 2 }, { id: 'u', kind: 'mood', postoperativeDay: 2 }] }),
      ['observations.0.value', 'observations.1.kind'],
    );
  });
});
