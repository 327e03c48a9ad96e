import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startBrowserApp, signIn, expectAccessible, screenshot, type BrowserApp } from './browser.js';
import type { DemoKey } from '../server/helpers.js';

let b: BrowserApp;
beforeAll(async () => { b = await startBrowserApp(); });
afterAll(async () => { await b?.close(); });

// What each role's navigation must show (from DESIGN.md's role table) and must not show.
const EXPECT: Record<DemoKey, { nav: string[]; notNav: string[]; home: string }> = {
  admin: { nav: ['Users', 'Sites and units', 'Demo mailbox'], notNav: [], home: 'Administrator' },
  abstractor: { nav: ['Home'], notNav: ['Users', 'Sites and units'], home: 'Abstractor' },
  abstractor2: { nav: ['Home'], notNav: ['Users'], home: 'Abstractor' },
  analyst: { nav: ['Home'], notNav: ['Users', 'Demo mailbox'], home: 'Quality analyst' },
  chair: { nav: ['Home'], notNav: ['Users'], home: 'Committee member' },
  committee: { nav: ['Home'], notNav: ['Users'], home: 'Committee member' },
  researcher: { nav: ['Home'], notNav: ['Users', 'Sites and units'], home: 'Researcher' },
};

describe('each role in the browser', () => {
  for (const key of ['admin', 'abstractor', 'analyst', 'chair', 'researcher'] as DemoKey[]) {
    it(`when ${key} signs in, then their navigation and home page show, accessibly`, async () => {
      const page = await b.newPage();
      try {
        await page.goto(`${b.baseUrl}/sign-in`);
        await expectAccessible(page, 'sign-in');
        await signIn(page, b.baseUrl, key);
        const nav = page.getByRole('navigation', { name: 'Main' });
        for (const label of EXPECT[key].nav) await expect(nav.getByRole('link', { name: label, exact: true }).count()).resolves.toBe(1);
        for (const label of EXPECT[key].notNav) await expect(nav.getByRole('link', { name: label, exact: true }).count()).resolves.toBe(0);
        await expect(page.getByRole('heading', { name: EXPECT[key].home }).count()).resolves.toBeGreaterThan(0);
        await expectAccessible(page, `${key} home`);
        await screenshot(page, `home-${key}`);
        // Every page the role's navigation offers opens and passes the accessibility check.
        const links = await nav.getByRole('link').evaluateAll((as) => as.map((a) => (a as HTMLAnchorElement).getAttribute('href')!).filter((h) => h.startsWith('/')));
        for (const href of [...new Set(links)]) {
          await page.goto(`${b.baseUrl}${href}`);
          await page.getByRole('heading', { level: 1 }).first().waitFor();
          await expectAccessible(page, `${key} ${href}`);
        }
      } finally {
        await page.context().close();
      }
    });
  }

  it('when pages load, then no request leaves the app origin (fonts are bundled)', () => {
    expect(b.offOrigin).toEqual([]);
  });
});
