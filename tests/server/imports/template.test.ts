import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import { startTestApp, type TestApp } from '../helpers.js';
import { freshDataDir, drainJobs, siteId, upload, uploadAndDryRun } from './support.js';
import { IMPORT_COLUMNS, SHEET_NAMES } from '../../../shared/imports/fields.js';
import { buildDictionary } from '../../../shared/registry/dictionary.js';

let t: TestApp;
beforeAll(async () => { t = await startTestApp({ DATA_DIR: freshDataDir() }); });
afterAll(async () => { await t.close(); });

async function template(): Promise<Buffer> {
  const c = await t.as('abstractor');
  const r = await c.get('/api/imports/template').buffer(true).parse((res, cb) => { const chunks: Buffer[] = []; res.on('data', (d: Buffer) => chunks.push(d)); res.on('end', () => cb(null, Buffer.concat(chunks))); });
  expect(r.status).toBe(200);
  return r.body as Buffer;
}

describe('import template', () => {
  it('when downloaded, then it has a sheet per record kind with every import column, notes, drop-downs and the dictionary', async () => {
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load((await template()) as unknown as ArrayBuffer);
    for (const kind of ['cases', 'therapy', 'outcomes'] as const) {
      const ws = wb.getWorksheet(SHEET_NAMES[kind])!;
      expect(ws, SHEET_NAMES[kind]).toBeDefined();
      const headers = (ws.getRow(1).values as unknown[]).slice(1);
      expect(headers).toEqual(IMPORT_COLUMNS[kind].map((c) => c.label));
      expect(String(ws.getRow(1).getCell(1).note ?? '')).not.toBe('');
      expect(ws.rowCount).toBeGreaterThanOrEqual(2); // example rows
    }
    const cases = wb.getWorksheet('Cases')!;
    const sexCol = IMPORT_COLUMNS.cases.findIndex((c) => c.key === 'sex') + 1;
    const dv = cases.getCell(2, sexCol).dataValidation;
    expect(dv?.type).toBe('list');
    // The Lists sheet carries the codes of shared/clinical/codes.ts (female, male).
    const lists = wb.getWorksheet('Lists')!;
    const listValues: string[] = [];
    lists.eachRow((r) => (r.values as unknown[]).forEach((v) => typeof v === 'string' && listValues.push(v)));
    expect(listValues).toEqual(expect.arrayContaining(['female', 'male']));
    const dict = wb.getWorksheet('Data dictionary')!;
    expect(dict.rowCount - 1).toBe(buildDictionary().length);
  });

  it('when the template is uploaded as it is, then its example rows pass the dry run and commit as new cases', async () => {
    const c = await t.as('abstractor');
    const hbr = await siteId(t, 'HBR');
    const { up, view } = await uploadAndDryRun(t, c, await template(), 'template.xlsx', { siteId: hbr, decimal: 'point' });
    expect(up.status, JSON.stringify(up.body)).toBe(201);
    expect(up.body.sheets.map((s: { kind: string }) => s.kind)).toEqual(['cases', 'therapy', 'outcomes']);
    expect(view.status, JSON.stringify(view)).toBe('validated');
    const probs = (await c.get(`/api/imports/${view.id}/problems`)).body.items;
    expect(view.counts.rejected, JSON.stringify(probs)).toBe(0);
    expect(view.counts.byKind.cases.new).toBe(2);
    expect(view.counts.byKind.therapy.new).toBe(2);
    expect(view.counts.byKind.outcomes.new).toBe(1);
    const cm = await c.post(`/api/imports/${view.id}/commit`, { existing: 'skip' });
    expect(cm.status, JSON.stringify(cm.body)).toBe(202);
    await drainJobs(t);
    const after = (await c.get(`/api/imports/${view.id}`)).body;
    expect(after.status, JSON.stringify(after)).toBe('committed');
    expect(after.fileDeleted).toBe(true);
    const rows = await t.ds.query(`SELECT c.registry_number, c.created_via, (SELECT count(*)::int FROM therapy_episodes e WHERE e.case_id = c.id) AS episodes FROM surgical_cases c WHERE c.id::text IN (SELECT entity_id FROM audit_entries WHERE action = 'case-created' AND details->>'importId' = $1) ORDER BY c.registry_number`, [view.id]);
    expect(rows).toHaveLength(2);
    expect(rows.map((r: { episodes: number }) => r.episodes)).toEqual([1, 1]);
    void upload;
  });
});
