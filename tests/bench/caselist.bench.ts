/**
 * Issue 10's scale figures for the registry screens on the 1,000,000-case registry: the case
 * list page, sorted and filtered (target < 50 ms; totals above 10,000 rows may be the planner's
 * estimate), each beside a bare SQL of the same page; and the abstractor's worklist (four lists
 * read at once, as named prepared statements: after five runs PostgreSQL may keep a generic plan,
 * which these timings, taken after warm-up, include).
 */
import type { Bench } from './harness.js';

export default async function caseListBench(b: Bench): Promise<void> {
  const c = await b.as('admin');
  const must = async (url: string) => {
    const r = await c.get(url);
    if (r.status !== 200) throw new Error(`${url} -> ${r.status} ${JSON.stringify(r.body).slice(0, 300)}`);
    return r.body as { total: number; totalIsEstimate?: boolean };
  };
  const cols = 'id, registry_number, site_id, surgery_date, status, ariscat_points, ariscat_class, procedure_category';
  const pages: { cohort: string; url: string; sql: { text: string; values?: unknown[] } }[] = [
    { cohort: 'whole registry, newest first, page 1', url: '/api/cases?page=1&pageSize=50&sort=surgeryDate.desc',
      sql: { text: `SELECT ${cols} FROM surgical_cases ORDER BY surgery_date DESC, id DESC LIMIT 50` } },
    { cohort: 'whole registry, page 200', url: '/api/cases?page=200&pageSize=50&sort=surgeryDate.desc',
      sql: { text: `SELECT ${cols} FROM surgical_cases ORDER BY surgery_date DESC, id DESC LIMIT 50 OFFSET 9950` } },
    { cohort: 'one site, verified, 2025, by ARISCAT points', url: `/api/cases?page=1&pageSize=50&siteId=${b.sites.HBR}&status=verified&surgeryFrom=2025-01-01&surgeryTo=2025-12-31&sort=ariscatPoints.desc`,
      sql: { text: `SELECT ${cols} FROM surgical_cases WHERE site_id = $1 AND status = 'verified' AND surgery_date BETWEEN '2025-01-01' AND '2025-12-31' ORDER BY ariscat_points DESC NULLS LAST, id LIMIT 50`, values: [b.sites.HBR] } },
    { cohort: 'high risk, newest first', url: '/api/cases?page=1&pageSize=50&riskClass=high&sort=surgeryDate.desc',
      sql: { text: `SELECT ${cols} FROM surgical_cases WHERE ariscat_class = 'high' ORDER BY surgery_date DESC, id DESC LIMIT 50` } },
  ];
  for (const p of pages) {
    const first = await must(p.url);
    b.log(`${p.cohort}: total ${first.totalIsEstimate ? 'about ' : ''}${first.total.toLocaleString('en')}`);
    await b.time('case list page (GET /api/cases)', p.cohort, () => must(p.url), { bareSql: p.sql, target: '< 50 ms' });
  }
  for (const key of ['abstractor', 'admin']) {
    const w = await b.as(key);
    const url = '/api/worklist?limit=50';
    await b.time('worklist (GET /api/worklist)', key === 'admin' ? 'every site' : "the abstractor's sites", async () => {
      const r = await w.get(url);
      if (r.status !== 200) throw new Error(`${url} -> ${r.status}`);
    }, { target: 'informative' });
  }
}
