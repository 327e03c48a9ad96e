// The abstraction workflow of issue 3: draft -> complete -> verified (by a second person) -> locked,
// withdrawal with a reason, amendments of locked cases. The four-eyes rule for verification is
// common practice in registry quality control (no source).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers.js';
import { completeCase, createCase, setStatus, siteIds } from './factories.js';

let t: TestApp;
let site: Record<string, string>;
beforeAll(async () => {
  t = await startTestApp();
  site = await siteIds(t.ds);
});
afterAll(async () => { await t.close(); });

async function completed() {
  const ab = await t.as('abstractor');
  const k = await createCase(ab, completeCase(site.HBR));
  const r = await setStatus(ab, k, 'complete');
  expect(r.status).toBe(200);
  return r.body;
}

describe('draft to complete', () => {
  it('when required data is missing, then "complete" is refused with 400 listing each missing field, and nothing changes', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR, { preopSpO2: null, dischargeDate: null }));
    const r = await setStatus(ab, k, 'complete');
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('case_incomplete');
    expect(r.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['dischargeDate', 'preopSpO2']);
    const [row] = await t.ds.query(`SELECT status, version FROM surgical_cases WHERE id = $1`, [k.id]);
    expect(row).toEqual({ status: 'draft', version: 1 });
  });

  it('when therapy was given but no episode is recorded, then the case is not complete', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR, { therapyGiven: true }));
    const r = await setStatus(ab, k, 'complete');
    expect(r.status).toBe(400);
    expect(r.body.error.fields.map((f: { path: string }) => f.path)).toEqual(['therapy.episodes']);
  });

  it('when a draft is sent straight to verified, then it is refused with 409 (mark it complete first)', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const r = await setStatus(await t.as('abstractor2'), k, 'verified');
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe('transition_not_allowed');
  });
});

describe('verification by a second person', () => {
  it('when the creator tries to verify, then it is refused', async () => {
    const k = await completed();
    const r = await setStatus(await t.as('abstractor'), k, 'verified');
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe('verification_not_allowed');
    expect(r.body.error.message).toMatch(/created/);
  });

  it('when someone changed the case since its last verification, then they may not verify it', async () => {
    const k = await completed();
    const ab2 = await t.as('abstractor2');
    const edited = await ab2.patch(`/api/cases/${k.id}`, { version: k.version, durationMinutes: 160 });
    expect(edited.status).toBe(200);
    const r = await setStatus(ab2, edited.body, 'verified');
    expect(r.status).toBe(403);
    expect(r.body.error.message).toMatch(/changed/);
    expect(edited.body.canVerify.allowed).toBe(false);
  });

  it('when the importer of a case tries to verify it, then it is refused', async () => {
    const k = await completed();
    // Imports (another area) record the importer as created_by with created_via 'import'.
    const [{ id }] = await t.ds.query(`SELECT id FROM users WHERE email = 'abstractor2@tidewater.example'`);
    await t.ds.query(`UPDATE surgical_cases SET created_via = 'import', created_by = $2 WHERE id = $1`, [k.id, id]);
    const r = await setStatus(await t.as('abstractor2'), k, 'verified');
    expect(r.status).toBe(403);
    expect(r.body.error.message).toMatch(/imported/);
  });

  it('when a second abstractor or an analyst verifies, then the case is verified; a committee member may not', async () => {
    const k1 = await completed();
    const v1 = await setStatus(await t.as('abstractor2'), k1, 'verified');
    expect(v1.status).toBe(200);
    expect(v1.body.status).toBe('verified');
    expect(v1.body.verifiedBy).toBe('abstractor2@tidewater.example');
    const k2 = await completed();
    expect((await setStatus(await t.as('committee'), k2, 'verified')).status).toBe(403);
    const v2 = await setStatus(await t.as('analyst'), k2, 'verified');
    expect(v2.status).toBe(200);
  });

  it('when a verified case is changed, then it goes back to complete for re-verification, and the change is audited', async () => {
    const k = await completed();
    const v = (await setStatus(await t.as('analyst'), k, 'verified')).body;
    const ab = await t.as('abstractor');
    const r = await ab.patch(`/api/cases/${k.id}`, { version: v.version, icuDays: 1 });
    expect(r.status).toBe(200);
    expect(r.body.status).toBe('complete');
    expect(r.body.verifiedBy).toBeNull();
    const trail = (await ab.get(`/api/cases/${k.id}/audit`)).body.items;
    expect(trail.some((e: any) => e.action === 'status-changed' && e.oldValue === 'verified' && e.newValue === 'complete')).toBe(true);
    // The analyst verified before the change and did not change it since: may verify again.
    const again = await setStatus(await t.as('analyst'), r.body, 'verified');
    expect(again.status).toBe(200);
  });

  it('when a therapy episode of a verified case changes, then the case also goes back to complete', async () => {
    const k = await completed();
    const v = (await setStatus(await t.as('analyst'), k, 'verified')).body;
    const r = await (await t.as('abstractor')).post(`/api/cases/${k.id}/therapy`, { caseVersion: v.version, modality: 'early-mobilisation', startPostoperativeDay: 1, sessionsPrescribed: 4, sessionsDelivered: 4 });
    expect(r.status).toBe(201);
    expect(r.body.status).toBe('complete');
  });
});

describe('locking and amendments', () => {
  async function locked() {
    const k = await completed();
    const v = (await setStatus(await t.as('analyst'), k, 'verified')).body;
    const abLock = await setStatus(await t.as('abstractor'), v, 'locked');
    expect(abLock.status).toBe(403);
    const l = await setStatus(await t.as('admin'), v, 'locked');
    expect(l.status).toBe(200);
    expect(l.body.status).toBe('locked');
    return l.body;
  }

  it('when a locked case is changed without a reason, then it is refused with 400 naming amendmentReason', async () => {
    const l = await locked();
    const r = await (await t.as('abstractor')).patch(`/api/cases/${l.id}`, { version: l.version, icuDays: 2 });
    expect(r.status).toBe(400);
    expect(r.body.error.fields[0].path).toBe('amendmentReason');
    const [row] = await t.ds.query(`SELECT icu_days, version FROM surgical_cases WHERE id = $1`, [l.id]);
    expect(row).toEqual({ icu_days: 0, version: l.version });
  });

  it('when a locked case is amended with a reason, then it stays locked and the amendment is audited with the reason', async () => {
    const l = await locked();
    const ab = await t.as('abstractor');
    const r = await ab.patch(`/api/cases/${l.id}`, { version: l.version, icuDays: 2, amendmentReason: 'ICU stay found in the late discharge letter' });
    expect(r.status).toBe(200);
    expect(r.body.status).toBe('locked');
    expect(r.body.icuDays).toBe(2);
    const e = (await ab.get(`/api/cases/${l.id}/audit`)).body.items.find((x: any) => x.field === 'icuDays' && x.action !== 'case-created');
    expect(e).toMatchObject({ action: 'case-amended', oldValue: '0', newValue: '2', reason: 'ICU stay found in the late discharge letter' });
  });
});

describe('withdrawal', () => {
  it('when a case is withdrawn without a reason, then it is refused; with a reason it is kept as withdrawn and can no longer change', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const noReason = await setStatus(ab, k, 'withdrawn');
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.fields[0].path).toBe('reason');
    const w = await setStatus(ab, k, 'withdrawn', 'Entered twice by mistake');
    expect(w.status).toBe(200);
    expect(w.body.status).toBe('withdrawn');
    expect(w.body.withdrawnReason).toBe('Entered twice by mistake');
    const edit = await ab.patch(`/api/cases/${k.id}`, { version: w.body.version, age: 60 });
    expect(edit.status).toBe(409);
    expect(edit.body.error.code).toBe('case_withdrawn');
    const [row] = await t.ds.query(`SELECT status FROM surgical_cases WHERE id = $1`, [k.id]);
    expect(row.status).toBe('withdrawn');
    // Reinstating is an administrator's move, with a reason.
    expect((await setStatus(ab, w.body, 'draft', 'Not a duplicate after all')).status).toBe(403);
    const back = await setStatus(await t.as('admin'), w.body, 'draft', 'Not a duplicate after all');
    expect(back.status).toBe(200);
    expect(back.body.status).toBe('draft');
  });

  it('when a status change carries a stale version, then it is refused with 409', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    await ab.patch(`/api/cases/${k.id}`, { version: k.version, age: 70 });
    const r = await setStatus(ab, k, 'complete');
    expect(r.status).toBe(409);
    expect(r.body.error.details.currentVersion).toBe(2);
  });
});
