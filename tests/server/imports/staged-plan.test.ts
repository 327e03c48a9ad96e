/**
 * The dry run's stored plan (server/imports/staged-plan.ts): the commit writes it without reading
 * the file again while the registry facts it was built on hold, and plans from the file again
 * when they do not (a case it updates was changed, a case with one of its hospital identifiers
 * was written). The plan file is owner-only, holds no hospital identifier and goes at commit.
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp, type Client } from '../helpers.js';
import { drainJobs, freshDataDir, siteId, uploadAndDryRun, workbook } from './support.js';
import { planFileName, uploadDir } from '../../../server/imports/storage.js';

let t: TestApp;
let c: Client;
let hbr: string;
beforeAll(async () => {
  t = await startTestApp({ DATA_DIR: freshDataDir() });
  c = await t.as('abstractor');
  hbr = await siteId(t, 'HBR');
});
afterAll(async () => { await t.close(); });

const CASE_H = ['Case key (this file only)', 'Registry case number', 'Hospital identifier', 'Surgery date', 'Age', 'Sex', 'Weight'];
const dryRun = async (rows: (string | number | null)[][], name: string) =>
  (await uploadAndDryRun(t, c, await workbook({ Cases: [CASE_H, ...rows] }), name, { siteId: hbr, decimal: 'point' })).view;
async function commit(id: string, body: Record<string, unknown>) {
  const r = await c.post(`/api/imports/${id}/commit`, body);
  expect(r.status, JSON.stringify(r.body)).toBe(202);
  await drainJobs(t);
  return (await c.get(`/api/imports/${id}`)).body;
}
/** The cases an import created (its audit entries name them). */
const CREATED_BY = `SELECT entity_id FROM audit_entries WHERE action = 'case-created' AND details->>'importId' = $1`;
const planPath = (id: string) => path.join(uploadDir(t.context.config), planFileName(id));

describe('the stored plan of a dry run', () => {
  it('when nothing changed since the dry run, then the commit writes the stored plan without reading the upload again', async () => {
    const view = await dryRun([['S1', null, 'MRN-424242', '2026-05-04', 58, 'female', 66.5], ['S2', null, null, '2026-05-05', 71, 'male', 90]], 'staged.xlsx');
    expect(view.counts).toMatchObject({ new: 2, rejected: 0 });
    const plan = planPath(view.id);
    expect(fs.statSync(plan).mode & 0o777, 'owner-only').toBe(0o600);
    expect(fs.readFileSync(plan).includes('424242'), 'no hospital identifier in the plan').toBe(false);
    // Spoil the kept upload: a commit that read it again would fail on it.
    const [row] = await t.ds.query(`SELECT stored_path FROM import_jobs WHERE id = $1`, [view.id]);
    fs.writeFileSync(path.join(uploadDir(t.context.config), row.stored_path), 'not a workbook any more');
    const done = await commit(view.id, { existing: 'skip' });
    expect(done.status).toBe('committed');
    const cases = await t.ds.query(`SELECT age, weight_kg::float8 AS w FROM surgical_cases WHERE id::text IN (${CREATED_BY}) ORDER BY surgery_date`, [view.id]);
    expect(cases).toEqual([{ age: 58, w: 66.5 }, { age: 71, w: 90 }]);
    expect(fs.existsSync(plan), 'the plan goes with the upload').toBe(false);
  });

  it('when a case the file updates was changed after the dry run, then the commit plans from the file again and records the change against the current value', async () => {
    const first = await dryRun([['C1', null, null, '2026-06-02', 60, 'female', 61]], 'changed-1.xlsx');
    await commit(first.id, { existing: 'skip' });
    const [kase] = await t.ds.query(`SELECT id, registry_number FROM surgical_cases WHERE surgery_date = '2026-06-02' AND weight_kg = 61`);
    const upd = await dryRun([['C1', kase.registry_number, null, '2026-06-02', 62, 'female', 61]], 'changed-2.xlsx');
    expect(upd.counts).toMatchObject({ updated: 1 });
    // Someone edits the case between the dry run and the commit.
    await t.ds.query(`UPDATE surgical_cases SET age = 65, version = version + 1 WHERE id = $1`, [kase.id]);
    const done = await commit(upd.id, { existing: 'update' });
    expect(done.status).toBe('committed');
    expect((await t.ds.query(`SELECT age FROM surgical_cases WHERE id = $1`, [kase.id]))[0].age).toBe(62);
    const audits = await t.ds.query(`SELECT old_value, new_value FROM audit_entries WHERE entity_id = $1 AND action = 'import' AND field = 'age'`, [kase.id]);
    expect(audits).toEqual([{ old_value: '65', new_value: '62' }]);
  });

  it('when a case with the same hospital identifier and date was written after the dry run, then the commit flags the new case as a possible duplicate', async () => {
    const row = ['H1', null, 'MRN-909090', '2026-07-07', 44, 'male', 77];
    const a = await dryRun([row], 'dup-a.xlsx');
    expect(a.counts).toMatchObject({ new: 1, duplicates: 0 });
    const b = await dryRun([[...row.slice(0, 6), 78]], 'dup-b.xlsx');
    await commit(b.id, { existing: 'skip' });
    const done = await commit(a.id, { existing: 'skip' });
    expect(done.status).toBe('committed');
    const flags = await t.ds.query(`SELECT weight_kg::float8 AS w, possible_duplicate FROM surgical_cases WHERE id::text IN (${CREATED_BY.replace('= $1', 'IN ($1, $2)')}) ORDER BY weight_kg`, [a.id, b.id]);
    expect(flags).toEqual([{ w: 77, possible_duplicate: true }, { w: 78, possible_duplicate: false }]);
  });
});
