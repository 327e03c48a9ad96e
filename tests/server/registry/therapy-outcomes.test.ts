import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers.js';
import { completeCase, createCase, daysAgo, siteIds } from './factories.js';

let t: TestApp;
let site: Record<string, string>;
beforeAll(async () => {
  t = await startTestApp();
  site = await siteIds(t.ds);
});
afterAll(async () => { await t.close(); });

const CAUTION = "Local protocol and the clinician's judgement decide";

describe('therapy episodes', () => {
  it('when a PEP pressure is outside the usual 10-20 cm H2O, then the episode is stored with a warning carrying the caution', async () => {
    // PEP and threshold resistors usually 10-20 cm H2O (AARC CPG, Respir Care 1993; TRADE.md).
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR, { therapyGiven: true }));
    const r = await ab.post(`/api/cases/${k.id}/therapy`, { caseVersion: k.version, modality: 'pep', startPostoperativeDay: 1, sessionsPrescribed: 8, sessionsDelivered: 6, expiratoryPressureCmH2O: 22, interface: 'mask' });
    expect(r.status).toBe(201);
    const ep = r.body.therapy[0];
    expect(ep.expiratoryPressureCmH2O).toBe(22);
    // Adherence = delivered / prescribed = 6 / 8 = 0.75.
    expect(ep.adherence).toBe(0.75);
    expect(ep.warnings).toHaveLength(1);
    expect(ep.warnings[0].path).toBe('expiratoryPressureCmH2O');
    expect(ep.warnings[0].message).toContain(CAUTION);
    expect(r.body.derived.daysToFirstTherapy).toBe(1);
    expect(r.body.completeness.complete).toBe(true);
  });

  it('when inspiratory capacity is under 10 mL/kg of predicted body weight, then the PBW used is stored and the indication warning shown', async () => {
    // ARDS Network (N Engl J Med 2000;342:1301-8): male PBW = 50 + 0.91 x (175 - 152.4) = 70.566 kg.
    // IC 600 mL / 70.566 kg = 8.5 mL/kg, under 10 mL/kg (common practice, no source).
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR, { therapyGiven: true, heightCm: 175, sex: 'male' }));
    const r = await ab.post(`/api/cases/${k.id}/therapy`, { caseVersion: k.version, modality: 'incentive-spirometry', startPostoperativeDay: 0, sessionsPrescribed: 20, sessionsDelivered: 15, inspiratoryCapacityMl: 600, volumeTargetMl: 1500 });
    expect(r.status).toBe(201);
    const ep = r.body.therapy[0];
    expect(ep.predictedBodyWeightKg).toBe(70.6);
    expect(ep.warnings.some((w: { path: string; message: string }) => w.path === 'inspiratoryCapacityMl' && w.message.includes(CAUTION))).toBe(true);
  });

  it('when an episode is changed and then removed with a reason, then the row is kept, audited, and the case version rises each time', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR, { therapyGiven: true }));
    const added = (await ab.post(`/api/cases/${k.id}/therapy`, { caseVersion: k.version, modality: 'cpap', startPostoperativeDay: 1, sessionsPrescribed: 6, sessionsDelivered: 6, expiratoryPressureCmH2O: 8, flowLpm: 10, interface: 'mask' })).body;
    const epId = added.therapy[0].id;
    const changed = await ab.patch(`/api/cases/${k.id}/therapy/${epId}`, { caseVersion: added.version, expiratoryPressureCmH2O: 10 });
    expect(changed.status).toBe(200);
    expect(changed.body.version).toBe(added.version + 1);
    const removed = await ab.agent.delete(`/api/cases/${k.id}/therapy/${epId}`).set('x-csrf-token', ab.csrf).send({ caseVersion: changed.body.version, reason: 'entered on the wrong case' });
    expect(removed.status).toBe(200);
    expect(removed.body.therapy).toEqual([]);
    const [row] = await t.ds.query(`SELECT removed_reason, expiratory_pressure_cm_h2o FROM therapy_episodes WHERE id = $1`, [epId]);
    expect(row).toEqual({ removed_reason: 'entered on the wrong case', expiratory_pressure_cm_h2o: '10.0' });
    const trail = (await ab.get(`/api/cases/${k.id}/audit`)).body.items.map((e: any) => `${e.action} ${e.field}`);
    expect(trail).toContain(`therapy-changed therapy.${epId}.expiratoryPressureCmH2O`);
    expect(trail).toContain(`therapy-removed therapy.${epId}`);
  });
});

/**
 * A post-operative pneumonia that meets CDC/NHSN PNU1 (Patient Safety Component Manual 2022,
 * ch. 6): two serial radiographs with new then persistent consolidation (imaging); fever above
 * 38.0 °C (one of the systemic signs); new cough and rales (two of the respiratory signs).
 * The temperature is entered as 101.3 °F = (101.3 - 32) x 5/9 = 38.5 °C.
 */
function pneumoniaObservations() {
  return [
    { id: 'img1', kind: 'chest-imaging', modality: 'radiograph', findings: [{ type: 'consolidation', course: 'new' }], postoperativeDay: 3 },
    { id: 'img2', kind: 'chest-imaging', modality: 'radiograph', findings: [{ type: 'consolidation', course: 'persistent' }], postoperativeDay: 5 },
    { id: 'temp', kind: 'temperature-max', value: 101.3, unit: 'degF', postoperativeDay: 3 },
    { id: 'cough', kind: 'respiratory-sign', sign: 'cough', onset: 'new', postoperativeDay: 3 },
    { id: 'rales', kind: 'auscultation', finding: 'rales', newSinceBaseline: true, postoperativeDay: 4 },
    { id: 'abx', kind: 'antibiotics-started', indication: 'suspected-respiratory-infection', postoperativeDay: 3 },
  ];
}

describe('outcome events and definitions', () => {
  it('when a pneumonia is entered as observations, then each definition is evaluated and stored with its name and version', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const r = await ab.post(`/api/cases/${k.id}/outcomes`, { caseVersion: k.version, type: 'respiratory-infection', onsetPostoperativeDay: 3, clavienDindo: 'II', observations: pneumoniaObservations() });
    expect(r.status).toBe(201);
    const ev = r.body.outcomes[0];
    expect(ev.definition).toBe('nhsn-pnu1');
    expect(ev.definitionVersion).toBe('2022');
    const byDef = Object.fromEntries(ev.evaluations.map((e: any) => [e.definition, e]));
    expect(byDef['nhsn-pnu1']).toMatchObject({ name: 'CDC/NHSN PNU1', version: '2022', met: true, error: null });
    // Date of event: the first element in the window (day 3); admission on day -1 is hospital day 1,
    // so day 3 is hospital day 5: healthcare-associated, not present on admission (NHSN ch. 2).
    expect(byDef['nhsn-pnu1'].result.dateOfEvent).toBe(daysAgo(57));
    expect(byDef['nhsn-pnu1'].result.presentOnAdmission).toBe(false);
    // EPCO respiratory infection: antibiotics for a suspected respiratory infection plus new opacities / fever (Jammer 2015).
    expect(byDef.epco).toMatchObject({ name: 'EPCO', version: '2015', met: true });
    expect(byDef.melbourne).toMatchObject({ name: 'Melbourne Group Scale', version: '3' });
    // Stored in one unit: 101.3 °F -> 38.5 °C.
    expect(ev.observations.find((o: any) => o.id === 'temp')).toMatchObject({ value: 38.5, unit: 'degC' });
    expect(r.body.derived).toMatchObject({ anyPpc: true, pneumoniaNhsn: true });
    const [row] = await t.ds.query(`SELECT pneumonia_nhsn_met FROM outcome_events WHERE id = $1`, [ev.id]);
    expect(row.pneumonia_nhsn_met).toBe(true);
  });

  it('when the fever is 38.0 °C exactly, then PNU1\u2019s "above 38.0 °C" is not met by it and no other systemic sign is present', async () => {
    // NHSN PNU1: fever > 38.0 °C (a strict inequality).
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const obs = pneumoniaObservations().map((o) => (o.id === 'temp' ? { ...o, value: 38.0, unit: 'degC' } : o));
    const r = await ab.post(`/api/cases/${k.id}/outcomes`, { caseVersion: k.version, type: 'respiratory-infection', onsetPostoperativeDay: 3, observations: obs });
    expect(r.status).toBe(201);
    const pnu1 = r.body.outcomes[0].evaluations.find((e: any) => e.definition === 'nhsn-pnu1');
    expect(pnu1.met).toBe(false);
    expect(r.body.derived.pneumoniaNhsn).toBe(false);
    expect(r.body.derived.anyPpc).toBe(true);
  });

  it('when a case has only a reintubation, then it is recorded but not counted in "any PPC" (reported separately)', async () => {
    // The composite of ARISCAT and EPCO leaves reintubation and ARDS out (Canet 2010; Jammer 2015; TRADE.md).
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const r = await ab.post(`/api/cases/${k.id}/outcomes`, { caseVersion: k.version, type: 'reintubation', onsetPostoperativeDay: 1, clavienDindo: 'IVa' });
    expect(r.status).toBe(201);
    expect(r.body.derived).toMatchObject({ anyPpc: false, reintubation: true });
  });

  it('when the case has no admission date, then PNU1 is stored as "not evaluated" with the reason, not as "not met"', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR, { admissionDate: null }));
    const r = await ab.post(`/api/cases/${k.id}/outcomes`, { caseVersion: k.version, type: 'respiratory-infection', onsetPostoperativeDay: 3, observations: pneumoniaObservations() });
    expect(r.status).toBe(201);
    const pnu1 = r.body.outcomes[0].evaluations.find((e: any) => e.definition === 'nhsn-pnu1');
    expect(pnu1.error).toMatch(/admissionDate/);
  });
});

describe('re-applying a definition to earlier events', () => {
  it('when a stored result was judged under an older version, then it is listed as a difference, and applying it updates the event, raises the version and is audited', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const added = (await ab.post(`/api/cases/${k.id}/outcomes`, { caseVersion: k.version, type: 'respiratory-infection', onsetPostoperativeDay: 3, observations: pneumoniaObservations() })).body;
    const evId = added.outcomes[0].id;
    // Simulate a result stored under an earlier version that judged the event "not met".
    await t.ds.query(
      `UPDATE outcome_events SET definition_version = '2021', pneumonia_nhsn_met = false,
              evaluations = (SELECT jsonb_agg(CASE WHEN e->>'definition' = 'nhsn-pnu1' THEN e || '{"version": "2021", "met": false}'::jsonb ELSE e END) FROM jsonb_array_elements(evaluations) e)
        WHERE id = $1`,
      [evId],
    );
    const list = await ab.get(`/api/outcomes/reevaluation?definition=nhsn-pnu1&siteId=${site.HBR}&pageSize=200`);
    expect(list.status).toBe(200);
    expect(list.body.currentVersion).toBe('2022');
    const item = list.body.items.find((i: any) => i.eventId === evId);
    expect(item).toMatchObject({ storedVersion: '2021', currentVersion: '2022', storedMet: false, currentMet: true, registryNumber: added.registryNumber });
    expect(item.differences.map((d: any) => d.item)).toEqual(expect.arrayContaining(['version', 'result']));
    // Nothing changes until the reviewed list is applied.
    const [before] = await t.ds.query(`SELECT definition_version, version FROM outcome_events o JOIN surgical_cases c ON c.id = o.case_id WHERE o.id = $1`, [evId]);
    expect(before).toEqual({ definition_version: '2021', version: added.version });
    expect((await (await t.as('analyst')).post('/api/outcomes/reevaluation', { definition: 'nhsn-pnu1', eventIds: [evId], reason: 'PNU1 2022 adopted' })).status).toBe(403);
    const apply = await ab.post('/api/outcomes/reevaluation', { definition: 'nhsn-pnu1', eventIds: [evId], reason: 'PNU1 2022 adopted by the network' });
    expect(apply.status).toBe(200);
    expect(apply.body.applied).toBe(1);
    const [after] = await t.ds.query(`SELECT o.definition_version, o.pneumonia_nhsn_met, c.version FROM outcome_events o JOIN surgical_cases c ON c.id = o.case_id WHERE o.id = $1`, [evId]);
    expect(after).toEqual({ definition_version: '2022', pneumonia_nhsn_met: true, version: added.version + 1 });
    const trail = (await ab.get(`/api/cases/${k.id}/audit`)).body.items.find((e: any) => e.action === 'definition-reapplied');
    expect(trail.reason).toBe('PNU1 2022 adopted by the network');
    const again = await ab.get(`/api/outcomes/reevaluation?definition=nhsn-pnu1&siteId=${site.HBR}&pageSize=200`);
    expect(again.body.items.find((i: any) => i.eventId === evId)).toBeUndefined();
  });

  it('when another site\u2019s event is chosen, then nothing is applied (404)', async () => {
    const admin = await t.as('admin');
    const k = await createCase(admin, completeCase(site.MRB));
    const added = (await admin.post(`/api/cases/${k.id}/outcomes`, { caseVersion: k.version, type: 'respiratory-infection', onsetPostoperativeDay: 3, observations: pneumoniaObservations() })).body;
    const r = await (await t.as('abstractor')).post('/api/outcomes/reevaluation', { definition: 'nhsn-pnu1', eventIds: [added.outcomes[0].id], reason: 'trying another site' });
    expect(r.status).toBe(404);
  });
});
