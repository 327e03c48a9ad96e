import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { startTestApp, type TestApp } from '../helpers.js';
import { makeCases, siteIdsByCode } from './factory.js';

// The cohort's numbers are computed here with our own SQL straight over the registry tables
// (surgical_cases, outcome_events), not over the analysis fact table or roll-up the service reads.
let t: TestApp;
let sites: Record<string, string>;
const YEAR = 2012;
const FROM = `${YEAR}-01-01`;
const TO = `${YEAR}-12-31`;
const COUNTED = `status IN ('complete', 'verified', 'locked')`;
const COMPOSITE = `('respiratory-infection', 'respiratory-failure', 'bronchospasm', 'atelectasis', 'pleural-effusion', 'pneumothorax', 'aspiration-pneumonitis')`;

async function own(sql: string, params: unknown[] = []): Promise<number> {
  const [r] = (await t.ds.query(sql, params)) as { v: string | number | null }[];
  return Number(r.v);
}

/** Counted cases of the window (optionally at some sites, optionally from a later start date). */
function base(extra = '', from = FROM) {
  return `FROM surgical_cases c WHERE c.${COUNTED} AND c.surgery_date BETWEEN '${from}' AND '${TO}' ${extra}`;
}
const hasEvent = (types: string) => `EXISTS (SELECT 1 FROM outcome_events e WHERE e.case_id = c.id AND e.removed_at IS NULL AND e.type IN ${types})`;

/** Wilson score interval written out from its definition (Wilson EB, JASA 1927;22:209-12), z from @stdlib. */
function wilson(x: number, n: number, level: number) {
  const z = normalQuantile(1 - (1 - level) / 2, 0, 1);
  const p = x / n;
  const centre = (p + (z * z) / (2 * n)) / (1 + (z * z) / n);
  const half = (z / (1 + (z * z) / n)) * Math.sqrt((p * (1 - p)) / n + (z * z) / (4 * n * n));
  return { lower: centre - half, upper: centre + half };
}

beforeAll(async () => {
  t = await startTestApp();
  sites = await siteIdsByCode(t.ds);
  await makeCases(t.ds, [sites.HBR, sites.KSV, sites.MRB], { count: 360, year: YEAR, seed: 7, prefix: 'ANT' });
  // One small site: a researcher must not see its counts.
  await makeCases(t.ds, [sites.CLF], { count: 6, year: YEAR, seed: 8, prefix: 'ANS' });
}, 120_000);
afterAll(async () => { await t?.close(); });

describe('analysis service against independent SQL over the registry tables', () => {
  it('when an analyst opens a cohort page, then size, outcome counts, patient-days and LOS quartiles match our own SQL', async () => {
    const c = await t.as('analyst');
    const res = await c.get(`/api/analysis/cohort?from=${FROM}&to=${TO}&level=0.9`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const body = res.body;
    const size = await own(`SELECT count(*) AS v ${base()}`);
    expect(size).toBeGreaterThan(150);
    expect(body.size).toBe(size);
    const m = (k: string) => body.measures.find((x: { key: string }) => x.key === k);
    expect(m('any-ppc').events).toBe(await own(`SELECT count(*) AS v ${base(`AND ${hasEvent(COMPOSITE)}`)}`));
    expect(m('atelectasis').events).toBe(await own(`SELECT count(*) AS v ${base(`AND ${hasEvent(`('atelectasis')`)}`)}`));
    expect(m('pneumonia').events).toBe(await own(`SELECT count(*) AS v ${base(`AND EXISTS (SELECT 1 FROM outcome_events e WHERE e.case_id = c.id AND e.removed_at IS NULL AND e.type = 'respiratory-infection' AND e.pneumonia_nhsn_met)`)}`));
    expect(m('readmission-30d').events).toBe(await own(`SELECT count(*) AS v ${base('AND c.readmitted_30d')}`));
    expect(m('death-30d').events).toBe(await own(`SELECT count(*) AS v ${base('AND c.died_30d')}`));
    const pd = await own(`SELECT sum(c.discharge_date - c.surgery_date) AS v ${base('AND c.discharge_date IS NOT NULL')}`);
    expect(m('pneumonia-per-1000-patient-days').denominator).toBe(pd);
    expect(body.completeness.verified).toBe(await own(`SELECT count(*) AS v ${base(`AND c.status IN ('verified', 'locked')`)}`));
    // Wilson interval at the chosen 90% level, from its definition with @stdlib's normal quantile.
    const w = wilson(m('any-ppc').events, size, 0.9);
    expect(m('any-ppc').interval.lower).toBeCloseTo(w.lower, 9);
    expect(m('any-ppc').interval.upper).toBeCloseTo(w.upper, 9);
    // Quartiles of LOS: PostgreSQL's percentile_cont is the same linear-interpolation (type 7) definition.
    const [q] = (await t.ds.query(`SELECT percentile_cont(0.25) WITHIN GROUP (ORDER BY c.discharge_date - c.admission_date) AS q1,
      percentile_cont(0.5) WITHIN GROUP (ORDER BY c.discharge_date - c.admission_date) AS med,
      percentile_cont(0.75) WITHIN GROUP (ORDER BY c.discharge_date - c.admission_date) AS q3 ${base('AND c.discharge_date IS NOT NULL')}`)) as { q1: number; med: number; q3: number }[];
    expect(body.los.q1).toBeCloseTo(Number(q.q1), 9);
    expect(body.los.median).toBeCloseTo(Number(q.med), 9);
    expect(body.los.q3).toBeCloseTo(Number(q.q3), 9);
    // Strata add up to the whole.
    const strataCases = body.byAriscat.reduce((s: number, x: { cases: number }) => s + x.cases, 0);
    expect(strataCases).toBe(size);
    const high = body.byAriscat.find((x: { key: string }) => x.key === 'high');
    expect(high.cases).toBe(await own(`SELECT count(*) AS v ${base(`AND c.ariscat_class = 'high'`)}`));
    const hbr = body.bySite.find((x: { key: string }) => x.key === 'HBR');
    expect(hbr.cases).toBe(await own(`SELECT count(*) AS v ${base('AND c.site_id = $1')}`, [sites.HBR]));
  });

  it('when the date range starts mid-month and adds non-roll-up filters, then the fact-table path matches our own SQL too', async () => {
    const c = await t.as('analyst');
    const from = `${YEAR}-03-15`;
    const r1 = await c.get(`/api/analysis/rates?from=${from}&to=${TO}&ariscat=intermediate,high&incision=upper-abdominal`);
    expect(r1.status).toBe(200);
    expect(r1.body.source).toBe('roll-up');
    expect(r1.body.size).toBe(await own(`SELECT count(*) AS v ${base(`AND c.ariscat_class IN ('intermediate', 'high') AND c.incision_site = 'upper-abdominal'`, from)}`));
    const r2 = await c.get(`/api/analysis/rates?from=${from}&to=${TO}&sex=female&asa=III,IV&status=verified,locked`);
    expect(r2.body.source).toBe('fact-table');
    expect(r2.body.size).toBe(await own(`SELECT count(*) AS v ${base(`AND c.sex = 'female' AND c.asa_class IN ('III', 'IV') AND c.status IN ('verified', 'locked')`, from)}`));
    const r3 = await c.get(`/api/analysis/rates?from=${FROM}&to=${TO}&therapy=yes&modality=pep`);
    expect(r3.body.size).toBe(await own(`SELECT count(*) AS v ${base(`AND EXISTS (SELECT 1 FROM therapy_episodes te WHERE te.case_id = c.id AND te.removed_at IS NULL AND te.modality = 'pep')`)}`));
  });

  it('when an event is removed, then the triggers update the counts at once', async () => {
    const c = await t.as('analyst');
    const before = (await c.get(`/api/analysis/rates?from=${FROM}&to=${TO}`)).body.measures.find((x: { key: string }) => x.key === 'atelectasis').events;
    const [ev] = (await t.ds.query(`SELECT e.id FROM outcome_events e JOIN surgical_cases c ON c.id = e.case_id WHERE e.type = 'atelectasis' AND e.removed_at IS NULL AND c.${COUNTED} AND c.surgery_date BETWEEN $1 AND $2
      AND NOT EXISTS (SELECT 1 FROM outcome_events o WHERE o.case_id = c.id AND o.id <> e.id AND o.type = 'atelectasis' AND o.removed_at IS NULL) LIMIT 1`, [FROM, TO])) as { id: string }[];
    await t.ds.query(`UPDATE outcome_events SET removed_at = now() WHERE id = $1`, [ev.id]);
    const after = (await c.get(`/api/analysis/rates?from=${FROM}&to=${TO}`)).body.measures.find((x: { key: string }) => x.key === 'atelectasis').events;
    expect(after).toBe(before - 1);
    await t.ds.query(`UPDATE outcome_events SET removed_at = NULL WHERE id = $1`, [ev.id]);
  });

  it('when HBR is compared with the rest of the network, then both sides match our own SQL', async () => {
    const c = await t.as('committee');
    const res = await c.get(`/api/analysis/compare?a.from=${FROM}&a.to=${TO}&a.site=${sites.HBR}&b=rest&expected=reference`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const ppc = res.body.outcomes.find((o: { key: string }) => o.key === 'any-ppc');
    expect(ppc.a.total).toBe(await own(`SELECT count(*) AS v ${base('AND c.site_id = $1')}`, [sites.HBR]));
    expect(ppc.b.total).toBe(await own(`SELECT count(*) AS v ${base('AND c.site_id <> $1')}`, [sites.HBR]));
    expect(ppc.b.events).toBe(await own(`SELECT count(*) AS v ${base(`AND c.site_id <> $1 AND ${hasEvent(COMPOSITE)}`)}`, [sites.HBR]));
    // Risk difference estimate is the plain difference of proportions (Newcombe 1998 point estimate).
    expect(ppc.difference.estimate).toBeCloseTo(ppc.a.events / ppc.a.total - ppc.b.events / ppc.b.total, 12);
    expect(ppc.fisherP).toBeGreaterThan(0);
    expect(ppc.fisherP).toBeLessThanOrEqual(1);
    expect(res.body.los.medianA).not.toBeNull();
  });

  it('when the cohort page is exported, then the workbook holds the same numbers, the filter, the methods and the user', async () => {
    const c = await t.as('analyst');
    const res = await c.get(`/api/analysis/export/cohort?from=${FROM}&to=${TO}`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (d: Buffer) => chunks.push(d));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toContain('spreadsheetml');
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(res.body as unknown as ArrayBuffer);
    const results = wb.getWorksheet('Results')!;
    const rows = new Map<string, ExcelJS.Row>();
    results.eachRow((row, i) => { if (i > 1) rows.set(String(row.getCell(1).value), row); });
    const ppcRow = rows.get('Any post-operative pulmonary complication')!;
    expect(Number(ppcRow.getCell(2).value)).toBe(await own(`SELECT count(*) AS v ${base(`AND ${hasEvent(COMPOSITE)}`)}`));
    expect(Number(ppcRow.getCell(3).value)).toBe(await own(`SELECT count(*) AS v ${base()}`));
    expect(ppcRow.getCell(4).numFmt).toBe('0.00%');
    const filterSheet = wb.getWorksheet('Filter')!;
    const filterText: string[] = [];
    filterSheet.eachRow((row) => filterText.push(row.values!.toString()));
    expect(filterText.join(' ')).toContain(FROM);
    expect(wb.getWorksheet('Methods')!.rowCount).toBeGreaterThan(2);
    const about: string[] = [];
    wb.getWorksheet('About')!.eachRow((row) => about.push(String(row.getCell(2).value)));
    expect(about.join(' ')).toContain('analyst@tidewater.example');
  });

  it('when a researcher opens the cohort page, then sites are coded and counts from 1 to 10 are hidden', async () => {
    const c = await t.as('researcher');
    const res = await c.get(`/api/analysis/cohort?from=${FROM}&to=${TO}`);
    expect(res.status).toBe(200);
    expect(res.body.siteVisibility).toBe('coded');
    for (const s of res.body.bySite) {
      expect(s.label).toMatch(/^Site \d+$/);
      if (s.cases != null) expect(s.cases === 0 || s.cases >= 11).toBe(true);
      for (const m of s.measures) if (m.events != null) expect(m.events === 0 || m.events >= 11).toBe(true);
    }
    // The six-case site is hidden (common practice (no source): CMS cell-size rule, minimum 11).
    expect(res.body.bySite.some((s: { cases: number | null }) => s.cases === null)).toBe(true);
    expect(JSON.stringify(res.body)).not.toContain('Harbour Row');
  });

  it('when an abstractor opens a site funnel, then only their own sites are shown, around the network proportion', async () => {
    const c = await t.as('abstractor');
    const res = await c.get(`/api/analysis/funnel?from=${FROM}&to=${TO}&measure=any-ppc`);
    expect(res.status).toBe(200);
    expect(res.body.sites.map((s: { key: string }) => s.key).sort()).toEqual(['HBR', 'KSV']);
    const net = await own(`SELECT count(*) FILTER (WHERE ${hasEvent(COMPOSITE)})::float8 / count(*) AS v ${base()}`);
    expect(res.body.target).toBeCloseTo(net, 12);
    expect(res.body.curve.length).toBeGreaterThan(10);
    for (const p of res.body.curve) expect(p.lower998).toBeLessThanOrEqual(p.lower95);
  });

  it('when a monthly series is asked for, then each month matches our own SQL and every month of the range is present', async () => {
    const c = await t.as('analyst');
    const res = await c.get(`/api/analysis/series?from=${FROM}&to=${TO}&measure=any-ppc&grouping=quarter`);
    expect(res.status).toBe(200);
    expect(res.body.points.map((p: { period: string }) => p.period)).toEqual([`${YEAR}-Q1`, `${YEAR}-Q2`, `${YEAR}-Q3`, `${YEAR}-Q4`]);
    const q2 = res.body.points[1];
    expect(q2.denominator).toBe(await own(`SELECT count(*) AS v FROM surgical_cases c WHERE c.${COUNTED} AND c.surgery_date BETWEEN '${YEAR}-04-01' AND '${YEAR}-06-30'`));
    expect(q2.lcl).not.toBeNull();
  });

  it('when the filter is malformed, then the answer is a 400 naming the field', async () => {
    const c = await t.as('analyst');
    const res = await c.get(`/api/analysis/rates?from=2012-13-01&ariscat=extreme`);
    expect(res.status).toBe(400);
    const paths = res.body.error.fields.map((f: { path: string }) => f.path);
    expect(paths).toContain('from');
    expect(paths.some((p: string) => p.startsWith('ariscatClasses'))).toBe(true);
    const lvl = await c.get(`/api/analysis/rates?level=0.8`);
    expect(lvl.status).toBe(400);
    expect(lvl.body.error.fields[0].path).toBe('level');
  });
});
