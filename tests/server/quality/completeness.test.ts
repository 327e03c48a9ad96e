/**
 * The data-quality page's completeness figures on the demo data, checked against counts computed
 * here without the `case_completeness` view: plain SQL over the case columns for single fields,
 * the follow-up window (day 0 to day 30, closed from day 31: common practice, no source) and the
 * verification wait, and the registry's completeness rules run in JavaScript case by case
 * (shared/registry/completeness.ts caseCompleteness) for the complete and per-section counts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { caseCompleteness, COMPLETENESS_SECTIONS } from '../../../shared/registry/completeness.js';
import { loadCase, loadEpisodes, loadEvents } from '../../../server/cases/case.repo.js';
import { startTestApp, type TestApp } from '../helpers.js';
import { siteIds } from '../registry/factories.js';

let t: TestApp;
let sites: Record<string, string>;
beforeAll(async () => {
  t = await startTestApp();
  sites = await siteIds(t.ds);
});
afterAll(async () => { await t.close(); });

const todayIso = () => new Intl.DateTimeFormat('en-CA', { timeZone: t.config.NETWORK_TIME_ZONE, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());

async function casesOf(siteId: string, month: string): Promise<string[]> {
  return (await t.ds.query(`SELECT id FROM surgical_cases WHERE site_id = $1 AND to_char(surgery_date, 'YYYY-MM') = $2 AND status <> 'withdrawn'`, [siteId, month])).map((r: { id: string }) => r.id);
}

describe('completeness per site and month', () => {
  for (const code of ['HBR', 'MRB']) {
    it(`when the ${code} page is opened for recent months, then its counts equal SQL counts and the completeness rules run case by case`, async () => {
      const analyst = await t.as('analyst');
      const first = await analyst.get(`/api/quality/completeness?siteId=${sites[code]}`);
      expect(first.status).toBe(200);
      const latest = first.body.month as string;
      expect(latest).toMatch(/^\d{4}-\d{2}$/);
      const [y, m] = latest.split('-').map(Number);
      const earlier = `${m <= 3 ? y - 1 : y}-${String(((m - 4 + 12) % 12) + 1).padStart(2, '0')}`;
      for (const month of [latest, earlier]) {
        const r = await analyst.get(`/api/quality/completeness?siteId=${sites[code]}&month=${month}&months=6`);
        expect(r.status).toBe(200);
        const ids = await casesOf(sites[code], month);
        expect(r.body.cases).toBe(ids.length);
        expect(ids.length).toBeGreaterThan(0);

        let complete = 0;
        const sectionOk = Object.fromEntries(COMPLETENESS_SECTIONS.map((s) => [s, 0]));
        const fieldMissing = new Map<string, number>();
        for (const id of ids) {
          const c = (await loadCase(t.ds, id))!;
          const eps = (await loadEpisodes(t.ds, id)).map((e) => ({ id: e.id, ...e.fields }));
          const evs = (await loadEvents(t.ds, id)) as unknown as Record<string, unknown>[];
          const res = caseCompleteness(c.fields, eps, evs);
          if (res.complete) complete++;
          for (const s of COMPLETENESS_SECTIONS) if (res.sections[s] === 0) sectionOk[s]++;
          const fields = new Set(res.missing.map((x) => x.field.replace(/^(therapy|outcomes)\.[0-9a-f-]{36}\./, '$1.')));
          for (const f of fields) fieldMissing.set(f, (fieldMissing.get(f) ?? 0) + 1);
        }
        expect(r.body.complete).toBe(complete);
        // The demo's latest month has drafts missing fields, so the check is not vacuous.
        if (month === latest) expect(complete).toBeLessThan(ids.length);
        expect(r.body.share).toBeCloseTo(complete / ids.length, 12);
        for (const s of r.body.sections) expect(s.complete, `${month} ${s.section}`).toBe(sectionOk[s.section]);
        expect(Object.fromEntries(r.body.fields.map((f: { field: string; missing: number }) => [f.field, f.missing]))).toEqual(Object.fromEntries(fieldMissing));

        // Single fields by plain SQL over the columns.
        const [sql] = await t.ds.query(
          `SELECT count(*) FILTER (WHERE eligible IS DISTINCT FROM false AND preop_haemoglobin_g_dl IS NULL)::int AS hb,
                  count(*) FILTER (WHERE eligible IS DISTINCT FROM false AND complications_reviewed IS DISTINCT FROM true)::int AS reviewed,
                  count(*) FILTER (WHERE eligible IS DISTINCT FROM false AND follow_up_completed_on IS NULL AND surgery_date + 30 < $3::date)::int AS overdue,
                  count(*) FILTER (WHERE status = 'complete' AND completed_at < now() - make_interval(days => $4::int))::int AS waiting
             FROM surgical_cases WHERE site_id = $1 AND to_char(surgery_date, 'YYYY-MM') = $2 AND status <> 'withdrawn'`,
          [sites[code], month, todayIso(), t.config.VERIFY_WAIT_DAYS],
        );
        const missingOf = (f: string) => r.body.fields.find((x: { field: string }) => x.field === f)?.missing ?? 0;
        expect(missingOf('preopHaemoglobin')).toBe(sql.hb);
        expect(missingOf('complicationsReviewed')).toBe(sql.reviewed);
        expect(r.body.followUpOverdue.total).toBe(sql.overdue);
        expect(r.body.awaitingVerification.total).toBe(sql.waiting);
        expect(r.body.verifyWaitDays).toBe(t.config.VERIFY_WAIT_DAYS);

        const point = r.body.trend.find((p: { month: string }) => p.month === month);
        expect(point).toEqual({ month, cases: ids.length, complete, share: complete / ids.length });
        expect(r.body.trend).toHaveLength(6);
      }
    });
  }

  it('when the page covers several sites, then it adds up the sites', async () => {
    const analyst = await t.as('analyst');
    const month = (await analyst.get(`/api/quality/completeness?siteId=${sites.HBR}`)).body.month;
    const one = await Promise.all(['HBR', 'KSV'].map((c) => analyst.get(`/api/quality/completeness?siteId=${sites[c]}&month=${month}`)));
    const both = await analyst.get(`/api/quality/completeness?siteId=${sites.HBR},${sites.KSV}&month=${month}`);
    expect(both.body.cases).toBe(one[0].body.cases + one[1].body.cases);
    expect(both.body.complete).toBe(one[0].body.complete + one[1].body.complete);
  });

  it('when an abstractor asks for another site, then 400; a researcher is refused; bad months are named', async () => {
    const ab = await t.as('abstractor');
    const other = await ab.get(`/api/quality/completeness?siteId=${sites.MRB}`);
    expect(other.status).toBe(400);
    expect(other.body.error.fields[0].path).toBe('siteId');
    const own = await ab.get(`/api/quality/completeness`);
    expect(own.status).toBe(200);
    expect(own.body.sites.map((s: { code: string }) => s.code).sort()).toEqual(['HBR', 'KSV']);
    expect((await (await t.as('researcher')).get('/api/quality/completeness')).status).toBe(403);
    const bad = await ab.get(`/api/quality/completeness?month=2025-13`);
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].path).toBe('month');
  });
});
