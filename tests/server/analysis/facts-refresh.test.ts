/**
 * The analysis tables the database keeps for itself must equal what they summarise, whichever
 * way a write reached them: the row triggers (a form edit, a small import) or the set-wise
 * refresh of a large import (`analysis_refresh_cases`, taken from BULK_REFRESH_ROWS rows on).
 * Checked as SQL set differences, both ways: every fact row against the fact view it is
 * computed from, and every roll-up cell against a fresh GROUP BY of the fact rows.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp, type Client } from '../helpers.js';
import { drainJobs, freshDataDir, siteId, uploadAndDryRun, workbook, type Cell } from '../imports/support.js';
import { columnOf } from '../../../shared/imports/fields.js';
import { BULK_REFRESH_ROWS } from '../../../server/imports/writer.js';

let t: TestApp;
let c: Client;
let hbr: string;
beforeAll(async () => {
  t = await startTestApp({ DATA_DIR: freshDataDir() });
  c = await t.as('abstractor');
  hbr = await siteId(t, 'HBR');
});
afterAll(async () => { await t.close(); });

const CELL_KEY = 'site_id, month, status, ariscat, incision, therapy';

/** Rows of `a` missing from `b` plus rows of `b` missing from `a`. */
async function difference(a: string, b: string): Promise<number> {
  const [{ n }] = await t.ds.query(`SELECT ((SELECT count(*) FROM (${a} EXCEPT ALL ${b}) x) + (SELECT count(*) FROM (${b} EXCEPT ALL ${a}) y))::int AS n`);
  return n;
}

async function expectConsistent(): Promise<void> {
  expect(await difference('SELECT * FROM analysis_case_facts', 'SELECT * FROM analysis_case_facts_source'), 'fact rows vs the fact view').toBe(0);
  const fresh = `SELECT f.site_id, f.month, f.status, coalesce(f.ariscat, 0)::smallint, coalesce(f.incision, 0)::smallint, f.therapy, count(*)::int,
      sum((f.event_types & 247 <> 0)::int)::int, sum((f.event_types & 1 <> 0)::int)::int, sum(f.pneumonia::int)::int
    FROM analysis_case_facts f GROUP BY 1, 2, 3, 4, 5, 6`;
  expect(await difference(`SELECT ${CELL_KEY}, n, any_ppc, atelectasis, pneumonia FROM analysis_cells`, fresh), 'roll-up cells vs the fact rows').toBe(0);
  const los = `SELECT f.site_id, f.month, f.status, coalesce(f.ariscat, 0)::smallint, coalesce(f.incision, 0)::smallint, f.therapy, f.los, count(*)::int FROM analysis_case_facts f WHERE f.los IS NOT NULL GROUP BY 1, 2, 3, 4, 5, 6, 7`;
  expect(await difference(`SELECT ${CELL_KEY}, los, n FROM analysis_los_cells`, los), 'length-of-stay cells vs the fact rows').toBe(0);
}

const label = (kind: 'cases' | 'outcomes', key: string) => columnOf(kind, key)!.label;

function importFile(n: number, prefix: string): Record<string, Cell[][]> {
  const cases: Cell[][] = [[label('cases', 'caseKey'), label('cases', 'surgeryDate'), label('cases', 'admissionDate'), label('cases', 'dischargeDate'), label('cases', 'age'), label('cases', 'sex')]];
  const outcomes: Cell[][] = [[label('outcomes', 'caseKey'), label('outcomes', 'type'), label('outcomes', 'onsetPostoperativeDay'), label('outcomes', 'clavienDindo')]];
  for (let i = 0; i < n; i++) {
    const month = String(1 + (i % 9)).padStart(2, '0');
    const day = String(1 + (i % 20)).padStart(2, '0');
    cases.push([`${prefix}${i}`, `2025-${month}-${day}`, `2025-${month}-${day}`, `2025-${month}-${String(3 + (i % 20) + (i % 7)).padStart(2, '0')}`, 40 + (i % 45), i % 2 ? 'female' : 'male']);
    if (i % 5 === 0) outcomes.push([`${prefix}${i}`, i % 10 === 0 ? 'atelectasis' : 'bronchospasm', 2, 'II']);
  }
  return { Cases: cases, Outcomes: outcomes };
}

async function importAndCommit(n: number, prefix: string): Promise<void> {
  const { view } = await uploadAndDryRun(t, c, await workbook(importFile(n, prefix)), `${prefix}.xlsx`, { siteId: hbr, decimal: 'point' });
  expect(view.counts.rejected, JSON.stringify(view.problems?.slice?.(0, 3))).toBe(0);
  const r = await c.post(`/api/imports/${view.id}/commit`, { existing: 'skip' });
  expect(r.status).toBe(202);
  await drainJobs(t);
  expect((await c.get(`/api/imports/${view.id}`)).body.status).toBe('committed');
}

describe('analysis tables after writes', () => {
  it('when a large import is committed (set-wise refresh), then the fact rows and roll-ups equal their sources', async () => {
    const before = (await t.ds.query(`SELECT count(*)::int AS n FROM analysis_case_facts`))[0].n;
    await importAndCommit(BULK_REFRESH_ROWS + 40, 'BULK');
    expect((await t.ds.query(`SELECT count(*)::int AS n FROM analysis_case_facts`))[0].n).toBe(before + BULK_REFRESH_ROWS + 40);
    await expectConsistent();
  });

  it('when a small import is committed (row triggers), then the fact rows and roll-ups equal their sources', async () => {
    await importAndCommit(12, 'SMALL');
    await expectConsistent();
  });

  it('when imported cases are incomplete, then the fact table says so and the worklist lists them from it', async () => {
    const [{ n }] = await t.ds.query(`SELECT count(*)::int AS n FROM analysis_case_facts f JOIN case_completeness cc ON cc.case_id = f.case_id WHERE f.complete <> cc.complete`);
    expect(n).toBe(0);
    const w = await c.get('/api/worklist');
    expect(w.status).toBe(200);
    const [{ open }] = await t.ds.query(
      `SELECT count(*)::int AS open FROM case_completeness cc WHERE cc.status IN ('draft', 'complete') AND NOT cc.complete AND cc.site_id IN (SELECT site_id FROM user_sites us JOIN users u ON u.id = us.user_id WHERE u.email = 'abstractor@tidewater.example')`);
    expect(w.body.missingData.total).toBe(open);
    expect(open).toBeGreaterThan(BULK_REFRESH_ROWS);
  });
});
