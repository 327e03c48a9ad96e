import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startBrowserApp, signIn, expectAccessible, screenshot, type BrowserApp } from './browser.js';

let b: BrowserApp;
beforeAll(async () => { b = await startBrowserApp(); });
afterAll(async () => { await b?.close(); });

// Widths from DESIGN.md: "every page works at 1280 px and at tablet width".
const WIDTHS = [1280, 820] as const;

describe('registry screens at desktop and tablet width', () => {
  for (const width of WIDTHS) {
    it(`when an abstractor opens the registry pages at ${width} px, then each shows its title and passes the accessibility check`, async () => {
      const page = await b.newPage({ width });
      try {
        await signIn(page, b.baseUrl, 'abstractor');
        await page.goto(`${b.baseUrl}/cases`);
        await page.getByRole('link', { name: /^(HBR|KSV)-/ }).first().waitFor();
        await expectAccessible(page, `case list ${width}`);
        await screenshot(page, `registry-case-list-${width}`);

        await page.getByRole('link', { name: /^(HBR|KSV)-/ }).first().click();
        await page.getByRole('heading', { level: 1, name: /^Case / }).waitFor();
        await page.getByRole('heading', { name: 'Audit trail' }).waitFor();
        await expectAccessible(page, `case detail ${width}`);
        await screenshot(page, `registry-case-detail-${width}`);

        await page.goto(`${b.baseUrl}/cases/new`);
        await page.getByRole('heading', { level: 1, name: 'New case' }).waitFor();
        await page.getByRole('heading', { name: 'Computed as you type' }).waitFor();
        await expectAccessible(page, `new case ${width}`);
        await screenshot(page, `registry-case-new-${width}`);

        await page.goto(`${b.baseUrl}/worklist`);
        await page.getByRole('heading', { name: /Missing required data/ }).waitFor();
        await expectAccessible(page, `worklist ${width}`);
        await screenshot(page, `registry-worklist-${width}`);

        await page.goto(`${b.baseUrl}/dictionary`);
        await page.getByRole('cell', { name: 'preopHaemoglobin' }).waitFor();
        await expectAccessible(page, `dictionary ${width}`);
        await screenshot(page, `registry-dictionary-${width}`);
        expect(b.offOrigin).toEqual([]);
      } finally {
        await page.context().close();
      }
    });
  }
});
