// GET /api/cases over the demo data (about 10,000 fictional cases) plus each test's own cases.
// Expected counts are computed independently with plain SQL on the same database.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers.js';
import { completeCase, createCase, siteIds } from './factories.js';

let t: TestApp;
let site: Record<string, string>;
beforeAll(async () => {
  t = await startTestApp();
  site = await siteIds(t.ds);
});
afterAll(async () => { await t.close(); });

const n = async (sql: string, params: unknown[] = []) => (await t.ds.query(sql, params))[0].n as number;

describe('case list', () => {
  it('when a page is asked for, then it answers { items, total, page, pageSize } sorted by surgery date, newest first', async () => {
    const ab = await t.as('abstractor');
    const r = await ab.get('/api/cases?page=2&pageSize=25');
    expect(r.status).toBe(200);
    expect(r.body.page).toBe(2);
    expect(r.body.pageSize).toBe(25);
    expect(r.body.items).toHaveLength(25);
    const dates = r.body.items.map((i: { surgeryDate: string }) => i.surgeryDate);
    expect([...dates].sort().reverse()).toEqual(dates);
    const expected = await n(`SELECT count(*)::int AS n FROM surgical_cases WHERE site_id = ANY($1::uuid[])`, [[site.HBR, site.KSV]]);
    expect(r.body.total).toBe(expected);
  });

  it('when filtered by site, status, risk class and outcome, then the total matches the same filter in SQL', async () => {
    const ab = await t.as('abstractor');
    const r = await ab.get(`/api/cases?siteId=${site.KSV}&status=locked,verified&riskClass=high&outcome=any-ppc&pageSize=500`);
    expect(r.status).toBe(200);
    const expected = await n(
      `SELECT count(*)::int AS n FROM surgical_cases c WHERE c.site_id = $1 AND c.status IN ('locked', 'verified') AND c.ariscat_class = 'high'
         AND EXISTS (SELECT 1 FROM outcome_events o WHERE o.case_id = c.id AND o.removed_at IS NULL
                     AND o.type IN ('respiratory-infection', 'respiratory-failure', 'bronchospasm', 'atelectasis', 'pleural-effusion', 'pneumothorax', 'aspiration-pneumonitis'))`,
      [site.KSV],
    );
    expect(expected).toBeGreaterThan(0);
    expect(r.body.total).toBe(expected);
    expect(r.body.totalIsEstimate).toBe(false);
    for (const i of r.body.items) {
      expect(i.siteCode).toBe('KSV');
      expect(i.ariscatClass).toBe('high');
      expect(i.anyPpc).toBe(true);
    }
  });

  it('when filtered by dates, procedure category and pneumonia, then only matching cases come back', async () => {
    const ab = await t.as('abstractor');
    const r = await ab.get('/api/cases?surgeryFrom=2023-01-01&surgeryTo=2024-12-31&procedureCategory=colorectal,upper-gastrointestinal&outcome=pneumonia-nhsn&pageSize=500');
    expect(r.status).toBe(200);
    const expected = await n(
      `SELECT count(*)::int AS n FROM surgical_cases c WHERE c.site_id = ANY($1::uuid[]) AND c.surgery_date BETWEEN '2023-01-01' AND '2024-12-31'
         AND c.procedure_category IN ('colorectal', 'upper-gastrointestinal')
         AND EXISTS (SELECT 1 FROM outcome_events o WHERE o.case_id = c.id AND o.removed_at IS NULL AND o.type = 'respiratory-infection' AND o.pneumonia_nhsn_met)`,
      [[site.HBR, site.KSV]],
    );
    expect(r.body.total).toBe(expected);
    for (const i of r.body.items) {
      expect(i.surgeryDate >= '2023-01-01' && i.surgeryDate <= '2024-12-31').toBe(true);
      expect(i.eventTypes).toContain('respiratory-infection');
    }
  });

  it('when sorted by ARISCAT points ascending, then the points do not decrease and unscored cases come last', async () => {
    const ab = await t.as('abstractor');
    const r = await ab.get(`/api/cases?sort=ariscatPoints.asc&siteId=${site.HBR}&pageSize=500`);
    const pts = r.body.items.map((i: { ariscatPoints: number | null }) => i.ariscatPoints).filter((p: number | null) => p !== null);
    for (let i = 1; i < pts.length; i++) expect(pts[i]).toBeGreaterThanOrEqual(pts[i - 1]);
  });

  it('when searching by the beginning of a registry number, then the case is found', async () => {
    const ab = await t.as('abstractor');
    const k = await createCase(ab, completeCase(site.HBR));
    const r = await ab.get(`/api/cases?q=${k.registryNumber}`);
    expect(r.body.items.map((i: { id: string }) => i.id)).toEqual([k.id]);
    expect(r.body.items[0].complete).toBe(true);
  });

  it('when an administrator lists every case without filters above 10,000 rows, then the total is the planner estimate, flagged', async () => {
    const total = await n(`SELECT count(*)::int AS n FROM surgical_cases`);
    if (total <= 10_000) {
      // Make sure there are more than 10,000 rows: copies of demo cases with new numbers.
      await t.ds.query(`INSERT INTO surgical_cases (registry_number, registry_year, registry_seq, site_id, surgery_date, status)
        SELECT 'ZZZ-' || g, 1999, g, $1, DATE '2022-01-01', 'draft' FROM generate_series(1, $2::int) g`, [site.HBR, 10_001 - total + 500]);
    }
    await t.ds.query(`ANALYZE surgical_cases`);
    const admin = await t.as('admin');
    const r = await admin.get('/api/cases?pageSize=10');
    expect(r.body.totalIsEstimate).toBe(true);
    const exact = await n(`SELECT count(*)::int AS n FROM surgical_cases`);
    // The estimate comes from the table statistics (pg_class.reltuples after ANALYZE): within 5%.
    expect(Math.abs(r.body.total - exact) / exact).toBeLessThan(0.05);
    const filtered = await admin.get('/api/cases?pageSize=10&status=draft');
    expect(filtered.body.totalIsEstimate).toBe(false);
    expect(filtered.body.total).toBe(await n(`SELECT count(*)::int AS n FROM surgical_cases WHERE status = 'draft'`));
    await t.ds.query(`DELETE FROM surgical_cases WHERE registry_number LIKE 'ZZZ-%'`);
  });

  it('when the first page is planned, then it reads the surgery-date index instead of sorting the table', async () => {
    const [row] = await t.ds.query(`EXPLAIN (FORMAT JSON) SELECT c.id FROM surgical_cases c ORDER BY c.surgery_date DESC, c.id DESC LIMIT 50`);
    expect(JSON.stringify(row['QUERY PLAN'])).toMatch(/IDX_cases_surgery/);
  });
});
