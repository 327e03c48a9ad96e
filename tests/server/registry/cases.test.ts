import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers.js';
import { completeCase, createCase, siteIds, todayIso } from './factories.js';

let t: TestApp;
let site: Record<string, string>;
beforeAll(async () => {
  t = await startTestApp();
  site = await siteIds(t.ds);
});
afterAll(async () => { await t.close(); });

describe('creating a case', () => {
  it('when an abstractor saves a complete case, then it gets a registry number, ARISCAT points and class, and units stored in one unit', async () => {
    const ab = await t.as('abstractor');
    const body = await createCase(ab, completeCase(site.HBR, { preopHaemoglobin: { value: 125, unit: 'g/L' } }));
    // Alveolog's own format: site code, year of registration, 5-digit sequence.
    expect(body.registryNumber).toMatch(new RegExp(`^HBR-${todayIso().slice(0, 4)}-\\d{5}$`));
    expect(body.status).toBe('draft');
    expect(body.version).toBe(1);
    // 1 g/dL = 10 g/L (SI prefixes): 125 g/L is stored as 12.5 g/dL.
    expect(body.preopHaemoglobin).toEqual({ value: 12.5, unit: 'g/dL' });
    // ARISCAT (Canet 2010): age 65 -> 3, SpO2 94% -> 8, Hb 12.5 g/dL -> 0, upper abdominal -> 15,
    // 150 min -> 16, elective -> 0: 42 points, intermediate (26-44).
    expect(body.ariscat).toEqual({ points: 42, riskClass: 'intermediate' });
    const [row] = await t.ds.query(`SELECT ariscat_points, ariscat_class, preop_haemoglobin_g_dl FROM surgical_cases WHERE id = $1`, [body.id]);
    expect(row).toEqual({ ariscat_points: 42, ariscat_class: 'intermediate', preop_haemoglobin_g_dl: '12.50' });
    expect(body.completeness.complete).toBe(true);
  });

  it('when an ARISCAT input is missing, then no score is stored (never scored as zero)', async () => {
    const ab = await t.as('abstractor');
    const body = await createCase(ab, { siteId: site.HBR, surgeryDate: completeCase(site.HBR).surgeryDate, age: 70 });
    expect(body.ariscat).toBeNull();
    expect(body.completeness.complete).toBe(false);
    expect(body.completeness.missing.map((m: { field: string }) => m.field)).toContain('preopSpO2');
  });

  it('when two cases are created at one site in one year, then their sequence numbers follow each other', async () => {
    const ab = await t.as('abstractor');
    const a = await createCase(ab, completeCase(site.KSV));
    const b = await createCase(ab, completeCase(site.KSV));
    const seq = (n: string) => Number(n.split('-')[2]);
    expect(seq(b.registryNumber)).toBe(seq(a.registryNumber) + 1);
  });

  it('when the ASA E modifier disagrees with an elective operation, then the case is saved with a warning', async () => {
    const ab = await t.as('abstractor');
    const body = await createCase(ab, completeCase(site.HBR, { asaEmergency: true }));
    expect(body.warnings.map((w: { code: string }) => w.code)).toContain('asa-urgency');
  });
});

describe('roles', () => {
  it('when an analyst, a committee member or a researcher tries to create a case, then it is refused with 403', async () => {
    for (const who of ['analyst', 'committee', 'researcher'] as const) {
      const c = await t.as(who);
      const r = await c.post('/api/cases', completeCase(site.HBR));
      expect(r.status, who).toBe(403);
    }
  });

  it('when a researcher asks for the case list or a case, then it is refused (no case-level access)', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const rs = await t.as('researcher');
    expect((await rs.get('/api/cases')).status).toBe(403);
    expect((await rs.get(`/api/cases/${k.id}`)).status).toBe(403);
  });

  it('when the committee reads a case of its own site, then it may; editing is refused', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const cm = await t.as('committee');
    expect((await cm.get(`/api/cases/${k.id}`)).status).toBe(200);
    expect((await cm.patch(`/api/cases/${k.id}`, { version: k.version, age: 66 })).status).toBe(403);
  });
});

describe('site scoping', () => {
  it('when a user asks for a case of a site they are not assigned to, then the answer is 404 (its existence is not revealed)', async () => {
    const admin = await t.as('admin');
    const other = await createCase(admin, completeCase(site.MRB));
    const ab = await t.as('abstractor'); // HBR and KSV only
    expect((await ab.get(`/api/cases/${other.id}`)).status).toBe(404);
    expect((await ab.patch(`/api/cases/${other.id}`, { version: 1, age: 50 })).status).toBe(404);
    expect((await ab.get(`/api/cases/${other.id}/audit`)).status).toBe(404);
    expect((await ab.post(`/api/cases/${other.id}/status`, { to: 'complete', version: 1 })).status).toBe(404);
    const cm = await t.as('committee'); // HBR only
    const ksv = await createCase(ab, completeCase(site.KSV));
    expect((await cm.get(`/api/cases/${ksv.id}`)).status).toBe(404);
  });

  it('when an abstractor enters a case for a site they are not assigned to, then it is refused naming siteId', async () => {
    const ab = await t.as('abstractor');
    const r = await ab.post('/api/cases', completeCase(site.CLF));
    expect(r.status).toBe(403);
    expect(r.body.error.fields[0].path).toBe('siteId');
  });

  it('when the list is asked for, then it only holds cases of the user\u2019s sites', async () => {
    const ab = await t.as('abstractor');
    const r = await ab.get('/api/cases?pageSize=500');
    expect(r.status).toBe(200);
    expect(new Set(r.body.items.map((i: { siteCode: string }) => i.siteCode))).toEqual(new Set(['HBR', 'KSV']));
  });
});

describe('optimistic concurrency', () => {
  it('when two people save the same version, then the second gets 409 with both versions and nothing of theirs is written', async () => {
    const ab = await t.as('abstractor');
    const ab2 = await t.as('abstractor2');
    const k = await createCase(ab, completeCase(site.HBR));
    const first = await ab.patch(`/api/cases/${k.id}`, { version: k.version, durationMinutes: 200 });
    expect(first.status).toBe(200);
    expect(first.body.version).toBe(2);
    const second = await ab2.patch(`/api/cases/${k.id}`, { version: k.version, durationMinutes: 100 });
    expect(second.status).toBe(409);
    expect(second.body.error.details.yourVersion).toBe(1);
    expect(second.body.error.details.currentVersion).toBe(2);
    expect(second.body.error.details.current.durationMinutes).toBe(200);
    expect(second.body.error.details.yours.durationMinutes).toBe(100);
    const [row] = await t.ds.query(`SELECT duration_minutes, version FROM surgical_cases WHERE id = $1`, [k.id]);
    expect(row).toEqual({ duration_minutes: 200, version: 2 });
  });

  it('when a therapy episode is added, then the case version rises and an old case version is stale', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const r = await ab.post(`/api/cases/${k.id}/therapy`, { caseVersion: k.version, modality: 'early-mobilisation', startPostoperativeDay: 1, sessionsPrescribed: 6, sessionsDelivered: 5 });
    expect(r.status).toBe(201);
    expect(r.body.version).toBe(k.version + 1);
    expect((await ab.patch(`/api/cases/${k.id}`, { version: k.version, age: 66 })).status).toBe(409);
  });
});

describe('audit trail', () => {
  it('when fields change, then each change is kept with who, when, field, old and new value, and reads are audited', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const u = await ab.patch(`/api/cases/${k.id}`, { version: k.version, age: 81, preopSpO2: 90 });
    expect(u.status).toBe(200);
    // ARISCAT re-scored: age > 80 -> 16, SpO2 <= 90 -> 24: 16 + 24 + 15 + 16 = 71, high (>= 45) (Canet 2010).
    expect(u.body.ariscat).toEqual({ points: 71, riskClass: 'high' });
    await ab.get(`/api/cases/${k.id}`);
    const trail = await ab.get(`/api/cases/${k.id}/audit`);
    expect(trail.status).toBe(200);
    const age = trail.body.items.find((e: { field: string; action: string }) => e.field === 'age' && e.action === 'case-changed');
    expect(age).toMatchObject({ actorEmail: 'abstractor@tidewater.example', oldValue: '65', newValue: '81' });
    expect(Date.parse(age.at)).toBeGreaterThan(Date.now() - 60_000);
    const ar = trail.body.items.find((e: { field: string; action: string }) => e.field === 'ariscat' && e.action === 'case-changed');
    expect(ar).toMatchObject({ oldValue: '42 (intermediate)', newValue: '71 (high)' });
    expect(trail.body.items.some((e: { action: string }) => e.action === 'case-read')).toBe(false);
    const withReads = await ab.get(`/api/cases/${k.id}/audit?includeReads=true`);
    expect(withReads.body.items.some((e: { action: string }) => e.action === 'case-read')).toBe(true);
  });

  it('when a save changes nothing, then the version stays and no entry is written', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const r = await ab.patch(`/api/cases/${k.id}`, { version: k.version, age: 65 });
    expect(r.status).toBe(200);
    expect(r.body.version).toBe(k.version);
  });

  it('when a case is not wanted, then there is no way to delete it: only withdrawal', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    expect((await ab.delete(`/api/cases/${k.id}`)).status).toBe(404);
    const [row] = await t.ds.query(`SELECT count(*)::int AS n FROM surgical_cases WHERE id = $1`, [k.id]);
    expect(row.n).toBe(1);
  });
});
