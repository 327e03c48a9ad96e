import ExcelJS from 'exceljs';
import { parse as parseCsv } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers.js';
import { CASE_FIELD_NAMES } from '../../../shared/registry/case.js';
import { ELIGIBLE_CASE_RULES } from '../../../shared/registry/completeness.js';
import { completeCase, createCase, daysAgo, setStatus, siteIds } from './factories.js';

let t: TestApp;
let site: Record<string, string>;
beforeAll(async () => {
  t = await startTestApp();
  site = await siteIds(t.ds);
});
afterAll(async () => { await t.close(); });

const ids = (bucket: { items: { id: string }[] }) => bucket.items.map((i) => i.id);

describe('worklist', () => {
  it('when cases miss data, have follow-up due or overdue, or wait for verification, then each appears in its list for the right people', async () => {
    const ab = await t.as('abstractor');
    const missing = await createCase(ab, completeCase(site.HBR, { preopSpO2: null }));
    // The 30-day window (day 0 to day 30) of a case operated 27 days ago closes in 3 days.
    const due = await createCase(ab, completeCase(site.HBR, { surgeryDate: daysAgo(27), admissionDate: daysAgo(27), dischargeDate: daysAgo(20), followUpCompletedOn: null }));
    const overdue = await createCase(ab, completeCase(site.KSV, { surgeryDate: daysAgo(45), admissionDate: daysAgo(46), dischargeDate: daysAgo(40), followUpCompletedOn: null }));
    const complete = (await setStatus(ab, await createCase(ab, completeCase(site.HBR)), 'complete')).body;

    const mine = (await ab.get('/api/worklist?limit=200&dueWithinDays=7')).body;
    expect(mine.missingData.items.find((i: any) => i.id === missing.id).missing).toContain('preopSpO2');
    const dueItem = mine.followUpDue.items.find((i: any) => i.id === due.id);
    expect(dueItem).toMatchObject({ days: 3, overdue: false, followUpWindowEnd: daysAgo(-3) });
    // Window closed 15 days ago (surgery 45 days ago + 30).
    // Other test files share this database and add overdue cases of their own: look at this site's list.
    const ksv = (await ab.get(`/api/worklist?limit=200&siteId=${site.KSV}`)).body;
    expect(ksv.followUpOverdue.items.find((i: any) => i.id === overdue.id)).toMatchObject({ days: 15, overdue: true });
    // The creator does not see their own case among those to verify; the second abstractor does.
    expect(ids(mine.awaitingVerification)).not.toContain(complete.id);
    const theirs = (await (await t.as('abstractor2')).get('/api/worklist?limit=200')).body;
    const w = await t.ds.query(`SELECT count(*)::int AS n FROM surgical_cases WHERE status = 'complete' AND site_id = ANY($1::uuid[]) AND created_by IS DISTINCT FROM (SELECT id FROM users WHERE email = 'abstractor2@tidewater.example')
      AND NOT ((SELECT id FROM users WHERE email = 'abstractor2@tidewater.example') = ANY(editors_since_verification))`, [[site.HBR, site.KSV]]);
    expect(theirs.awaitingVerification.total).toBe(w[0].n);
    expect(mine.missingData.total).toBeGreaterThanOrEqual(mine.missingData.items.length);
  });

  it('when a committee member or a researcher asks for the worklist, then it is refused', async () => {
    expect((await (await t.as('committee')).get('/api/worklist')).status).toBe(403);
    expect((await (await t.as('researcher')).get('/api/worklist')).status).toBe(403);
  });
});

describe('data dictionary', () => {
  it('when read as JSON, then every case field is listed with its requirement from the completeness rules, units and an exportable flag', async () => {
    const r = await (await t.as('researcher')).get('/api/dictionary');
    expect(r.status).toBe(200);
    const byVar = new Map(r.body.items.map((e: any) => [e.variable, e]));
    for (const f of CASE_FIELD_NAMES) expect(byVar.has(f), f).toBe(true);
    for (const rule of ELIGIBLE_CASE_RULES) expect((byVar.get(rule.field) as any).required, rule.field).toBe(rule.when ? 'conditional' : 'required');
    expect(byVar.get('preopHaemoglobin')).toMatchObject({ unit: 'g/dL', type: 'measurement (value + unit)' });
    expect(byVar.get('durationMinutes')).toMatchObject({ unit: 'min', range: '1–2880 min', source: expect.stringContaining('Canet') });
    // Free text and dates never leave in a de-identified export by default.
    expect(byVar.get('notes')).toMatchObject({ exportable: false, freeText: true });
    expect((byVar.get('notes') as any).requirementNote).toMatch(/Do not enter names/);
    expect((byVar.get('surgeryDate') as any).exportable).toBe(false);
    expect((byVar.get('unitId') as any).required).toBe('optional');
    expect(byVar.get('anyPpc')).toMatchObject({ required: 'derived' });
  });

  it('when downloaded as CSV or XLSX, then an independent reader finds the same rows and columns', async () => {
    const c = await t.as('analyst');
    const json = (await c.get('/api/dictionary')).body;
    const csv = await c.get('/api/dictionary?format=csv').buffer(true).parse((res, cb) => { let s = ''; res.setEncoding('utf8'); res.on('data', (d: string) => (s += d)); res.on('end', () => cb(null, s)); });
    expect(csv.status).toBe(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    const rows = parseCsv(csv.body as unknown as string, { columns: true, bom: true }) as Record<string, string>[];
    expect(rows).toHaveLength(json.items.length);
    expect(Object.keys(rows[0])).toEqual(json.columns);
    expect(rows.find((x) => x.variable === 'age')!.unit).toBe('years');

    const xlsx = await c.get('/api/dictionary?format=xlsx').buffer(true).parse((res, cb) => { const parts: Buffer[] = []; res.on('data', (d: Buffer) => parts.push(d)); res.on('end', () => cb(null, Buffer.concat(parts))); });
    expect(xlsx.status).toBe(200);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(xlsx.body as unknown as ArrayBuffer);
    const ws = wb.getWorksheet('Data dictionary')!;
    expect(ws.rowCount).toBe(json.items.length + 1);
    expect((ws.getRow(1).values as unknown[]).slice(1)).toEqual(json.columns);
  });

  it('when not signed in, then the dictionary is refused with 401', async () => {
    expect((await t.client().get('/api/dictionary')).status).toBe(401);
  });
});
