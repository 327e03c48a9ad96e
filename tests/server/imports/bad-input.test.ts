/**
 * Every kind of bad input named in the import issue gets a clear error (what, where, how to
 * fix) and writes nothing. Limits are settings, so the tests use small ones.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import { uploadDir } from '../../../server/imports/storage.js';
import { startTestApp, type TestApp, type Client } from '../helpers.js';
import { freshDataDir, drainJobs, siteId, upload, uploadAndDryRun, workbook } from './support.js';

let t: TestApp;
let c: Client;
let hbr: string;
const casesBefore = async () => (await t.ds.query(`SELECT count(*)::int AS n FROM surgical_cases`))[0].n as number;

beforeAll(async () => {
  // 0.02 MB = 20,971 bytes; 6 rows at most.
  t = await startTestApp({ UPLOAD_MAX_MB: '0.02', IMPORT_MAX_ROWS: '6', DATA_DIR: freshDataDir() });
  c = await t.as('abstractor');
  hbr = await siteId(t, 'HBR');
});
afterAll(async () => { await t.close(); });

const H = ['Case key (this file only)', 'Surgery date', 'Age', 'Sex', 'Notes'];
const fields = () => ({ siteId: hbr, decimal: 'point' });

async function problemsOf(id: string) {
  return (await c.get(`/api/imports/${id}/problems?pageSize=500`)).body.items as { sheet: string; row: number; column: string; cell: string; value: string | null; message: string; hint: string; severity: string }[];
}

describe('upload refusals (400 with what, where and how to fix)', () => {
  const started = new Date();
  it('when the file is empty, then 400 empty_file', async () => {
    const r = await upload(c, Buffer.alloc(0), 'cases.csv', fields());
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('empty_file');
    expect(r.body.error.hint).toBeTruthy();
  });

  it('when a PNG image is named .csv, then 400 wrong_file_type (magic bytes, not the name)', async () => {
    // PNG signature: 89 50 4E 47 0D 0A 1A 0A (ISO/IEC 15948, 5.2).
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]);
    const r = await upload(c, png, 'cases.csv', fields());
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('wrong_file_type');
    expect(r.body.error.message).toContain('PNG');
  });

  it('when a CSV text is named .xlsx, then 400 wrong_file_type', async () => {
    const r = await upload(c, Buffer.from('Surgery date\n2026-01-02\n'), 'cases.xlsx', fields());
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('wrong_file_type');
  });

  it('when an xlsx is corrupt (zip header, damaged body), then 400 corrupt_file', async () => {
    const good = await workbook({ Cases: [H, ['C1', '2026-01-02', 60, 'female', null]] });
    const broken = Buffer.concat([good.subarray(0, 200), Buffer.alloc(400, 0x41)]);
    const r = await upload(c, broken, 'cases.xlsx', fields());
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('corrupt_file');
  });

  it('when an xlsx is password-protected (an OLE2 container), then 400 protected_workbook', async () => {
    // Encrypted OOXML is stored in a compound file: signature D0 CF 11 E0 A1 B1 1A E1 ([MS-OFFCRYPTO] 2.1, [MS-CFB] 2.2).
    const cfb = Buffer.concat([Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]), Buffer.alloc(504)]);
    const r = await upload(c, cfb, 'cases.xlsx', fields());
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('protected_workbook');
    expect(r.body.error.hint).toMatch(/password/);
  });

  it('when a CSV is not UTF-8, then 400 not_utf8', async () => {
    // "é" in ISO-8859-1 is the single byte E9, not valid UTF-8 (RFC 3629, 3).
    const r = await upload(c, Buffer.from([...Buffer.from('Notes\nCaf'), 0xe9, 0x0a]), 'cases.csv', fields());
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('not_utf8');
  });

  it('when no sheet has a known name, then 400 missing_sheet listing the sheets found', async () => {
    const r = await upload(c, await workbook({ Sheet1: [H], Other: [H] }), 'cases.xlsx', fields());
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('missing_sheet');
    expect(r.body.error.message).toContain('"Sheet1"');
  });

  it('when a header appears twice, then 400 duplicate_header naming both columns', async () => {
    const r = await upload(c, Buffer.from('Surgery date,Age,age\n2026-01-02,60,61\n'), 'cases.csv', fields());
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('duplicate_header');
    expect(r.body.error.message).toContain('columns B and C');
  });

  it('when there are more rows than IMPORT_MAX_ROWS, then 400 too_many_rows', async () => {
    const rows = Array.from({ length: 7 }, (_, i) => `2026-01-0${i + 1},60`).join('\n');
    const r = await upload(c, Buffer.from(`Surgery date,Age\n${rows}\n`), 'cases.csv', fields());
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('too_many_rows');
  });

  it('when the file is larger than UPLOAD_MAX_MB, then 413 file_too_large', async () => {
    const r = await upload(c, Buffer.from(`Notes\n${'x'.repeat(30_000)}\n`), 'cases.csv', fields());
    expect(r.status).toBe(413);
    expect(r.body.error.code).toBe('file_too_large');
  });

  it('when the file has headers only, then 400 no_rows', async () => {
    const r = await upload(c, Buffer.from('Surgery date,Age\n'), 'cases.csv', fields());
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('no_rows');
  });

  it('when the upload is for a site the user is not assigned to, then 403 not_your_site', async () => {
    const r = await upload(c, Buffer.from('Surgery date\n2026-01-02\n'), 'cases.csv', { siteId: await siteId(t, 'MRB'), decimal: 'point' });
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe('not_your_site');
  });

  it('when nothing was written by the refused uploads, then no import row and no stray file remain', async () => {
    const [{ n }] = await t.ds.query(`SELECT count(*)::int AS n FROM import_jobs WHERE created_at >= $1`, [started]);
    expect(n).toBe(0);
    expect(fs.readdirSync(uploadDir(t.config))).toEqual([]);
  });
});

describe('mapping refusals', () => {
  it('when an unknown header is neither mapped nor dropped, then the dry run answers 400 naming the column', async () => {
    const up = await upload(c, Buffer.from('Surgery date,Ward bed\n2026-01-02,12\n'), 'cases.csv', fields());
    expect(up.status).toBe(201);
    expect(up.body.sheets[0].proposed).toEqual({ 'Surgery date': 'surgeryDate', 'Ward bed': null });
    const m = { cases: { 'Surgery date': 'surgeryDate' } };
    const r = await c.post(`/api/imports/${up.body.id}/dry-run`, { mapping: m });
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('mapping_invalid');
    expect(r.body.error.fields[0].message).toContain('"Ward bed" is not mapped');
    // Two columns on one field, and a missing required field, are refused too.
    const r2 = await c.post(`/api/imports/${up.body.id}/dry-run`, { mapping: { cases: { 'Surgery date': 'age', 'Ward bed': 'age' } } });
    expect(r2.status).toBe(400);
    expect(r2.body.error.fields.map((f: { message: string }) => f.message).join(' ')).toMatch(/both mapped to Age.*|no column is mapped to Surgery date/);
  });
});

describe('row problems (dry run) and the all-or-nothing commit', () => {
  it('when rows have wrong types, out-of-range, contradictory, future, over-long values or a foreign site, then each is a problem at its cell and the commit is refused', async () => {
    const before = await casesBefore();
    const header = ['Case key (this file only)', 'Site code', 'Surgery date', 'Discharge date', 'Age', 'Sex', 'Notes'];
    const file = await workbook({
      Cases: [
        header,
        ['C1', 'HBR', '2026-01-02', '2026-01-06', 'sixty', 'female', null], // wrong type (row 2)
        ['C2', 'HBR', '2026-01-02', '2026-01-06', 130, 'female', null], // out of range (row 3)
        ['C3', 'HBR', '2026-01-10', '2026-01-06', 60, 'female', null], // discharge before surgery (row 4)
        ['C4', 'HBR', '2099-01-02', null, 60, 'female', null], // future (row 5)
        ['C5', 'HBR', '2026-01-02', null, 60, 'female', 'x'.repeat(501)], // over-long text (row 6)
        ['C6', 'MRB', '2026-01-02', null, 60, 'female', null], // site not assigned (row 7)
      ],
    });
    const { view } = await uploadAndDryRun(t, c, file, 'mistakes.xlsx', fields());
    expect(view.status, view.error).toBe('validated');
    expect(view.counts.rejected).toBe(6);
    const ps = await problemsOf(view.id);
    const at = (row: number) => ps.filter((p) => p.row === row);
    expect(at(2)[0]).toMatchObject({ sheet: 'Cases', column: 'Age', cell: 'E2', value: 'sixty' });
    expect(at(2)[0].message).toContain('is not a number');
    expect(at(3)[0]).toMatchObject({ column: 'Age', cell: 'E3', value: '130' });
    expect(at(3)[0].message).toContain('at most 120');
    expect(at(4)[0]).toMatchObject({ column: 'Discharge date', cell: 'D4' });
    expect(at(4)[0].message).toContain('before the surgery date');
    expect(at(5)[0].message).toContain('in the future');
    expect(at(6)[0]).toMatchObject({ column: 'Notes', cell: 'G6' });
    expect(at(6)[0].message).toContain('over the limit of 500');
    expect(at(7)[0].message).toContain('not assigned to');
    for (const p of ps) expect(p.hint.length).toBeGreaterThan(5);
    const cm = await c.post(`/api/imports/${view.id}/commit`, { existing: 'skip' });
    expect(cm.status).toBe(400);
    expect(cm.body.error.code).toBe('rows_rejected');
    await drainJobs(t);
    expect(await casesBefore()).toBe(before);
  });

  it('when text starts with = + - @, then it is stored neutralised as text; -2 in a number column stays the number -2', async () => {
    const header = ['Case key (this file only)', 'Surgery date', 'Notes'];
    const file = await workbook({
      Cases: [header, ['N1', '2026-02-03', '=HYPERLINK("http://x.invalid","click")'], ['N2', '2026-02-04', '@SUM(1,2)']],
      'Therapy episodes': [['Case key (this file only)', 'Modality', 'Post-operative day started'], ['N1', 'incentive-spirometry', -2]],
    });
    const { view } = await uploadAndDryRun(t, c, file, 'formulas.xlsx', fields());
    const ps = await problemsOf(view.id);
    // -2 was read as a number and refused by the schema's range (therapy starts on day 0 or later), not as text.
    const day = ps.find((p) => p.sheet === 'Therapy episodes')!;
    expect(day.message).toContain('day 0 or later');
    expect(day.value).toBe('-2');
    // Drop the therapy sheet's bad row by mapping only the cases sheet's file again.
    const ok = await workbook({ Cases: [header, ['N1', '2026-02-03', '=HYPERLINK("http://x.invalid","click")'], ['N2', '2026-02-04', '+1 then -2']] });
    const r = await uploadAndDryRun(t, c, ok, 'formulas-ok.xlsx', fields());
    expect(r.view.counts.rejected).toBe(0);
    await c.post(`/api/imports/${r.view.id}/commit`, { existing: 'skip' });
    await drainJobs(t);
    const notes = (await t.ds.query(`SELECT notes FROM surgical_cases WHERE notes IS NOT NULL AND created_via = 'import' ORDER BY surgery_date`)).map((x: { notes: string }) => x.notes);
    expect(notes).toEqual(["'=HYPERLINK(\"http://x.invalid\",\"click\")", "'+1 then -2"]);
  });

  it('when a numeric cell holds a formula, then it is a problem (formulas are never evaluated)', async () => {
    const file = await workbook({ Cases: [['Surgery date', 'Age'], ['2026-02-03', { formula: '60+1', result: 61 }]] });
    const { view } = await uploadAndDryRun(t, c, file, 'formula-cell.xlsx', fields());
    const ps = await problemsOf(view.id);
    expect(ps[0]).toMatchObject({ column: 'Age', cell: 'B2' });
    expect(ps[0].message).toContain('holds a formula');
  });

  it('when a CSV has a BOM and decimal commas, then it reads; a decimal point under "comma" is a problem with the fix', async () => {
    const csv = '\uFEFFSurgery date;Weight\n'.replace(';', ',') + '2026-02-03,"71,5"\n2026-02-04,72.5\n';
    const { view } = await uploadAndDryRun(t, c, Buffer.from(csv, 'utf8'), 'comma.csv', { siteId: hbr, decimal: 'comma' });
    expect(view.sheets[0].headers).toEqual(['Surgery date', 'Weight']);
    expect(view.counts.rows).toBe(2);
    expect(view.counts.rejected).toBe(1);
    const ps = await problemsOf(view.id);
    expect(ps[0]).toMatchObject({ row: 3, column: 'Weight', value: '72.5' });
    expect(ps[0].hint).toContain('72,5');
  });

  it('when a date is an Excel serial (text or number), then it is read in the 1900 date system', async () => {
    // 46082 = 2026-03-01 (Excel 1900 date system: day 1 = 1900-01-01, with the 1900-02-29 leap-year bug; Microsoft KB 214326).
    const csv = 'Case key (this file only),Surgery date,Age\nS1,46082,60\n';
    const { view } = await uploadAndDryRun(t, c, Buffer.from(csv), 'serial.csv', fields());
    expect(view.counts.new).toBe(1);
    await c.post(`/api/imports/${view.id}/commit`, { existing: 'skip' });
    await drainJobs(t);
    const [row] = await t.ds.query(`SELECT surgery_date::text AS d FROM surgical_cases WHERE created_via = 'import' AND age = 60 AND surgery_date = '2026-03-01'`);
    expect(row?.d).toBe('2026-03-01');
  });
});
