/**
 * Re-abstraction end to end through the API on the demo data: draw a seeded sample, re-abstract
 * it blind as a second abstractor, and check that the report's kappa and limits of agreement are
 * exactly what analysis/ computes on the same pairs (cohenKappa, landisKochBand, blandAltman),
 * then adjudicate a disagreement through the registry's audited case update and export it.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import { blandAltman, cohenKappa, landisKochBand } from '../../../analysis/index.js';
import { startTestApp, demoEmail, type TestApp } from '../helpers.js';
import { siteIds } from '../registry/factories.js';

let t: TestApp;
let sites: Record<string, string>;
let ab2: string;
const FIELDS = ['sex', 'asaClass', 'copd', 'smokingStatus', 'age', 'heightCm', 'surgeryDate'] as const;
let sampleId: string;
let drawnCaseIds: string[];

beforeAll(async () => {
  t = await startTestApp();
  sites = await siteIds(t.ds);
  [{ id: ab2 }] = await t.ds.query(`SELECT id FROM users WHERE email = $1`, [demoEmail('abstractor2')]);
});
afterAll(async () => { await t.close(); });

const addDays = (iso: string, n: number) => new Date(Date.parse(`${iso}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

/** The second abstraction: mostly the same values, with deliberate differences on some cases. */
function secondValues(orig: Record<string, unknown>, i: number): Record<string, unknown> {
  const v: Record<string, unknown> = { ...orig };
  if (i % 4 === 0) v.sex = orig.sex === 'male' ? 'female' : 'male';
  if (i % 5 === 1) v.copd = !orig.copd;
  if (i % 3 === 0) v.age = (orig.age as number) + 1;
  if (i % 3 === 1) v.heightCm = (orig.heightCm as number) - 2;
  if (i === 2) v.surgeryDate = addDays(orig.surgeryDate as string, 1);
  if (i === 5) v.smokingStatus = null; // not documented in the source
  return v;
}

describe('re-abstraction agreement', () => {
  it('when an admin draws a seeded sample, then it holds verified cases of the site the second abstractor did not enter, and the seed is shown', async () => {
    const admin = await t.as('admin');
    const cand = await admin.get(`/api/quality/reabstraction/abstractors?siteId=${sites.HBR}`);
    expect(cand.status).toBe(200);
    expect(cand.body.map((u: { email: string }) => u.email)).toContain(demoEmail('abstractor2'));
    const r = await admin.post('/api/quality/reabstraction/samples', { siteIds: [sites.HBR], size: 20, fields: FIELDS, reabstractorId: ab2, seed: 20260101 });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body.seed).toBe(20260101);
    expect(r.body.size).toBe(20);
    sampleId = r.body.id;
    const rows = await t.ds.query(
      `SELECT c.id, c.status, c.site_id, c.created_by FROM reabstraction_items i JOIN surgical_cases c ON c.id = i.case_id WHERE i.sample_id = $1 ORDER BY i.ordinal`, [sampleId]);
    drawnCaseIds = rows.map((x: { id: string }) => x.id);
    for (const c of rows) {
      expect(['verified', 'locked']).toContain(c.status);
      expect(c.site_id).toBe(sites.HBR);
      expect(c.created_by).not.toBe(ab2);
    }
  });

  it('when the same seed is drawn again on the same pool, then the same cases come in the same order', async () => {
    const admin = await t.as('admin');
    const r = await admin.post('/api/quality/reabstraction/samples', { siteIds: [sites.HBR], size: 20, fields: FIELDS, reabstractorId: ab2, seed: 20260101 });
    expect(r.status).toBe(201);
    const again = await t.ds.query(`SELECT case_id FROM reabstraction_items WHERE sample_id = $1 ORDER BY ordinal`, [r.body.id]);
    expect(again.map((x: { case_id: string }) => x.case_id)).toEqual(drawnCaseIds);
    const other = await admin.post('/api/quality/reabstraction/samples', { siteIds: [sites.HBR], size: 20, fields: FIELDS, reabstractorId: ab2, seed: 7 });
    const otherIds = (await t.ds.query(`SELECT case_id FROM reabstraction_items WHERE sample_id = $1 ORDER BY ordinal`, [other.body.id])).map((x: { case_id: string }) => x.case_id);
    expect(otherIds).not.toEqual(drawnCaseIds);
  });

  it('when the second abstractor opens the work, then no first value is sent, and someone else is refused', async () => {
    const c2 = await t.as('abstractor2');
    const r = await c2.get(`/api/quality/reabstraction/samples/${sampleId}/blind`);
    expect(r.status).toBe(200);
    expect(r.body.items).toHaveLength(20);
    expect(r.body.fields.map((f: { field: string }) => f.field)).toEqual(FIELDS);
    const text = JSON.stringify(r.body);
    expect(text).not.toMatch(/original/i);
    const firstValues = await t.ds.query(`SELECT original_values FROM reabstraction_items WHERE sample_id = $1`, [sampleId]);
    for (const { original_values: o } of firstValues) expect(text).not.toContain(`"${o.surgeryDate}"`);
    const c1 = await t.as('abstractor');
    expect((await c1.get(`/api/quality/reabstraction/samples/${sampleId}/blind`)).status).toBe(403);
  });

  it('when an entry misses a field or has an unknown one or a bad value, then 400 names each and nothing is saved', async () => {
    const c2 = await t.as('abstractor2');
    const [item] = await t.ds.query(`SELECT id FROM reabstraction_items WHERE sample_id = $1 ORDER BY ordinal LIMIT 1`, [sampleId]);
    const r = await c2.post(`/api/quality/reabstraction/items/${item.id}`, { values: { sex: 'other', age: 30, nickname: 'x' } });
    expect(r.status).toBe(400);
    const paths = r.body.error.fields.map((f: { path: string }) => f.path);
    expect(paths).toEqual(expect.arrayContaining(['values.nickname', 'values.sex', 'values.asaClass', 'values.copd', 'values.heightCm', 'values.surgeryDate']));
    const [after] = await t.ds.query(`SELECT entered_at FROM reabstraction_items WHERE id = $1`, [item.id]);
    expect(after.entered_at).toBeNull();
  });

  it('when every case is re-abstracted, then the report matches cohenKappa, landisKochBand and blandAltman on the same pairs', async () => {
    const c2 = await t.as('abstractor2');
    const items = await t.ds.query(`SELECT id, case_id, original_values FROM reabstraction_items WHERE sample_id = $1 ORDER BY ordinal`, [sampleId]);
    // The registry's case page is not blind: opening it during re-abstraction is listed in the report.
    expect((await c2.get(`/api/cases/${items[3].case_id}`)).status).toBe(200);
    const pairs: { o: Record<string, unknown>; r: Record<string, unknown> }[] = [];
    for (const [i, it] of items.entries()) {
      const values = secondValues(it.original_values, i);
      const r = await c2.post(`/api/quality/reabstraction/items/${it.id}`, { values });
      expect(r.status, JSON.stringify(r.body)).toBe(200);
      pairs.push({ o: it.original_values, r: values });
    }
    const again = await c2.post(`/api/quality/reabstraction/items/${items[0].id}`, { values: pairs[0].r });
    expect(again.status).toBe(409);

    const admin = await t.as('admin');
    const rep = await admin.get(`/api/quality/reabstraction/samples/${sampleId}/report`);
    expect(rep.status).toBe(200);
    const byField = Object.fromEntries(rep.body.fields.map((f: { field: string }) => [f.field, f]));
    const label = (v: unknown) => (v === null || v === undefined ? 'not documented' : String(v));
    for (const f of ['sex', 'asaClass', 'copd', 'smokingStatus'] as const) {
      const k = cohenKappa(pairs.map((p) => [label(p.o[f]), label(p.r[f])] as [string, string]));
      expect(byField[f].kappa).toBe(k.kappa);
      expect(byField[f].observedAgreement).toBe(k.observedAgreement);
      expect(byField[f].expectedAgreement).toBe(k.expectedAgreement);
      expect(byField[f].band).toBe(k.kappa === null ? null : landisKochBand(k.kappa));
    }
    // sex disagrees on cases 0, 4, 8, 12, 16: 15 of 20 agree.
    expect(byField.sex.percentAgreement).toBe(15 / 20);
    expect(byField.asaClass.percentAgreement).toBe(1);
    for (const f of ['age', 'heightCm'] as const) {
      const ba = blandAltman(pairs.map((p) => p.o[f] as number), pairs.map((p) => p.r[f] as number));
      expect(byField[f].limits).toEqual({ n: ba.n, meanDifference: ba.meanDifference, sdDifference: ba.sdDifference, lower: ba.lower, upper: ba.upper });
    }
    // Dates: differences in days (first minus second): one case entered a day later -> mean -1/20.
    const day = (s: unknown) => Date.parse(`${String(s)}T00:00:00Z`) / 86_400_000;
    const baDate = blandAltman(pairs.map((p) => day(p.o.surgeryDate)), pairs.map((p) => day(p.r.surgeryDate)));
    expect(byField.surgeryDate.limits.meanDifference).toBeCloseTo(baDate.meanDifference, 12);
    expect(byField.surgeryDate.limits.meanDifference).toBeCloseTo(-1 / 20, 12);
    expect(byField.smokingStatus.pairsWithMissing).toBe(1);
    // Disagreements: every differing (case, field), here 5 sex + 4 copd + 7 age + 7 height + 1 date + 1 smoking.
    const expected = pairs.reduce((n, p) => n + FIELDS.filter((f) => label(p.o[f]) !== label(p.r[f])).length, 0);
    expect(rep.body.disagreements).toHaveLength(expected);
    const [peeked] = await t.ds.query(`SELECT registry_number FROM surgical_cases WHERE id = $1`, [items[3].case_id]);
    expect(rep.body.openedBeforeEntry).toEqual([{ registryNumber: peeked.registry_number }]);
  });

  it('when an admin adjudicates for the re-abstracted value, then the case changes through the audited update and goes back for verification', async () => {
    const admin = await t.as('admin');
    const rep = (await admin.get(`/api/quality/reabstraction/samples/${sampleId}/report`)).body;
    const d = rep.disagreements.find((x: { field: string }) => x.field === 'heightCm');
    const c2 = await t.as('abstractor2');
    const refused = await c2.post(`/api/quality/reabstraction/items/${d.itemId}/adjudications`, { field: 'heightCm', decision: 'reabstracted', reason: 'chart re-read', caseVersion: d.caseVersion });
    expect(refused.status).toBe(403);
    const r = await admin.post(`/api/quality/reabstraction/items/${d.itemId}/adjudications`, { field: 'heightCm', decision: 'reabstracted', reason: 'height in the anaesthetic chart', caseVersion: d.caseVersion });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body.adjudication.written).toBe(true);
    const [c] = await t.ds.query(`SELECT height_cm::float8 AS h, status, version FROM surgical_cases WHERE id = $1`, [d.caseId]);
    expect(c.h).toBe(d.reabstracted);
    // A verified case goes back to complete for re-verification; a locked one stays locked (an audited amendment).
    expect(c.status).toBe(d.caseStatus === 'verified' ? 'complete' : 'locked');
    expect(c.version).toBe(d.caseVersion + 1);
    const trail = await t.ds.query(`SELECT action, field, old_value, new_value, reason FROM audit_entries WHERE entity = 'case' AND entity_id = $1 ORDER BY id`, [d.caseId]);
    const change = trail.find((e: { action: string; field: string }) => e.action === (d.caseStatus === 'locked' ? 'case-amended' : 'case-changed') && e.field === 'heightCm');
    expect(change.reason).toContain('height in the anaesthetic chart');
    expect(Number(change.old_value)).toBe(d.original);
    expect(trail.some((e: { action: string }) => e.action === 'reabstraction-adjudicated')).toBe(true);
    const twice = await admin.post(`/api/quality/reabstraction/items/${d.itemId}/adjudications`, { field: 'heightCm', decision: 'original', reason: 'second try', caseVersion: d.caseVersion + 1 });
    expect(twice.status).toBe(409);
    const keep = rep.disagreements.find((x: { field: string }) => x.field === 'sex');
    // A reason that looks like a spreadsheet formula (checked as inert text in the export below).
    const k = await admin.post(`/api/quality/reabstraction/items/${keep.itemId}/adjudications`, { field: 'sex', decision: 'original', reason: '=1+1 first abstraction matches the record', caseVersion: keep.caseVersion });
    expect(k.status).toBe(201);
    expect(k.body.adjudication.written).toBe(false);
  });

  it('when the report is exported, then the workbook carries the same kappa and limits', async () => {
    const admin = await t.as('admin');
    const rep = (await admin.get(`/api/quality/reabstraction/samples/${sampleId}/report`)).body;
    const r = await admin.get(`/api/quality/reabstraction/samples/${sampleId}/report.xlsx`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(r.status).toBe(200);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(r.body as unknown as ArrayBuffer);
    const ws = wb.getWorksheet('Agreement')!;
    const header = (ws.getRow(1).values as unknown[]).slice(1);
    const sexRow = ws.getRows(2, ws.rowCount - 1)!.find((row) => row.getCell(1).value === 'Sex')!;
    const sex = rep.fields.find((f: { field: string }) => f.field === 'sex');
    expect(sexRow.getCell(header.indexOf('Kappa') + 1).value).toBe(sex.kappa);
    const heightRow = ws.getRows(2, ws.rowCount - 1)!.find((row) => row.getCell(1).value === 'Height')!;
    const height = rep.fields.find((f: { field: string }) => f.field === 'heightCm');
    expect(heightRow.getCell(header.indexOf('Lower limit') + 1).value).toBe(height.limits.lower);
    // Formula-like text is neutralised with a leading apostrophe (OWASP, "CSV Injection"), never a formula cell.
    const dis = wb.getWorksheet('Disagreements')!;
    const reasons = dis.getRows(2, dis.rowCount - 1)!.map((row) => row.getCell(7).value).filter(Boolean);
    expect(reasons).toContain("'=1+1 first abstraction matches the record");
    dis.eachRow((row) => row.eachCell((c) => expect(c.formula).toBeUndefined()));
  });
});
