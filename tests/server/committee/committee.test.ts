import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import ExcelJS from 'exceljs';
import { startTestApp, demoEmail, type TestApp } from '../helpers.js';
import { runOne } from '../../../server/jobs/jobs.service.js';
import { remindOverdueActions } from '../../../server/committee/signals.service.js';
import { SITES } from '../../../server/db/seed/scenario.js';

let t: TestApp;
let siteId: Record<string, string>;

// The ARISCAT / EPCO composite, written out here from the publications rather than imported:
// respiratory infection, respiratory failure, bronchospasm, atelectasis, pleural effusion,
// pneumothorax, aspiration pneumonitis (Canet J et al., Anesthesiology 2010;113:1338-50).
const COMPOSITE = ['respiratory-infection', 'respiratory-failure', 'bronchospasm', 'atelectasis', 'pleural-effusion', 'pneumothorax', 'aspiration-pneumonitis'];

function previousMonth(): string {
  const now = new Intl.DateTimeFormat('en-CA', { timeZone: 'Europe/Lisbon', year: 'numeric', month: '2-digit' }).format(new Date()).slice(0, 7);
  const [y, m] = now.split('-').map(Number);
  return m === 1 ? `${y - 1}-12` : `${y}-${String(m - 1).padStart(2, '0')}`;
}

/** Test factory: verified cases of a site and month, each with an atelectasis event when `withEvent`. */
async function addCases(site: string, month: string, n: number, withEvent: boolean) {
  for (let i = 0; i < n; i++) {
    const [c] = await t.ds.query(
      `INSERT INTO surgical_cases (registry_number, registry_year, registry_seq, site_id, status, surgery_date, admission_date, discharge_date, ariscat_class)
       VALUES ($1, $2, $3, $4, 'verified', $5::date, $5::date, $5::date + 4, 'intermediate') RETURNING id`,
      [`TST-${month}-${site.slice(0, 4)}-${i}-${withEvent ? 'e' : 'n'}`, Number(month.slice(0, 4)), 900000 + i + (withEvent ? 5000 : 0), site, `${month}-10`],
    );
    if (withEvent) {
      await t.ds.query(`INSERT INTO outcome_events (case_id, type, onset_postoperative_day, definition, definition_version) VALUES ($1, 'atelectasis', 2, 'epco', 'test')`, [c.id]);
    }
  }
}

beforeAll(async () => {
  t = await startTestApp();
  const rows: { id: string; code: string }[] = await t.ds.query(`SELECT id, code FROM sites`);
  siteId = Object.fromEntries(rows.map((r) => [r.code, r.id]));
});
afterAll(async () => { await t?.close(); });

describe('measure charts', () => {
  it('when the committee reads a site chart, then its monthly counts equal an independent SQL count and its limits follow the p-chart formula', async () => {
    const c = await t.as('committee');
    const res = await c.get(`/api/measures/any-ppc/chart?site=${siteId.HBR}`);
    expect(res.status).toBe(200);
    const expected: { m: string; n: number; e: number }[] = await t.ds.query(
      `SELECT to_char(surgery_date, 'YYYY-MM') AS m, count(*)::int AS n,
              count(*) FILTER (WHERE EXISTS (SELECT 1 FROM outcome_events o WHERE o.case_id = c.id AND o.removed_at IS NULL AND o.type = ANY($2)))::int AS e
         FROM surgical_cases c WHERE site_id = $1 AND status IN ('complete', 'verified', 'locked') GROUP BY 1`,
      [siteId.HBR, COMPOSITE],
    );
    const byMonth = new Map(expected.map((r) => [r.m, r]));
    expect(res.body.points.length).toBeGreaterThan(24);
    for (const p of res.body.points) {
      const want = byMonth.get(p.period) ?? { n: 0, e: 0 };
      expect([p.period, p.numerator, p.denominator]).toEqual([p.period, want.e, want.n]);
    }
    // Baseline median: the middle of the first 12 monthly percentages, sorted here by hand.
    const base = res.body.points.filter((p: { value: number | null }) => p.value !== null).slice(0, 12).map((p: { value: number }) => p.value).sort((a: number, b: number) => a - b);
    expect(res.body.phases[0].median).toBeCloseTo((base[5] + base[6]) / 2, 6);
    // p-chart limits: p -+ 3 sqrt(p(1 - p)/n_i), p = baseline events / baseline cases (Provost & Murray, The Health Care Data Guide 2011, ch. 6).
    const first12 = res.body.points.slice(0, 12);
    const p = first12.reduce((s: number, x: { numerator: number }) => s + x.numerator, 0) / first12.reduce((s: number, x: { denominator: number }) => s + x.denominator, 0);
    const pt = res.body.points[20];
    expect(pt.upper).toBeCloseTo(100 * Math.min(1, p + 3 * Math.sqrt((p * (1 - p)) / pt.denominator)), 6);
    expect(pt.lower).toBeCloseTo(100 * Math.max(0, p - 3 * Math.sqrt((p * (1 - p)) / pt.denominator)), 6);
    // Anhøj's longest-run limit round(log2(n) + 3) (Anhøj & Olesen, PLoS One 2014).
    expect(res.body.phases[0].longestRunLimit).toBe(Math.round(Math.log2(res.body.phases[0].useful) + 3));
    // The protocol (HBR, protocolStart in the demo scenario) shows as a shift below the median, explained in words.
    const protocol = SITES.find((s) => s.code === 'HBR')!.protocolStart.slice(0, 7);
    const shift = res.body.signals.find((s: { rule: string; direction: string; startPeriod: string }) => s.rule === 'shift' && s.direction === 'below' && s.startPeriod >= protocol);
    expect(shift?.explanation).toMatch(/months in a row below the baseline median/);
    expect(res.body.annotations.map((a: { text: string }) => a.text)).toContain('Lung-expansion protocol introduced');
  });

  it('when a chart is re-based from the annotated protocol month, then each phase has its own median; an unannotated month is refused', async () => {
    const c = await t.as('analyst');
    const protocol = SITES.find((s) => s.code === 'HBR')!.protocolStart.slice(0, 7);
    const res = await c.get(`/api/measures/any-ppc/chart?site=${siteId.HBR}&rebase=${protocol}`);
    expect(res.status).toBe(200);
    expect(res.body.phases).toHaveLength(2);
    expect(res.body.phases[1].startPeriod).toBe(protocol);
    const second = res.body.points.filter((p: { phase: number; value: number | null }) => p.phase === 1 && p.value !== null).slice(0, 12).map((p: { value: number }) => p.value).sort((a: number, b: number) => a - b);
    expect(res.body.phases[1].median).toBeCloseTo((second[5] + second[6]) / 2, 6);
    const bad = await c.get(`/api/measures/any-ppc/chart?site=${siteId.HBR}&rebase=2023-02`);
    expect(bad.status).toBe(400);
    expect(bad.body.error.hint).toMatch(/pin a note/);
  });

  it('when a rare event is charted at the small site, then the g-chart counts the cases between events and the quarterly view sums months', async () => {
    const c = await t.as('committee');
    const g = await c.get(`/api/measures/pneumonia/g-chart?site=${siteId.CLF}`);
    expect(g.status).toBe(200);
    const flags: { ev: boolean }[] = await t.ds.query(
      `SELECT EXISTS (SELECT 1 FROM outcome_events o WHERE o.case_id = c.id AND o.removed_at IS NULL AND o.type = 'respiratory-infection' AND o.pneumonia_nhsn_met) AS ev
         FROM surgical_cases c WHERE site_id = $1 AND status IN ('complete', 'verified', 'locked') AND surgery_date < $2::date ORDER BY surgery_date, id`,
      [siteId.CLF, new Date().toISOString().slice(0, 8) + '01'],
    );
    // Cases between consecutive events, counted here in one pass (Benneyan, Health Care Manag Sci 2001).
    const between: number[] = [];
    let run = 0;
    let seen = 0;
    for (const f of flags) {
      if (f.ev) { if (seen > 0) between.push(run); seen += 1; run = 0; } else run += 1;
    }
    expect(g.body.points.map((p: { between: number }) => p.between)).toEqual(between);
    const mean = between.reduce((s, x) => s + x, 0) / between.length;
    expect(g.body.points[0].upper).toBeCloseTo(mean + 3 * Math.sqrt(mean * (mean + 1)), 6);
    const q = await c.get(`/api/measures/pneumonia/chart?site=${siteId.CLF}&view=quarterly`);
    const m = await c.get(`/api/measures/pneumonia/chart?site=${siteId.CLF}`);
    const q1 = q.body.points[1];
    const months = m.body.points.filter((p: { period: string }) => `${p.period.slice(0, 4)}-Q${Math.floor((Number(p.period.slice(5)) - 1) / 3) + 1}` === q1.period);
    expect(q1.denominator).toBe(months.reduce((s: number, p: { denominator: number }) => s + p.denominator, 0));
    expect(m.body.rareEventAdvice).toMatch(/g-chart/);
  });

  it('when an admin sets a baseline that ends before it starts, then the change is refused with the field named', async () => {
    const c = await t.as('admin');
    const r = await c.patch('/api/measures/any-ppc', { baselineStart: '2023-01', baselineEnd: '2022-06' });
    expect(r.status).toBe(400);
    expect(r.body.error.fields[0].path).toBe('baselineEnd');
    const ok = await c.patch('/api/measures/atelectasis', { baselineStart: '2022-01', baselineEnd: '2022-12' });
    expect(ok.status).toBe(200);
    const chart = await c.get(`/api/measures/atelectasis/chart?site=network`);
    expect(chart.body.points[0].period).toBe('2022-01');
    expect(chart.body.phases[0].baselinePoints).toBe(12);
  });
});

describe('month close, review, publish and packet', () => {
  const month = previousMonth();

  it('when a committee member who is not the chair closes a month, then it is refused', async () => {
    const c = await t.as('committee');
    expect((await c.post(`/api/committee/months/${month}/close`)).status).toBe(403);
  });

  it('when the chair closes the month, then its verified cases lock (audited), new signals are e-mailed naming measure, site and rule', async () => {
    // A burst of atelectasis at the small site in the month: a point far above the p-chart's limit.
    await addCases(siteId.CLF, month, 12, true);
    await addCases(siteId.CLF, month, 3, false);
    const chair = await t.as('chair');
    const detail = await chair.get(`/api/committee/months/${month}`);
    expect(detail.status).toBe(200);
    const clf = detail.body.sites.find((s: { siteCode: string }) => s.siteCode === 'CLF');
    expect(clf.verified).toBeGreaterThanOrEqual(15);
    const res = await chair.post(`/api/committee/months/${month}/close`);
    expect(res.status).toBe(200);
    expect(res.body.locked).toBe(detail.body.totals.verified);
    const [{ left }] = await t.ds.query(`SELECT count(*)::int AS left FROM surgical_cases WHERE status = 'verified' AND to_char(surgery_date, 'YYYY-MM') = $1`, [month]);
    expect(left).toBe(0);
    const [{ audited }] = await t.ds.query(`SELECT count(*)::int AS audited FROM audit_entries WHERE action = 'status-changed' AND new_value = 'locked' AND reason = $1`, [`month ${month} closed`]);
    expect(audited).toBe(res.body.locked);
    expect(res.body.signalsNotified).toBeGreaterThan(0);
    const mail = await t.mailTo(demoEmail('committee'));
    const signalMail = mail.find((m) => m.subject.includes('new signal') && m.subject.includes('CLF'));
    expect(signalMail?.subject).toMatch(/Atelectasis/);
    expect(signalMail?.body).toMatch(/Rule: Point outside the control limits/);
    expect(signalMail?.body).toContain('Cliffend Community Hospital (CLF)');
    // The site's analysts are told too.
    expect((await t.mailTo(demoEmail('analyst'))).some((m) => m.subject === signalMail?.subject)).toBe(true);
    expect((await chair.post(`/api/committee/months/${month}/close`)).status).toBe(409);
  });

  it('when the month is re-opened without a reason, then it is refused; with a reason, cases unlock and it is audited; closing again sends no repeat e-mail', async () => {
    const chair = await t.as('chair');
    expect((await chair.post(`/api/committee/months/${month}/reopen`, {})).status).toBe(400);
    const r = await chair.post(`/api/committee/months/${month}/reopen`, { reason: 'late correction from the CLF abstractor' });
    expect(r.status).toBe(200);
    expect(r.body.unlocked).toBeGreaterThan(0);
    const [entry] = await t.ds.query(`SELECT reason FROM audit_entries WHERE action = 'month-reopened' AND entity_id = $1`, [month]);
    expect(entry.reason).toBe('late correction from the CLF abstractor');
    const again = await chair.post(`/api/committee/months/${month}/close`);
    expect(again.status).toBe(200);
    expect(again.body.signalsNotified).toBe(0);
  });

  it('when members record the review and the chair signs it off, then it is fixed; a non-chair cannot sign', async () => {
    const member = await t.as('committee');
    const f = await member.put(`/api/reviews/${month}/findings/atelectasis`, { signalSeen: true, discussion: 'Cluster at CLF after the new ward opened.' });
    expect(f.status).toBe(200);
    const owners = (await member.get('/api/reviews/members')).body.items;
    const owner = owners.find((o: { displayName: string }) => o.displayName.startsWith('Anaya'));
    const a = await member.post(`/api/reviews/${month}/actions`, { measureKey: 'atelectasis', description: 'Audit CLF chest imaging reports', ownerId: owner.id, dueDate: '2020-01-31' });
    expect(a.status).toBe(201);
    expect(a.body.overdue).toBe(true);
    expect((await member.post(`/api/reviews/${month}/sign-off`)).status).toBe(403);
    const chair = await t.as('chair');
    const s = await chair.post(`/api/reviews/${month}/sign-off`);
    expect(s.status).toBe(200);
    expect(s.body.status).toBe('signed');
    expect((await member.put(`/api/reviews/${month}/findings/atelectasis`, { signalSeen: false, discussion: '' })).status).toBe(409);
    const open = (await member.get('/api/reviews/actions')).body.items;
    expect(open.some((x: { id: string }) => x.id === a.body.id)).toBe(true);
  });

  it('when an action is overdue, then its owner is reminded by e-mail once a week at most', async () => {
    const today = new Date().toISOString().slice(0, 10);
    const first = await remindOverdueActions(t.context, today, 'http://alveolog.test');
    expect(first).toBeGreaterThan(0);
    const mail = await t.mailTo(demoEmail('analyst'));
    expect(mail.find((m) => m.subject.includes('overdue'))?.body).toContain('Audit CLF chest imaging reports');
    expect(await remindOverdueActions(t.context, today, 'http://alveolog.test')).toBe(0);
  });

  it('when the chair publishes, then the packet job writes a workbook whose sheets hold the API numbers and a chart image, LibreOffice converts it, and the committee is e-mailed a link', async () => {
    const chair = await t.as('chair');
    const pub = await chair.post(`/api/committee/months/${month}/publish`);
    expect(pub.status).toBe(202);
    expect(await runOne(t.context)).toBe(true);
    const job = await chair.get(`/api/jobs/${pub.body.jobId}`);
    expect(job.body.status, job.body.error).toBe('succeeded');
    const file = await chair.get(`/api/committee/months/${month}/packet/file`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (d: Buffer) => chunks.push(d));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(file.status).toBe(200);
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'alveolog-packet-'));
    const xlsx = path.join(dir, `packet-${month}.xlsx`);
    fs.writeFileSync(xlsx, file.body as Buffer);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(xlsx);
    expect(wb.getWorksheet('Summary')).toBeTruthy();
    const measures = (await chair.get('/api/measures')).body.items.filter((m: { enabled: boolean }) => m.enabled);
    for (const m of measures) {
      const ws = wb.worksheets.find((w) => w.getCell('A1').value === m.label);
      expect(ws, `sheet for ${m.key}`).toBeTruthy();
      const api = (await chair.get(`/api/measures/${m.key}/chart?site=network&to=${month}`)).body;
      const rows: unknown[][] = [];
      ws!.eachRow((row, i) => { if (i > 3 && i <= 3 + api.points.length) rows.push((row.values as unknown[]).slice(1, 5)); });
      expect(rows, m.key).toEqual(api.points.map((p: { period: string; numerator: number; denominator: number; value: number | null }) => [p.period, p.numerator, p.denominator, p.value ?? undefined]));
      expect(ws!.getImages().length).toBe(1);
    }
    // LibreOffice (Debian libreoffice-calc-nogui) opens it and writes a PDF without errors.
    execFileSync('libreoffice', ['--headless', `-env:UserInstallation=file://${dir}/lo-profile`, '--convert-to', 'pdf', '--outdir', dir, xlsx], { timeout: 120_000, stdio: 'pipe' });
    const pdf = path.join(dir, `packet-${month}.pdf`);
    expect(fs.readFileSync(pdf).subarray(0, 5).toString()).toBe('%PDF-');
    const mail = await t.mailTo(demoEmail('committee'));
    const ready = mail.find((m) => m.subject.includes('review packet'));
    expect(ready?.body).toContain(`/committee/packet/${month}`);
    expect(ready?.body).toMatch(/Signals \(\d+\):/);
    fs.rmSync(dir, { recursive: true, force: true });
  }, 180_000);
});
