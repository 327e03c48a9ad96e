/**
 * The import flow in the browser: upload a file with mistakes, read the problems, fix the file,
 * upload it again, commit, and find the imported cases in the case list.
 */
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runOne } from '../../server/jobs/jobs.service.js';
import { startBrowserApp, signIn, expectAccessible, screenshot, type BrowserApp } from './browser.js';

let b: BrowserApp;
let runner: ReturnType<typeof setInterval>;
beforeAll(async () => {
  b = await startBrowserApp();
  // The in-process app has no background runner: run queued jobs as the server would.
  let busy = false;
  runner = setInterval(async () => {
    if (busy) return;
    busy = true;
    try { while (await runOne(b.t.context)) { /* next */ } } finally { busy = false; }
  }, 200);
});
afterAll(async () => { clearInterval(runner); await b?.close(); });

async function casesFile(ages: (number | string)[]): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet('Cases');
  // "Patient name" stands for what a hospital export carries: it is left out by the mapping.
  ws.addRow(['Patient name', 'Case key (this file only)', 'Surgery date', 'Age', 'Sex', 'Unit code']);
  ages.forEach((age, i) => ws.addRow([`Fictional Person ${i}`, `E${i}`, '2026-11-0' + (i + 2), age, i % 2 ? 'male' : 'female', 'SURG-A']));
  return Buffer.from(await wb.xlsx.writeBuffer());
}

async function uploadAndRun(page: import('playwright-core').Page, file: Buffer, name: string) {
  await page.goto(`${b.baseUrl}/imports`);
  await page.getByRole('heading', { level: 1, name: 'Import from a spreadsheet' }).waitFor();
  await page.setInputFiles('#imp-file', { name, mimeType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet', buffer: file });
  await page.getByRole('button', { name: 'Upload and map columns' }).click();
  await page.getByRole('heading', { name: '3. Map the columns' }).waitFor();
  // Automatic mapping: the known headers are matched; the name column is left out.
  expect(await page.getByLabel('Patient name').inputValue()).toBe('__drop__');
  expect(await page.getByLabel('Surgery date').inputValue()).toBe('surgeryDate');
  await page.getByRole('button', { name: 'Run the dry run' }).click();
  await page.getByRole('heading', { name: '4. Dry run result' }).waitFor({ timeout: 30_000 });
}

describe('import in the browser', () => {
  it('when an abstractor uploads a file with mistakes, reads the problems, fixes and commits it, then the cases are in the case list', async () => {
    const page = await b.newPage({ width: 1280 });
    await signIn(page, b.baseUrl, 'abstractor');
    await page.goto(`${b.baseUrl}/imports`);
    expect(await page.getByRole('link', { name: /Download the import template/ }).getAttribute('href')).toBe('/api/imports/template');
    await expectAccessible(page, 'new import');
    await screenshot(page, 'imports-new-1280');

    await uploadAndRun(page, await casesFile([61, 'sixty-two', 63]), 'theatre-list.xlsx');
    await page.getByRole('cell', { name: 'Age: "sixty-two" is not a number' }).waitFor();
    await page.getByRole('cell', { name: 'D3', exact: true }).waitFor();
    await expect.poll(async () => page.getByText(/row was rejected/).count()).toBe(1);
    await expectAccessible(page, 'dry run with problems');
    await screenshot(page, 'imports-problems-1280');

    await uploadAndRun(page, await casesFile([61, 62, 63]), 'theatre-list-fixed.xlsx');
    await page.getByText('No problems: every row passed.').waitFor();
    await page.getByRole('button', { name: /^Commit 3 rows/ }).click();
    await page.getByRole('heading', { name: 'What was imported' }).waitFor({ timeout: 30_000 });
    await page.getByText('3 records written, 0 skipped.').waitFor();
    await screenshot(page, 'imports-committed-1280');

    const id = page.url().split('/').pop()!;
    const numbers: { registry_number: string }[] = await b.t.ds.query(
      `SELECT c.registry_number FROM surgical_cases c WHERE c.id::text IN (SELECT entity_id FROM audit_entries WHERE action = 'case-created' AND details->>'importId' = $1) ORDER BY 1`, [id]);
    expect(numbers).toHaveLength(3);
    for (const { registry_number } of numbers) {
      await page.goto(`${b.baseUrl}/cases?q=${registry_number}`);
      await page.getByRole('link', { name: registry_number }).waitFor();
    }
    await page.goto(`${b.baseUrl}/imports/history`);
    await page.getByRole('link', { name: 'theatre-list-fixed.xlsx' }).waitFor();
    await expectAccessible(page, 'import history');
    await screenshot(page, 'imports-history-1280');
  });
});
