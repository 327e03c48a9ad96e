import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startBrowserApp, signIn, type BrowserApp } from './browser.js';

// OWASP ASVS 4.0.3 V5.3.3 (output encoding against stored XSS) and V14.4.3 (CSP).
let b: BrowserApp;
beforeAll(async () => { b = await startBrowserApp(); });
afterAll(async () => { await b?.close(); });

describe('stored script', () => {
  it('when a stored name holds markup, then the browser shows it as text and runs nothing', async () => {
    const admin = await b.t.as('admin');
    const payload = '<img src=x onerror="window.__xss=1"><script>window.__xss=2</script>';
    const r = await admin.post('/api/users', { email: 'xss.person@tidewater.example', displayName: payload, roles: ['analyst'], siteIds: [] });
    expect(r.status).toBe(201);
    const page = await b.newPage();
    try {
      await signIn(page, b.baseUrl, 'admin');
      await page.goto(`${b.baseUrl}/admin/users`);
      await page.getByText(payload).first().waitFor();
      expect(await page.evaluate(() => (window as unknown as { __xss?: number }).__xss)).toBeUndefined();
      expect(await page.locator('table img[src="x"]').count()).toBe(0);
      const csp = (await page.goto(`${b.baseUrl}/admin/users`))!.headers()['content-security-policy'];
      expect(csp).toMatch(/script-src 'self'/);
    } finally {
      await page.context().close();
    }
  });
});
