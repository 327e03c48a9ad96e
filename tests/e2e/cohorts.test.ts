import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import fs from 'node:fs';
import { startBrowserApp, signIn, expectAccessible, screenshot, type BrowserApp } from './browser.js';
import { SITES } from '../../server/db/seed/scenario.js';

let b: BrowserApp;
let hbr: string;
beforeAll(async () => {
  b = await startBrowserApp();
  [{ id: hbr }] = await b.t.ds.query(`SELECT id FROM sites WHERE code = 'HBR'`);
});
afterAll(async () => { await b?.close(); });

/** Counted high-risk cases with therapy, by our own SQL over the registry tables (not the analysis tables). */
async function highRiskWithTherapy(): Promise<number> {
  const [r] = await b.t.ds.query(`SELECT count(*)::int AS n FROM surgical_cases c WHERE c.status IN ('complete', 'verified', 'locked') AND c.ariscat_class = 'high'
    AND (c.therapy_given OR EXISTS (SELECT 1 FROM therapy_episodes t WHERE t.case_id = c.id AND t.removed_at IS NULL))`);
  return r.n;
}

describe('cohorts in the browser', () => {
  it('when an analyst builds, saves, shares by link and exports a cohort, then a committee member opening the link sees the same cohort', async () => {
    const page = await b.newPage();
    const other = await b.newPage();
    try {
      await signIn(page, b.baseUrl, 'analyst');
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Cohorts', exact: true }).click();
      await page.getByRole('heading', { name: 'Cohort builder', level: 1 }).waitFor();
      // Build: high ARISCAT class, with lung-expansion therapy.
      await page.locator('summary', { hasText: 'ARISCAT risk class' }).click();
      // The URL is the state: the box shows checked once the navigation has re-rendered the page.
      const high = page.getByLabel('High (≥ 45 points)');
      await high.click();
      await expect.poll(() => high.isChecked()).toBe(true);
      await page.getByLabel('Lung-expansion therapy received').selectOption('yes');
      const expected = await highRiskWithTherapy();
      expect(expected).toBeGreaterThan(10);
      await page.getByRole('heading', { name: `Cohort: ${expected.toLocaleString('en')} counted cases` }).waitFor();
      expect(page.url()).toContain('ariscat=high');
      expect(page.url()).toContain('therapy=yes');
      await page.getByRole('img', { name: /Bar chart of \d+ outcome proportions/ }).waitFor();
      await expectAccessible(page, 'cohort builder');
      await screenshot(page, 'cohorts-builder');

      // Save and share.
      await page.getByLabel('Name').fill('High risk with therapy (e2e)');
      await page.getByLabel("Share with the network's analysts and committee").click();
      await page.getByRole('button', { name: 'Save cohort' }).click();
      await page.getByRole('link', { name: 'High risk with therapy (e2e)' }).waitFor();
      await page.getByText('shared').first().waitFor();

      // Share by link: another person opens the address.
      const link = page.url();
      await signIn(other, b.baseUrl, 'committee');
      await other.goto(link);
      await other.getByRole('heading', { name: `Cohort: ${expected.toLocaleString('en')} counted cases` }).waitFor();
      await other.getByRole('link', { name: 'High risk with therapy (e2e)' }).waitFor();

      // Export: the workbook holds the same count, the filter and the user.
      const [dl] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Export workbook' }).click()]);
      const file = await dl.path();
      const wb = new ExcelJS.Workbook();
      await wb.xlsx.load(fs.readFileSync(file!) as unknown as ArrayBuffer);
      const results = wb.getWorksheet('Results')!;
      const ppc = results.getRow(2);
      expect(String(ppc.getCell(1).value)).toBe('Any post-operative pulmonary complication');
      expect(Number(ppc.getCell(3).value)).toBe(expected);
      const filterText: string[] = [];
      wb.getWorksheet('Filter')!.eachRow((r) => filterText.push(String(r.getCell(3).value)));
      expect(filterText.join(' ')).toContain('high');
      const about: string[] = [];
      wb.getWorksheet('About')!.eachRow((r) => about.push(String(r.getCell(2).value)));
      expect(about.join(' ')).toContain('analyst@tidewater.example');

      // Print: the chart and its table are on the printed page, the filters are not.
      await page.emulateMedia({ media: 'print' });
      await expect(page.getByRole('img', { name: /Bar chart of \d+ outcome proportions/ }).isVisible()).resolves.toBe(true);
      await expect(page.getByRole('table', { name: 'Outcomes of the cohort' }).isVisible()).resolves.toBe(true);
      await expect(page.getByRole('group', { name: 'Filters' }).isVisible()).resolves.toBe(false);
      await screenshot(page, 'cohorts-builder-print');
      await page.emulateMedia({ media: 'screen' });
    } finally {
      await page.context().close();
      await other.context().close();
    }
  });

  it('when an analyst compares before and after the protocol at one site, then the forest plot and its table show every outcome', async () => {
    const page = await b.newPage();
    try {
      await signIn(page, b.baseUrl, 'analyst');
      const start = SITES.find((s) => s.code === 'HBR')!.protocolStart;
      const dayBefore = new Date(`${start}T00:00:00Z`); dayBefore.setUTCDate(dayBefore.getUTCDate() - 1);
      const q = new URLSearchParams({ 'a.site': hbr, 'a.from': start, 'b.site': hbr, 'b.to': dayBefore.toISOString().slice(0, 10), expected: 'reference', level: '0.95' });
      await page.goto(`${b.baseUrl}/cohorts/compare?${q}`);
      await page.getByRole('heading', { name: 'Compare cohorts', level: 1 }).waitFor();
      await page.getByRole('img', { name: /Forest plot of risk ratios A versus B/ }).waitFor();
      const table = page.getByRole('table', { name: /Comparison with 95% confidence intervals/ });
      await table.waitFor();
      await expect(table.getByRole('row').count()).resolves.toBe(7);
      await page.getByText(/Mann–Whitney U = /).waitFor();
      await expectAccessible(page, 'compare cohorts');
      await screenshot(page, 'cohorts-compare-protocol');
      // Therapy vs no therapy within high-risk patients, risk-adjusted against ARISCAT's published risks.
      const q2 = new URLSearchParams({ 'a.ariscat': 'high', 'a.therapy': 'yes', 'b.ariscat': 'high', 'b.therapy': 'no', expected: 'ariscat-published', level: '0.9' });
      await page.goto(`${b.baseUrl}/cohorts/compare?${q2}`);
      await page.getByRole('table', { name: /Comparison with 90% confidence intervals/ }).waitFor();
      await screenshot(page, 'cohorts-compare-therapy-high-risk');
    } finally {
      await page.context().close();
    }
  });

  it('when a researcher opens the site funnel, then sites are coded and no site name appears', async () => {
    const page = await b.newPage();
    try {
      await signIn(page, b.baseUrl, 'researcher');
      await page.goto(`${b.baseUrl}/cohorts/funnel?measure=any-ppc`);
      await page.getByRole('img', { name: /Funnel plot of Any post-operative pulmonary complication/ }).waitFor();
      await page.getByRole('cell', { name: /^Site \d+$/ }).first().waitFor();
      expect(await page.content()).not.toContain('Harbour Row');
      await expectAccessible(page, 'site funnel (researcher)');
      await screenshot(page, 'cohorts-funnel-researcher');
    } finally {
      await page.context().close();
    }
  });
});
