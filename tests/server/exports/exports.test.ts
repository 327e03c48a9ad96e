/**
 * Research exports, end to end through the API: each de-identification rule is checked on the
 * generated file itself, opened with independent readers (exceljs, jszip, csv-parse).
 *
 * The rules are those of the HIPAA Safe Harbor method, 45 CFR 164.514(b)(2)(i): (A) names,
 * (B) geographic subdivisions smaller than a state, (C) all elements of dates except the year,
 * and ages over 89 aggregated into "90 or older", (R) any other unique identifying number or
 * code; limited data sets under a data-use agreement, 45 CFR 164.514(e); cell-size suppression
 * of counts 1-10 (CMS cell-size suppression policy); k-anonymity (Sweeney L, Int J Uncertainty
 * Fuzziness Knowledge-Based Systems 2002;10:557-70).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync } from 'node:fs';
import ExcelJS from 'exceljs';
import { runOne } from '../../../server/jobs/jobs.service.js';
import { deleteExpiredExports } from '../../../server/exports/retention.js';
import { startTestApp, demoEmail, type TestApp, type Client } from '../helpers.js';
import { asObjects, download, insertCases, readCsv, readXlsx, readZip, type TestCase } from './fixtures.js';

let t: TestApp;
let researcher: Client;
let admin: Client;
let cases: { id: string; registryNumber: string; hash: string }[] = [];

const COHORT_2019 = { from: '2019-01-01', to: '2019-12-31' };
const PURPOSE = 'Association of lung-expansion therapy timing with post-operative pneumonia after abdominal surgery.';
const ROW_FIELDS = ['surgeryPeriod', 'age', 'ageBand', 'admissionDay', 'dischargeDay', 'deathDay', 'site', 'unit', 'sex', 'procedureCategory', 'preopSpO2', 'preopHaemoglobin', 'heightCm', 'durationMinutes', 'asaClass', 'died30d', 'ppcAtelectasis'];

// 2019 cohort: a large class, a middle one and three small ones (for the k-anonymity check).
const CASES_2019: TestCase[] = [
  ...Array.from({ length: 12 }, (_, i): TestCase => ({ site: 'HBR', age: 60 + (i % 10), sex: 'female', category: 'colorectal', surgery: i % 2 ? '2019-03-15' : '2019-07-02', admission: i % 2 ? '2019-03-12' : '2019-07-02', discharge: i % 2 ? '2019-03-22' : '2019-07-09' })),
  ...Array.from({ length: 6 }, (_, i): TestCase => ({ site: 'KSV', unit: 'ORTHO', age: 70 + i, sex: 'male', category: 'orthopaedic', surgery: '2019-05-20', admission: '2019-05-19', discharge: '2019-05-25' })),
  { site: 'HBR', unit: 'ICU', age: 93, sex: 'female', category: 'thoracic', surgery: '2019-10-01', admission: '2019-09-28', discharge: '2019-10-20', death: '2019-10-20' },
  { site: 'KSV', age: 89, sex: 'male', category: 'thoracic', surgery: '2019-11-11', admission: '2019-11-11', discharge: '2019-11-18' },
  { site: 'HBR', age: 45, sex: 'female', category: 'colorectal', surgery: '2019-02-01', admission: '2019-01-30', discharge: '2019-02-05' },
  { site: 'HBR', age: 47, sex: 'female', category: 'colorectal', surgery: '2019-02-03', admission: '2019-02-03', discharge: '2019-02-06' },
  // Drafts and withdrawn cases never count in analyses nor leave in exports.
  { site: 'HBR', age: 50, sex: 'male', category: 'colorectal', surgery: '2019-04-04', status: 'draft' },
];

async function request(c: Client, body: Record<string, unknown>) {
  const r = await c.post('/api/exports', { purpose: PURPOSE, cohort: COHORT_2019, format: 'xlsx', ...body });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return r.body.id as string;
}

/** Runs queued jobs until the request is no longer waiting (other test files may queue jobs too). */
async function generate(id: string) {
  for (let i = 0; i < 20; i++) {
    const [row] = await t.ds.query(`SELECT status FROM export_requests WHERE id = $1`, [id]);
    if (!['approved', 'generating'].includes(row.status)) return row.status as string;
    if (!(await runOne(t.context))) await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error('export did not finish');
}

async function approve(id: string, decision: Record<string, unknown> = {}) {
  const r = await admin.post(`/api/exports/${id}/decision`, { decision: 'approve', reason: 'Ethics approval REC-2019-114 on file.', ...decision });
  expect(r.status, JSON.stringify(r.body)).toBe(200);
  expect(await generate(id)).toBe('ready');
}

async function newUser(email: string, roles: string[]) {
  const r = await admin.post('/api/users', { email, displayName: `Test ${roles[0]}`, roles, siteIds: [] });
  expect(r.status).toBe(201);
  const [mail] = await t.mailTo(email);
  const token = /token=([\w-]+)/.exec(mail.body)![1];
  const c = await t.client().refreshCsrf();
  expect((await c.post('/api/auth/invitation/accept', { token, password: 'a quiet harbour at dawn' })).status).toBe(200);
  const s = t.client();
  expect((await s.signIn(email, 'a quiet harbour at dawn')).status).toBe(200);
  return s;
}

beforeAll(async () => {
  t = await startTestApp();
  researcher = await t.as('researcher');
  admin = await t.as('admin');
  cases = await insertCases(t.ds, CASES_2019);
});
afterAll(async () => { await t.close(); });

describe('a fully de-identified xlsx export', () => {
  let id: string;
  let file: Buffer;
  let sheets: Map<string, { cells: ExcelJS.Cell[][]; values: unknown[][] }>;
  let data: Record<string, unknown>[];

  beforeAll(async () => {
    id = await request(researcher, { fields: ROW_FIELDS, level: 'deidentified' });
    // The small classes make the approver choose: approve as requested only with the risk accepted.
    await approve(id, { acceptRisk: true });
    const d = await download(researcher, `/api/exports/${id}/file`);
    expect(d.status).toBe(200);
    file = d.body;
    sheets = await readXlsx(file);
    data = asObjects(sheets.get('Data')!.values);
  });

  it('when generated, then it has README, Data and Dictionary sheets and one row per counted case (drafts left out)', () => {
    expect([...sheets.keys()]).toEqual(['README', 'Data', 'Dictionary']);
    expect(data).toHaveLength(CASES_2019.filter((c) => !c.status).length);
  });

  it('when opened, then no direct identifier, registry number, keyed hash, free text or case id is anywhere in the file (Safe Harbor (b)(2)(i)(A), (R))', () => {
    const everything = [...sheets.values()].flatMap((s) => s.values.flat()).map((v) => String(v ?? ''));
    const text = everything.join('\n');
    for (const c of cases) {
      expect(text).not.toContain(c.registryNumber);
      expect(text).not.toContain(c.hash);
      expect(text).not.toContain(c.id);
    }
    expect(text).not.toContain('Jane Roe');
    expect(text).not.toContain('4471-22');
    expect(text).not.toContain('Quay Street');
    expect(text).not.toContain('HYPERLINK');
    const header = sheets.get('Data')!.values[0] as string[];
    for (const banned of ['registryNumber', 'identifierHash', 'notes', 'exclusionReason', 'id', 'siteId', 'unitId', 'surgeryDate', 'admissionDate', 'dischargeDate', 'deathDate']) expect(header).not.toContain(banned);
  });

  it('when opened, then each row has a random study id of this export, unique, unrelated to the case (Safe Harbor (b)(2)(i)(R), (c))', async () => {
    const ids = data.map((r) => r.studyId as string);
    expect(new Set(ids).size).toBe(ids.length);
    for (const s of ids) expect(s).toMatch(/^S-[0-9A-HJKMNP-TV-Z]{10}$/);
    // A second export of the same cohort draws other ids: no id links two exports.
    const id2 = await request(researcher, { fields: ['sex'], format: 'csv' });
    await approve(id2);
    const zip = await readZip((await download(researcher, `/api/exports/${id2}/file`)).body);
    const other = readCsv(zip.get('data.csv')!).slice(1).map((r) => r[0]);
    expect(other).toHaveLength(ids.length);
    expect(other.filter((x) => ids.includes(x))).toEqual([]);
  });

  it('when opened, then the surgery date is the year only and no full date is in the file (Safe Harbor (b)(2)(i)(C))', () => {
    expect(new Set(data.map((r) => r.surgeryPeriod))).toEqual(new Set(['2019']));
    // Data and dictionary hold no date at all; the README's only dates are the approval and generation (not the patient's).
    for (const name of ['Data', 'Dictionary']) {
      for (const c of sheets.get(name)!.cells.flat()) {
        expect(c.type).not.toBe(ExcelJS.ValueType.Date);
        expect(String(c.value ?? '')).not.toMatch(/\b\d{4}-\d{2}-\d{2}\b/);
      }
    }
    expect(sheets.get('README')!.values.flat().join(' ')).not.toMatch(/2019-\d{2}-\d{2}/);
  });

  it('when opened, then other dates are days relative to surgery, stored as numbers, negative before surgery (Safe Harbor (b)(2)(i)(C))', () => {
    const col = (sheets.get('Data')!.values[0] as string[]).indexOf('admissionDay');
    const typed = sheets.get('Data')!.cells.slice(1).map((r) => r[col]);
    // 2019-03-12 is 3 days before 2019-03-15 (calendar arithmetic); 2019-09-28 is 3 days before 2019-10-01.
    expect(typed.some((c) => c.type === ExcelJS.ValueType.Number && c.value === -3)).toBe(true);
    expect(typed.every((c) => c.type === ExcelJS.ValueType.Number)).toBe(true);
    const oldest = data.find((r) => r.age === '90 or older')!;
    expect(oldest.admissionDay).toBe(-3);
    // 2019-10-01 to 2019-10-20: 19 days (discharge and death the same day).
    expect(oldest.dischargeDay).toBe(19);
    expect(oldest.deathDay).toBe(19);
  });

  it('when a patient is over 89, then the age is "90 or older"; 89 stays 89 (Safe Harbor (b)(2)(i)(C): "all ages over 89")', () => {
    const ages = data.map((r) => r.age);
    expect(ages).toContain('90 or older');
    expect(ages).toContain(89);
    expect(ages).not.toContain(93);
    expect(data.filter((r) => typeof r.age === 'number').every((r) => (r.age as number) <= 89)).toBe(true);
    expect(data.find((r) => r.age === '90 or older')!.ageBand).toBe('90 or older');
  });

  it('when sites are not approved by name, then sites and units are per-export codes and no site name or code appears (Safe Harbor (b)(2)(i)(B))', async () => {
    const sites: { code: string; name: string }[] = await t.ds.query(`SELECT code, name FROM sites`);
    const units: { code: string; name: string }[] = await t.ds.query(`SELECT DISTINCT code, name FROM units`);
    for (const r of data) {
      expect(r.site).toMatch(/^Site [A-Z]{1,2}$/);
      expect(r.unit).toMatch(/^Unit [A-Z]{1,2}$/);
    }
    expect(new Set(data.map((r) => r.site)).size).toBe(2);
    const text = [...sheets.values()].flatMap((s) => s.values.flat()).map((v) => String(v ?? '')).join('\n');
    for (const s of sites) {
      expect(text).not.toContain(s.name);
      expect(text).not.toMatch(new RegExp(`\\b${s.code}\\b`));
    }
    for (const u of units) expect(text).not.toContain(u.name);
  });

  it('when opened, then numbers stay numbers (SpO2, haemoglobin, duration) and yes/no stay booleans', () => {
    const header = sheets.get('Data')!.values[0] as string[];
    const row = sheets.get('Data')!.cells[1];
    for (const name of ['preopSpO2', 'preopHaemoglobin', 'heightCm', 'durationMinutes']) expect(row[header.indexOf(name)].type, name).toBe(ExcelJS.ValueType.Number);
    expect(row[header.indexOf('preopHaemoglobin')].value).toBe(12.5);
    expect(row[header.indexOf('died30d')].type).toBe(ExcelJS.ValueType.Boolean);
  });

  it('when opened, then the Dictionary sheet describes every column and the README states cohort, rules, date and approver', () => {
    const dict = sheets.get('Dictionary')!.values;
    expect(dict[0]).toEqual(['variable', 'label', 'type', 'unit', 'allowed values', 'definition', 'de-identification']);
    expect(dict.slice(1).map((r) => r[0])).toEqual(sheets.get('Data')!.values[0]);
    const readme = sheets.get('README')!.values.map((r) => r.filter(Boolean).join(' ')).join('\n');
    expect(readme).toContain('45 CFR 164.514(b)(2)');
    expect(readme).toContain('Cohort definition');
    expect(readme).toContain('surgery from: 2019');
    expect(readme).toContain('Ines Admin (demo)');
    expect(readme).toMatch(/Generated \d{4}-\d{2}-\d{2}T/);
    expect(readme).toContain('90 or older');
  });

  it('when the flow ran, then request, approval, generation and download are audited with their actors', async () => {
    const rows: { action: string; actor_email: string | null }[] = await t.ds.query(`SELECT action, actor_email FROM audit_entries WHERE entity_id = $1 ORDER BY id`, [id]);
    expect(rows.map((r) => r.action)).toEqual(['export-request', 'export-approve', 'export-generate', 'export-download']);
    expect(rows[0].actor_email).toBe(demoEmail('researcher'));
    expect(rows[1].actor_email).toBe(demoEmail('admin'));
    expect(rows[3].actor_email).toBe(demoEmail('researcher'));
    const [{ n }] = await t.ds.query(`SELECT count(*)::int AS n FROM export_downloads WHERE request_id = $1`, [id]);
    expect(n).toBe(1);
  });

  it('when the request was made and decided, then the admins and the researcher were e-mailed', async () => {
    const adminMail = await t.mailTo(demoEmail('admin'));
    expect(adminMail.some((m) => m.subject.includes('waiting for approval'))).toBe(true);
    const mine = await t.mailTo(demoEmail('researcher'));
    expect(mine.some((m) => m.subject.includes('approved') && m.body.includes('Ethics approval REC-2019-114'))).toBe(true);
    expect(mine.some((m) => m.subject.includes('ready'))).toBe(true);
    // No identifier travels by e-mail.
    for (const m of mine) for (const c of cases) expect(m.body).not.toContain(c.registryNumber);
  });

  it('when another researcher, an analyst, an abstractor or the admin asks for the file, then they cannot download it (404 / 403) and the refusal is audited', async () => {
    const other = await newUser('second.researcher@tidewater.example', ['researcher']);
    expect((await download(other, `/api/exports/${id}/file`)).status).toBe(404);
    expect((await download(await t.as('analyst'), `/api/exports/${id}/file`)).status).toBe(404);
    expect((await download(await t.as('abstractor'), `/api/exports/${id}/file`)).status).toBe(403);
    expect((await download(admin, `/api/exports/${id}/file`)).status).toBe(403);
    expect((await other.get(`/api/exports/${id}`)).status).toBe(404);
    const [{ n }] = await t.ds.query(`SELECT count(*)::int AS n FROM audit_entries WHERE entity_id = $1 AND action = 'export-download-refused'`, [id]);
    expect(n).toBe(2);
  });

  it('when the file expires, then download answers 410, the schedule deletes the file and the deletion is audited', async () => {
    const [{ file_path: path }] = await t.ds.query(`SELECT file_path FROM export_requests WHERE id = $1`, [id]);
    expect(existsSync(path)).toBe(true);
    await t.ds.query(`UPDATE export_requests SET expires_at = now() - interval '1 minute' WHERE id = $1`, [id]);
    expect((await download(researcher, `/api/exports/${id}/file`)).status).toBe(410);
    expect(await deleteExpiredExports(t.context)).toBeGreaterThanOrEqual(1);
    expect(existsSync(path)).toBe(false);
    const view = (await researcher.get(`/api/exports/${id}`)).body;
    expect(view.status).toBe('expired');
    expect(view.canDownload).toBe(false);
    const [{ n }] = await t.ds.query(`SELECT count(*)::int AS n FROM audit_entries WHERE entity_id = $1 AND action = 'export-expire'`, [id]);
    expect(n).toBe(1);
  });
});

describe('a limited data set as CSV', () => {
  const tomorrow = new Date(Date.now() + 2 * 86_400_000).toISOString().slice(0, 10);
  const yesterday = new Date(Date.now() - 2 * 86_400_000).toISOString().slice(0, 10);

  it('when generated, then the zip holds UTF-8 data.csv, dictionary.csv and README.txt; surgery is year-month; numbers incl. negative offsets stay numbers (45 CFR 164.514(e))', async () => {
    const id = await request(researcher, { fields: ROW_FIELDS, format: 'csv', level: 'limited', dua: { reference: 'DUA-TVHP-0042', expiresOn: tomorrow } });
    await approve(id, { riskAction: 'suppress' });
    const d = await download(researcher, `/api/exports/${id}/file`);
    expect(d.headers['content-type']).toContain('application/zip');
    const zip = await readZip(d.body);
    expect([...zip.keys()].sort()).toEqual(['README.txt', 'data.csv', 'dictionary.csv']);
    const raw = zip.get('data.csv')!;
    expect(raw.charCodeAt(0)).toBe(0xfeff);
    const rows = readCsv(raw);
    const header = rows[0];
    const objs = rows.slice(1).map((r) => Object.fromEntries(header.map((h, i) => [h, r[i]])));
    for (const r of objs) expect(r.surgeryPeriod).toMatch(/^2019-(0[1-9]|1[0-2])$/);
    // A negative offset is written bare (-3), not quoted and not prefixed: a spreadsheet reads a number.
    expect(raw).toMatch(/,-\d+,/);
    expect(raw).not.toContain(`'-`);
    for (const r of objs) if (r.admissionDay) expect(Number.isInteger(Number(r.admissionDay))).toBe(true);
    expect(readCsv(zip.get('dictionary.csv')!)[0]).toEqual(['variable', 'label', 'type', 'unit', 'allowed values', 'definition', 'de-identification']);
    expect(zip.get('README.txt')).toContain('DUA-TVHP-0042');
  });

  it('when suppression was chosen, then every combination of the quasi-identifiers in the file holds at least 5 records (k-anonymity, Sweeney 2002)', async () => {
    const id = await request(researcher, { fields: ['age', 'sex', 'site', 'surgeryPeriod', 'procedureCategory'], format: 'csv', level: 'deidentified' });
    const risk = (await admin.get(`/api/exports/${id}/risk`)).body;
    // Classes of the 2019 cohort: 12, 6, 1, 1, 2 records (the fixture above).
    expect(risk.asRequested.k).toBe(1);
    expect(risk.asRequested.classesBelow).toBe(3);
    expect(risk.asRequested.recordsBelow).toBe(4);
    const refused = await admin.post(`/api/exports/${id}/decision`, { decision: 'approve', reason: 'Ethics approval REC-2019-114 on file.' });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('k_anonymity_below_threshold');
    await approve(id, { riskAction: 'suppress' });
    const zip = await readZip((await download(researcher, `/api/exports/${id}/file`)).body);
    const [header, ...rows] = readCsv(zip.get('data.csv')!);
    expect(rows).toHaveLength(18);
    // Independent check on the file: group by the quasi-identifiers (age band from the age column).
    const band = (a: string) => (a === '90 or older' ? a : String(Math.floor(Number(a) / 10) * 10));
    const col = (name: string) => header.indexOf(name);
    const classes = new Map<string, number>();
    for (const r of rows) {
      const key = [band(r[col('age')]), r[col('sex')], r[col('site')], r[col('surgeryPeriod')].slice(0, 4), r[col('procedureCategory')]].join('|');
      classes.set(key, (classes.get(key) ?? 0) + 1);
    }
    expect(Math.min(...classes.values())).toBeGreaterThanOrEqual(5);
    // The README states the k of the file as released (after suppression), and the approval is audited with both.
    const k = Number(/smallest class k = (\d+)/.exec(zip.get('README.txt')!)![1]);
    expect(k).toBeGreaterThanOrEqual(5);
    const [entry] = await t.ds.query(`SELECT details FROM audit_entries WHERE entity_id = $1 AND action = 'export-approve'`, [id]);
    expect(entry.details).toMatchObject({ riskAction: 'suppress', k: 1, kAfter: 6 });
  });

  it('when coarsening was chosen, then ages leave as 20-year bands and unit codes are dropped', async () => {
    const id = await request(researcher, { fields: ['age', 'unit', 'sex'], format: 'csv' });
    await approve(id, { riskAction: 'coarsen', acceptRisk: true });
    const zip = await readZip((await download(researcher, `/api/exports/${id}/file`)).body);
    const rows = readCsv(zip.get('data.csv')!);
    expect(rows[0]).toEqual(['studyId', 'age', 'sex']);
    for (const r of rows.slice(1)) expect(r[1]).toMatch(/^(0–19|20–39|40–59|60–79|80–89|90 or older)$/);
  });

  it('when the data-use agreement has expired, then a limited set is refused at request, at approval and at generation', async () => {
    const late = await researcher.post('/api/exports', { purpose: PURPOSE, cohort: COHORT_2019, fields: ['sex'], format: 'csv', level: 'limited', dua: { reference: 'DUA-OLD-1', expiresOn: yesterday } });
    expect(late.status).toBe(400);
    expect(late.body.error.code).toBe('dua_expired');
    expect(late.body.error.fields[0].path).toBe('dua.expiresOn');
    const none = await researcher.post('/api/exports', { purpose: PURPOSE, cohort: COHORT_2019, fields: ['sex'], format: 'csv', level: 'limited' });
    expect(none.status).toBe(400);
    expect(none.body.error.fields.map((f: { path: string }) => f.path)).toContain('dua');

    const id = await request(researcher, { fields: ['sex'], format: 'csv', level: 'limited', dua: { reference: 'DUA-TVHP-0043', expiresOn: tomorrow } });
    await t.ds.query(`UPDATE export_requests SET dua_expires_on = $2 WHERE id = $1`, [id, yesterday]);
    const r = await admin.post(`/api/exports/${id}/decision`, { decision: 'approve', reason: 'Ethics approval REC-2019-114 on file.' });
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('dua_expired');

    // Approved while valid, expired before the job ran: nothing is written.
    const id2 = await request(researcher, { fields: ['sex'], format: 'csv', level: 'limited', dua: { reference: 'DUA-TVHP-0044', expiresOn: tomorrow } });
    expect((await admin.post(`/api/exports/${id2}/decision`, { decision: 'approve', reason: 'Ethics approval REC-2019-114 on file.' })).status).toBe(200);
    await t.ds.query(`UPDATE export_requests SET dua_expires_on = $2 WHERE id = $1`, [id2, yesterday]);
    expect(await generate(id2)).toBe('failed');
    const [row] = await t.ds.query(`SELECT file_path FROM export_requests WHERE id = $1`, [id2]);
    expect(row.file_path).toBeNull();
    expect((await download(researcher, `/api/exports/${id2}/file`)).status).toBe(409);
  });
});

describe('site names and formula-like text', () => {
  it('when approved with site names, then names appear and a name a spreadsheet would run as a formula is neutralised as text (OWASP CSV injection)', async () => {
    const site = await admin.post('/api/sites', { code: 'QTH', name: '=HYPERLINK("http://example.invalid","Quayside Test Hospital")' });
    expect(site.status).toBe(201);
    await t.ds.query(`INSERT INTO units (site_id, code, name, kind) VALUES ($1, 'SURG-A', 'Surgical ward A', 'ward')`, [site.body.id]);
    await insertCases(t.ds, Array.from({ length: 3 }, (): TestCase => ({ site: 'QTH', age: 55, sex: 'male', category: 'colorectal', surgery: '2016-06-06' })));
    const id = await request(researcher, { cohort: { from: '2016-01-01', to: '2016-12-31' }, fields: ['site', 'admissionDay', 'sex'], siteNamesRequested: true });
    await approve(id, { siteNamesApproved: true, acceptRisk: true });
    const sheets = await readXlsx((await download(researcher, `/api/exports/${id}/file`)).body);
    const siteCol = (sheets.get('Data')!.values[0] as string[]).indexOf('site');
    const cells = sheets.get('Data')!.cells.slice(1);
    expect(cells).toHaveLength(3);
    for (const r of cells) {
      expect(r[siteCol].type).toBe(ExcelJS.ValueType.String);
      expect(r[siteCol].value).toBe(`'=HYPERLINK("http://example.invalid","Quayside Test Hospital")`);
    }
    const zipId = await request(researcher, { cohort: { from: '2016-01-01', to: '2016-12-31' }, fields: ['site'], format: 'csv', siteNamesRequested: true });
    await approve(zipId, { siteNamesApproved: true, acceptRisk: true });
    const csv = readCsv((await readZip((await download(researcher, `/api/exports/${zipId}/file`)).body)).get('data.csv')!);
    for (const r of csv.slice(1)) expect(r[1].startsWith(`'=`)).toBe(true);
  });
});

describe('aggregate tables', () => {
  it('when counted by site and sex, then counts 1-10 are hidden, no hidden count is recoverable from a margin, and shown counts are true (CMS cell-size suppression policy)', async () => {
    await insertCases(t.ds, [
      ...Array.from({ length: 14 }, (): TestCase => ({ site: 'HBR', age: 60, sex: 'female', category: 'colorectal', surgery: '2018-04-04' })),
      ...Array.from({ length: 12 }, (): TestCase => ({ site: 'HBR', age: 61, sex: 'male', category: 'colorectal', surgery: '2018-04-05' })),
      ...Array.from({ length: 20 }, (): TestCase => ({ site: 'KSV', age: 62, sex: 'female', category: 'colorectal', surgery: '2018-04-06' })),
      ...Array.from({ length: 3 }, (): TestCase => ({ site: 'KSV', age: 63, sex: 'male', category: 'colorectal', surgery: '2018-04-07' })),
    ]);
    // Approved with site names, so the rows are identified in the test (the codes are random).
    const id = await request(researcher, { cohort: { from: '2018-01-01', to: '2018-12-31' }, kind: 'aggregate', rowsBy: 'site', colsBy: 'sex', format: 'xlsx', siteNamesRequested: true });
    await approve(id, { siteNamesApproved: true });
    const sheets = await readXlsx((await download(researcher, `/api/exports/${id}/file`)).body);
    const table = sheets.get('Data')!.values;
    expect(table[0]).toEqual(['site \\ sex', 'female', 'male', 'Total']);
    const body = table.slice(1);
    // The truth, counted here from the fixture: HBR 14/12 (26), KSV 20/3 (23), total 49.
    const truth: Record<string, number[]> = { 'Harbour Row General Hospital': [14, 12, 26], 'Kestrel Vale Hospital': [20, 3, 23], Total: [34, 15, 49] };
    expect(body.map((r) => r[0])).toEqual(['Harbour Row General Hospital', 'Kestrel Vale Hospital', 'Total']);
    for (const r of body) {
      (r.slice(1) as (number | string)[]).forEach((v, j) => {
        if (v === 'suppressed') return;
        expect(v).toBe(truth[r[0] as string][j]);
        expect(v === 0 || (v as number) >= 11).toBe(true);
      });
    }
    // The 3 is hidden, and no line (row or column with its total) has exactly one hidden entry.
    const hidden = (v: unknown) => v === 'suppressed';
    expect(body[1][2]).toBe('suppressed');
    for (const r of body) expect(r.slice(1).filter(hidden).length).not.toBe(1);
    for (let j = 1; j <= 3; j++) expect(body.map((r) => r[j]).filter(hidden).length).not.toBe(1);
    const readme = sheets.get('README')!.values.flat().join(' ');
    expect(readme).toContain('CMS cell-size suppression policy');
  });
});

describe('size limits and sheets', () => {
  it('when an xlsx would pass the cell limit, then the request is refused with a message offering CSV', async () => {
    const small = await startTestApp({ EXPORT_XLSX_MAX_CELLS: '20' });
    try {
      const c = await small.as('researcher');
      const r = await c.post('/api/exports', { purpose: PURPOSE, cohort: COHORT_2019, fields: ['sex', 'age'], format: 'xlsx' });
      expect(r.status).toBe(400);
      expect(r.body.error.code).toBe('too_large_for_xlsx');
      expect(r.body.error.hint).toContain('CSV');
      expect(r.body.error.fields[0].path).toBe('format');
      expect((await c.post('/api/exports', { purpose: PURPOSE, cohort: COHORT_2019, fields: ['sex', 'age'], format: 'csv' })).status).toBe(201);
    } finally {
      await small.close();
    }
  });

  it('when the rows pass one sheet, then the data continue on Data 2, ... each with its header (sheet limit incl. header)', async () => {
    const { generateExport } = await import('../../../server/exports/generate.js');
    const id = await request(researcher, { fields: ['sex', 'age'] });
    expect((await admin.post(`/api/exports/${id}/decision`, { decision: 'approve', reason: 'Ethics approval REC-2019-114 on file.', acceptRisk: true })).status).toBe(200);
    await t.ds.query(`UPDATE jobs SET status = 'cancelled' WHERE id = (SELECT job_id FROM export_requests WHERE id = $1)`, [id]);
    // 8 rows per sheet including the header: 22 data rows -> 7 + 7 + 7 + 1.
    await generateExport(t.context, id, { progress: async () => undefined, isCancelled: async () => false }, { maxRowsPerSheet: 8 });
    const sheets = await readXlsx((await download(researcher, `/api/exports/${id}/file`)).body);
    expect([...sheets.keys()]).toEqual(['README', 'Data', 'Data 2', 'Data 3', 'Data 4', 'Dictionary']);
    for (const name of ['Data', 'Data 2', 'Data 3']) {
      expect(sheets.get(name)!.values).toHaveLength(8);
      expect(sheets.get(name)!.values[0]).toEqual(['studyId', 'age', 'sex']);
    }
    expect(sheets.get('Data 4')!.values).toHaveLength(2);
    expect(sheets.get('README')!.values.flat().join(' ')).toContain('1,048,576 rows including its header');
  });
});

describe('default-deny and bad input', () => {
  it('when a free-text or non-exportable field is asked for, then the request is refused naming each field and nothing is stored', async () => {
    const [{ n: before }] = await t.ds.query(`SELECT count(*)::int AS n FROM export_requests`);
    const r = await researcher.post('/api/exports', { purpose: PURPOSE, cohort: COHORT_2019, fields: ['sex', 'notes', 'exclusionReason', 'registryNumber', 'surgeryDate'], format: 'csv' });
    expect(r.status).toBe(400);
    expect(r.body.error.fields.map((f: { path: string }) => f.path)).toEqual(['fields.1', 'fields.2', 'fields.3', 'fields.4']);
    const [{ n: after }] = await t.ds.query(`SELECT count(*)::int AS n FROM export_requests`);
    expect(after).toBe(before);
  });

  it('when the purpose is short, the format unknown or the cohort malformed, then 400 names the fields', async () => {
    const r = await researcher.post('/api/exports', { purpose: 'short', cohort: { from: 'yesterday' }, fields: ['sex'], format: 'pdf' });
    expect(r.status).toBe(400);
    const paths = r.body.error.fields.map((f: { path: string }) => f.path);
    expect(paths).toEqual(expect.arrayContaining(['purpose', 'cohort.from', 'format']));
  });

  it('when declined, then the researcher is told the reason by e-mail and nothing is generated', async () => {
    const id = await request(researcher, { fields: ['sex'], format: 'csv' });
    const r = await admin.post(`/api/exports/${id}/decision`, { decision: 'decline', reason: 'The purpose does not need row-level data; request the aggregate table.' });
    expect(r.status).toBe(200);
    expect(r.body.status).toBe('declined');
    const mail = await t.mailTo(demoEmail('researcher'));
    expect(mail.some((m) => m.subject.includes('declined') && m.body.includes('request the aggregate table'))).toBe(true);
    expect((await admin.post(`/api/exports/${id}/decision`, { decision: 'approve', reason: 'Changed my mind on this.' })).status).toBe(409);
    const [row] = await t.ds.query(`SELECT job_id FROM export_requests WHERE id = $1`, [id]);
    expect(row.job_id).toBeNull();
  });
});

describe('the audit log', () => {
  it('when an admin reads and exports it, then it lists the export actions and the CSV download is itself audited', async () => {
    const page = await admin.get('/api/exports/audit?pageSize=200');
    expect(page.status).toBe(200);
    const actions = new Set(page.body.items.map((e: { action: string }) => e.action));
    for (const a of ['export-request', 'export-approve', 'export-decline', 'export-generate', 'export-download', 'export-expire']) expect(actions.has(a), a).toBe(true);
    const count = async () => (await t.ds.query(`SELECT count(*)::int AS n FROM audit_entries WHERE action = 'export-audit-export'`))[0].n as number;
    const before = await count();
    const csv = await download(admin, '/api/exports/audit.csv');
    expect(csv.status).toBe(200);
    const rows = readCsv(csv.body.toString('utf8'));
    expect(rows[0]).toEqual(['at', 'action', 'actor', 'request', 'reason', 'details']);
    expect(rows.length).toBeGreaterThan(10);
    expect(await count()).toBe(before + 1);
    expect((await researcher.get('/api/exports/audit')).status).toBe(403);
  });
});
