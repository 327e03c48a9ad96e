/**
 * The import flow through the API on the real PostgreSQL: duplicates, updates by registry case
 * number (audited as 'import'), the skip/update policy, re-upload confirmation by file hash,
 * presets, history and problems (JSON and xlsx), abandon and upload retention, progress.
 */
import fs from 'node:fs';
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp, type Client } from '../helpers.js';
import { drainJobs, freshDataDir, siteId, upload, uploadAndDryRun, workbook, proposedMapping } from './support.js';
import { runOne } from '../../../server/jobs/jobs.service.js';
import { purgeExpiredUploads, uploadDir } from '../../../server/imports/storage.js';

let t: TestApp;
let c: Client;
let hbr: string;
beforeAll(async () => {
  t = await startTestApp({ DATA_DIR: freshDataDir(), IMPORT_BATCH_ROWS: '7' });
  c = await t.as('abstractor');
  hbr = await siteId(t, 'HBR');
});
afterAll(async () => { await t.close(); });

const fields = () => ({ siteId: hbr, decimal: 'point' });
const CASE_H = ['Case key (this file only)', 'Registry case number', 'Hospital identifier', 'Surgery date', 'Age', 'Sex', 'Weight'];

async function commit(id: string, body: Record<string, unknown>) {
  const r = await c.post(`/api/imports/${id}/commit`, body);
  if (r.status === 202) await drainJobs(t);
  return r;
}

async function importCases(rows: (string | number | null)[][], name: string) {
  const { view } = await uploadAndDryRun(t, c, await workbook({ Cases: [CASE_H, ...rows] }), name, fields());
  return view;
}

describe('duplicates, updates and policies', () => {
  it('when two rows share the hospital identifier and surgery date, then a duplicate warning (no identifier shown) and both import, flagged', async () => {
    const view = await importCases([['D1', null, 'MRN-55501', '2026-03-10', 50, 'male', 80], ['D2', null, ' mrn-55501 ', '2026-03-10', 51, 'male', 81]], 'dups.xlsx');
    expect(view.counts).toMatchObject({ new: 2, rejected: 0, duplicates: 1, warnings: 1 });
    const ps = (await c.get(`/api/imports/${view.id}/problems`)).body.items;
    expect(ps[0]).toMatchObject({ severity: 'warning', row: 3, column: 'Hospital identifier', value: null });
    expect(JSON.stringify(ps)).not.toContain('55501');
    await commit(view.id, { existing: 'skip' });
    const flagged = await t.ds.query(`SELECT possible_duplicate FROM surgical_cases WHERE weight_kg IN (80, 81) AND surgery_date = '2026-03-10' ORDER BY weight_kg`);
    expect(flagged.map((r: { possible_duplicate: boolean }) => r.possible_duplicate)).toEqual([false, true]);
    // Against the registry: the same identifier and date again is a duplicate of the stored case.
    const again = await importCases([['D3', null, 'MRN-55501', '2026-03-10', 52, 'male', 82]], 'dups-again.xlsx');
    const p2 = (await c.get(`/api/imports/${again.id}/problems`)).body.items;
    expect(p2[0].message).toMatch(/same hospital identifier and surgery date as case HBR-\d{4}-\d{5}/);
  });

  it('when a row carries a registry case number, then "update" changes the case (audited as import) and "skip" leaves it', async () => {
    const first = await importCases([['U1', null, null, '2026-04-01', 60, 'female', 70]], 'u1.xlsx');
    await commit(first.id, { existing: 'skip' });
    const [kase] = await t.ds.query(`SELECT id, registry_number, version FROM surgical_cases WHERE surgery_date = '2026-04-01' AND weight_kg = 70`);
    const row = [['U1', kase.registry_number, null, '2026-04-01', 61, 'female', 70]];
    const skipView = await importCases(row, 'u1-skip.xlsx');
    expect(skipView.counts).toMatchObject({ updated: 1, new: 0 });
    await commit(skipView.id, { existing: 'skip' });
    expect((await t.ds.query(`SELECT age FROM surgical_cases WHERE id = $1`, [kase.id]))[0].age).toBe(60);
    const upd = await importCases(row, 'u1-update.xlsx');
    // Possibly the same bytes as the skipped import (exceljs may write identical files): confirm the re-upload.
    expect((await commit(upd.id, { existing: 'update', confirmReupload: true })).status).toBe(202);
    const [after] = await t.ds.query(`SELECT age, version FROM surgical_cases WHERE id = $1`, [kase.id]);
    expect(after).toEqual({ age: 61, version: kase.version + 1 });
    const audits = await t.ds.query(`SELECT action, field, old_value, new_value, actor_email FROM audit_entries WHERE entity_id = $1 AND action = 'import'`, [kase.id]);
    expect(audits).toEqual([{ action: 'import', field: 'age', old_value: '60', new_value: '61', actor_email: 'abstractor@tidewater.example' }]);
    // Same values again: unchanged.
    const same = await importCases(row, 'u1-same.xlsx');
    expect(same.counts).toMatchObject({ unchanged: 1, updated: 0 });
  });

  it('when the registry number is of another site or unknown, then the row is rejected', async () => {
    const view = await importCases([['X1', 'HBR-1999-99999', null, '2026-04-01', 60, 'female', 70]], 'unknown-number.xlsx');
    expect(view.counts.rejected).toBe(1);
  });
});

describe('re-upload, history, problems, presets, abandon, retention', () => {
  it('when the same file is imported again, then the commit needs confirmation (409), and goes through with it', async () => {
    const file = await workbook({ Cases: [CASE_H, ['R1', null, null, '2026-05-02', 44, 'male', 90]] });
    const a = await uploadAndDryRun(t, c, file, 'same.xlsx', fields());
    expect((await commit(a.view.id, { existing: 'skip' })).status).toBe(202);
    const b = await uploadAndDryRun(t, c, file, 'same-renamed.xlsx', fields());
    expect(b.view.previousImport).toMatchObject({ id: a.view.id, fileName: 'same.xlsx' });
    const refused = await c.post(`/api/imports/${b.view.id}/commit`, { existing: 'skip' });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('already_imported');
    expect((await commit(b.view.id, { existing: 'skip', confirmReupload: true })).status).toBe(202);
    expect((await t.ds.query(`SELECT count(*)::int AS n FROM surgical_cases WHERE surgery_date = '2026-05-02' AND weight_kg = 90`))[0].n).toBe(2);
  });

  it('when the history is listed, then each import shows who, when, file name and hash, counts and outcome; problems can be read again and downloaded', async () => {
    const bad = await importCases([['P1', null, null, '2026-05-03', 'old', 'male', 90]], 'history-bad.xlsx');
    const list = (await c.get('/api/imports?pageSize=100')).body;
    const item = list.items.find((i: { id: string }) => i.id === bad.id);
    expect(item).toMatchObject({ fileName: 'history-bad.xlsx', createdByEmail: 'abstractor@tidewater.example', status: 'validated', problemCount: 1 });
    expect(item.fileHash).toMatch(/^[0-9a-f]{64}$/);
    const committed = list.items.find((i: { fileName: string; status: string }) => i.fileName === 'same.xlsx');
    expect(committed.status).toBe('committed');
    expect(committed.counts.written).toBe(1);
    const x = await c.get(`/api/imports/${bad.id}/problems.xlsx`).buffer(true).parse((res, cb) => { const b: Buffer[] = []; res.on('data', (d: Buffer) => b.push(d)); res.on('end', () => cb(null, Buffer.concat(b))); });
    expect(x.status).toBe(200);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(x.body as unknown as ArrayBuffer);
    const probs = wb.getWorksheet('Problems')!;
    expect(probs.getRow(2).getCell(3).value).toBe('E2');
    const grid = wb.worksheets.find((w) => w.name.startsWith('Cases'))!;
    const ageCol = (grid.getRow(1).values as unknown[]).indexOf('Age');
    const cell = grid.getRow(2).getCell(ageCol);
    expect(cell.value).toBe('old');
    expect((cell.fill as ExcelJS.FillPattern).fgColor?.argb).toBe('FFF4C7C3');
    expect(String(cell.note)).toContain('is not a number');
    // Another site's abstractor (committee has no import rights; abstractor2 shares HBR) sees it too; researcher 403.
    expect((await (await t.as('abstractor2')).get(`/api/imports/${bad.id}`)).status).toBe(200);
    expect((await (await t.as('analyst')).get(`/api/imports/${bad.id}`)).status).toBe(403);
  });

  it('when a mapping is saved as a preset, then it is listed for the site and can be used again', async () => {
    const up = await upload(c, Buffer.from('Op date,Years\n2026-05-04,70\n'), 'preset.csv', fields());
    const mapping = { cases: { 'Op date': 'surgeryDate', Years: 'age' } };
    expect((await c.post(`/api/imports/${up.body.id}/dry-run`, { mapping, savePresetAs: 'Theatre list export' })).status).toBe(202);
    await drainJobs(t);
    const presets = (await c.get(`/api/imports/presets?siteId=${hbr}`)).body;
    expect(presets).toEqual([expect.objectContaining({ name: 'Theatre list export', mapping })]);
    expect((await c.get(`/api/imports/${up.body.id}`)).body.counts.new).toBe(1);
  });

  it('when an import is abandoned, then its file is deleted at once; an old upload is deleted by the retention schedule', async () => {
    const up = await upload(c, Buffer.from('Surgery date\n2026-05-05\n'), 'abandon.csv', fields());
    const file = `${uploadDir(t.config)}/${up.body.id}.csv`;
    expect(fs.existsSync(file)).toBe(true);
    const r = await c.post(`/api/imports/${up.body.id}/abandon`);
    expect(r.body).toMatchObject({ status: 'abandoned', fileDeleted: true });
    expect(fs.existsSync(file)).toBe(false);
    const old = await upload(c, Buffer.from('Surgery date\n2026-05-06\n'), 'old.csv', fields());
    await t.ds.query(`UPDATE import_jobs SET created_at = now() - interval '25 hours' WHERE id = $1`, [old.body.id]);
    expect(await purgeExpiredUploads(t.ds, t.config)).toBeGreaterThanOrEqual(1);
    expect(fs.existsSync(`${uploadDir(t.config)}/${old.body.id}.csv`)).toBe(false);
    expect((await c.get(`/api/imports/${old.body.id}`)).body.status).toBe('abandoned');
  });
});

describe('progress', () => {
  it('when a commit runs, then the job reports intermediate counts (parsed, validated, then written in batches)', async () => {
    const rows = Array.from({ length: 40 }, (_, i) => [`G${i}`, null, null, '2026-06-01', 30 + (i % 50), 'female', 60 + i]);
    const view = await importCases(rows, 'progress.xlsx');
    expect(view.counts.new).toBe(40);
    const r = await c.post(`/api/imports/${view.id}/commit`, { existing: 'skip' });
    const jobId = r.body.commitJobId;
    // Record every progress update the job writes, as the client's polling of GET /api/jobs/:id would see it.
    const seen: number[] = [];
    const poll = setInterval(async () => {
      const [j] = await t.ds.query(`SELECT progress FROM jobs WHERE id = $1`, [jobId]).catch(() => [{}]);
      if (j?.progress?.written !== undefined) seen.push(j.progress.written);
    }, 2);
    const original = t.ds.query.bind(t.ds);
    // Slow each progress write a little so the poller sees every step (batches of IMPORT_BATCH_ROWS = 7).
    (t.ds as unknown as { query: typeof original }).query = (async (sql: string, params?: unknown[]) => {
      const out = await original(sql, params);
      if (sql.startsWith('UPDATE jobs SET progress')) await new Promise((res) => setTimeout(res, 15));
      return out;
    }) as typeof original;
    try {
      await runOne(t.context);
    } finally {
      (t.ds as unknown as { query: typeof original }).query = original;
      clearInterval(poll);
    }
    const distinct = [...new Set(seen)];
    expect(distinct.some((n) => n > 0 && n < 40), `seen ${distinct}`).toBe(true);
    const job = (await c.get(`/api/jobs/${jobId}`)).body;
    expect(job.status).toBe('succeeded');
    expect(job.progress).toMatchObject({ parsed: 40, validated: 40, written: 40 });
    void proposedMapping;
  });
});
