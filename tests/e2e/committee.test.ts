import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startBrowserApp, signIn, expectAccessible, screenshot, type BrowserApp } from './browser.js';
import { runOne } from '../../server/jobs/jobs.service.js';
import { SITES } from '../../server/db/seed/scenario.js';

let b: BrowserApp;
let hbr: string;
let reviewMonth: string;
beforeAll(async () => {
  b = await startBrowserApp();
  [{ id: hbr }] = await b.t.ds.query(`SELECT id FROM sites WHERE code = 'HBR'`);
  // The newest month the demo recorded as closed: the committee reviews it, the chair signs it off.
  [{ m: reviewMonth }] = await b.t.ds.query(`SELECT to_char(max(month), 'YYYY-MM') AS m FROM committee_month_closes WHERE closed`);
});
afterAll(async () => { await b?.close(); });

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const label = (m: string) => `${MONTHS[Number(m.slice(5)) - 1]} ${m.slice(0, 4)}`;

describe('committee review in the browser', () => {
  it('when a committee member opens the demo site chart, then the protocol shows as a shift explained in words, with its note', async () => {
    const page = await b.newPage();
    try {
      await signIn(page, b.baseUrl, 'committee');
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Measure charts' }).click();
      await page.getByRole('heading', { name: 'Measure charts', level: 1 }).waitFor();
      await page.getByLabel('Site').selectOption(hbr);
      await page.getByText('Harbour Row General Hospital (HBR).').first().waitFor();
      const protocol = SITES.find((s) => s.code === 'HBR')!.protocolStart.slice(0, 7);
      // A shift below the baseline median after the protocol month (Perla, Provost & Murray 2011: six or more points).
      const shifts = await page.getByText(/Shift: \d+ months in a row below the baseline median/).allTextContents();
      expect(shifts.some((s) => {
        const m = s.match(/\((\w{3}) (\d{4}) to/);
        return m && `${m[2]}-${String(MONTHS.indexOf(m[1]) + 1).padStart(2, '0')}` >= protocol;
      })).toBe(true);
      await expect(page.getByText('Lung-expansion protocol introduced').count()).resolves.toBeGreaterThan(0);
      await page.getByRole('img', { name: /Run chart of Any post-operative pulmonary complication/ }).waitFor();
      await page.getByRole('img', { name: /p-chart of Any post-operative pulmonary complication/ }).waitFor();
      await expectAccessible(page, 'committee charts');
      await screenshot(page, 'committee-charts-hbr');
      // Re-base from the protocol note: two phases.
      await page.getByLabel('Start a new phase here (re-base)').first().click();
      await page.getByText(/Phase 2 \(/).waitFor();
      await screenshot(page, 'committee-charts-hbr-rebased');
      // The network's process measure: therapy uptake rises after the protocols.
      await page.getByLabel('Site').selectOption('network');
      await page.getByLabel('Measure').selectOption('early-therapy-at-risk');
      await page.getByText(/Shift: \d+ months in a row above the baseline median/).first().waitFor();
      await screenshot(page, 'committee-charts-network-early-therapy');
    } finally {
      await page.context().close();
    }
  });

  it('when a committee member records the review, then the chair closes a month, signs the review off and publishes its packet', async () => {
    const member = await b.newPage();
    try {
      await signIn(member, b.baseUrl, 'committee');
      await member.goto(`${b.baseUrl}/committee/reviews/${reviewMonth}`);
      await member.getByRole('heading', { name: `Review of ${label(reviewMonth)}`, level: 1 }).waitFor();
      const panel = member.locator('section', { has: member.getByRole('heading', { name: 'Any post-operative pulmonary complication', level: 2 }) });
      await panel.getByLabel('The committee saw a signal for this measure').check();
      await panel.getByLabel('Discussion').fill('HBR below its baseline since the protocol: a sustained improvement.');
      await panel.getByRole('button', { name: /Save finding/ }).click();
      await panel.getByText(/Saved by Coral Committee/).waitFor();
      await panel.getByLabel('New action').fill('Share the HBR protocol with Cliffend');
      await panel.getByLabel('Owner').selectOption({ label: 'Anaya Analyst (demo)' });
      await panel.getByLabel('Due date').fill('2027-01-31');
      await panel.getByRole('button', { name: 'Add action' }).click();
      await panel.getByText(/Share the HBR protocol with Cliffend — Anaya Analyst/).waitFor();
      await expect(member.getByRole('button', { name: 'Sign off the review' }).count()).resolves.toBe(0);
      await expectAccessible(member, 'committee review');
      await screenshot(member, 'committee-review-member');
    } finally {
      await member.context().close();
    }

    const chair = await b.newPage();
    try {
      await signIn(chair, b.baseUrl, 'chair');
      await chair.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Month close' }).click();
      await chair.getByRole('heading', { name: 'Month close', level: 1 }).waitFor();
      const close = chair.getByRole('button', { name: /^Close / });
      await close.waitFor();
      await expectAccessible(chair, 'month close');
      await screenshot(chair, 'committee-month-close');
      await close.click();
      await chair.getByText(/Closed: \d+ case\(s\) locked/).waitFor();

      await chair.goto(`${b.baseUrl}/committee/reviews/${reviewMonth}`);
      await chair.getByRole('button', { name: 'Sign off the review' }).click();
      await chair.getByText(/Signed off by Cyrus Chair/).waitFor();
      await screenshot(chair, 'committee-review-signed');

      await chair.goto(`${b.baseUrl}/committee/months`);
      await chair.getByRole('button', { name: new RegExp(label(reviewMonth)) }).click();
      await chair.getByRole('button', { name: 'Publish the review' }).click();
      await chair.getByRole('link', { name: 'Follow its progress' }).click();
      await chair.getByRole('heading', { name: `Review packet — ${label(reviewMonth)}` }).waitFor();
      expect(await runOne(b.t.context)).toBe(true);
      await chair.getByRole('link', { name: 'Download the workbook (.xlsx)' }).waitFor({ timeout: 20_000 });
      await expectAccessible(chair, 'packet');
      await screenshot(chair, 'committee-packet');

      await chair.goto(`${b.baseUrl}/committee/packet/${reviewMonth}/print`);
      await chair.getByRole('heading', { name: 'Therapy adherence (sessions delivered / prescribed, capped at 100%)' }).waitFor();
      await chair.getByText('Share the HBR protocol with Cliffend', { exact: false }).first().waitFor();
      await chair.emulateMedia({ media: 'print' });
      await screenshot(chair, 'committee-print');
      await expect(chair.getByRole('navigation', { name: 'Main' }).isVisible()).resolves.toBe(false);
    } finally {
      await chair.context().close();
    }
  });

  it('when pages load, then no request leaves the app origin', () => {
    expect(b.offOrigin).toEqual([]);
  });
});
