import fs from 'node:fs';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { createRequire } from 'node:module';
import { chromium, type Browser, type Page } from 'playwright-core';
import { expect } from 'vitest';
import { startTestApp, demoEmail, type DemoKey, type TestApp } from '../server/helpers.js';
import { DEMO_PASSWORD } from '../../server/db/seed/scenario.js';

const require = createRequire(import.meta.url);
const axeSource = fs.readFileSync(require.resolve('axe-core/axe.min.js'), 'utf8');

export interface BrowserApp {
  t: TestApp;
  baseUrl: string;
  browser: Browser;
  /** A page in a fresh browser context (its own cookies), so each role signs in on its own. */
  newPage(opts?: { width?: number; height?: number }): Promise<Page>;
  /** Requests the pages made to any origin other than the app's (fonts, CDNs...): must stay empty. */
  offOrigin: string[];
  close(): Promise<void>;
}

/** Serves the built client and the API from one in-process server and opens Debian's chromium. */
export async function startBrowserApp(overrides: Record<string, string> = {}): Promise<BrowserApp> {
  const dist = path.resolve('dist');
  if (!fs.existsSync(path.join(dist, 'index.html'))) throw new Error('dist/ is missing: run `npx vite build` (npm test does it before this stage)');
  const t = await startTestApp(overrides, { staticDir: dist });
  const server = t.app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  const offOrigin: string[] = [];
  return {
    t, baseUrl, browser, offOrigin,
    async newPage(opts = {}) {
      const context = await browser.newContext({ viewport: { width: opts.width ?? 1280, height: opts.height ?? 900 } });
      context.on('request', (req) => {
        const u = req.url();
        if (!u.startsWith(baseUrl) && !/^(data|blob|about):/.test(u)) offOrigin.push(u);
      });
      return context.newPage();
    },
    async close() {
      await browser.close();
      await new Promise((r) => server.close(r));
      await t.close();
    },
  };
}

export async function signIn(page: Page, baseUrl: string, key: DemoKey) {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(demoEmail(key));
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('navigation', { name: 'Main' }).waitFor();
}

/** Runs axe-core in the page and fails on serious or critical violations (WCAG 2.x rules). */
export async function expectAccessible(page: Page, where: string) {
  // Evaluated through the DevTools protocol: the app's CSP (no inline scripts) stays in force.
  await page.evaluate(axeSource);
  const violations = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run(o?: unknown): Promise<{ violations: { id: string; impact: string; help: string; nodes: { target: string[] }[] }[] }> } }).axe;
    const r = await axe.run();
    return r.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => `${v.id} (${v.impact}): ${v.help} at ${v.nodes.slice(0, 3).map((n) => n.target.join(' ')).join(', ')}`);
  });
  expect(violations, `accessibility problems on ${where}`).toEqual([]);
}

export async function screenshot(page: Page, name: string) {
  const dir = path.resolve('tests/e2e/screenshots');
  fs.mkdirSync(dir, { recursive: true });
  await page.screenshot({ path: path.join(dir, `${name}.png`), fullPage: true });
}
