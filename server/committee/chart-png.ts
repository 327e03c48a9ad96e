/**
 * Turns the packet's SVG charts into PNG images with Debian's headless chromium, driven by
 * playwright-core (no browser download: the system's /usr/bin/chromium, or CHROMIUM_PATH).
 * One browser for the whole packet; each SVG is laid on a blank page and its element captured.
 */
import fs from 'node:fs';
import { chromium } from 'playwright-core';
import { AppError } from '../http/errors.js';

export function chromiumPath(): string {
  return process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
}

export async function svgsToPngs(svgs: readonly string[]): Promise<Buffer[]> {
  const executablePath = chromiumPath();
  if (!fs.existsSync(executablePath)) {
    throw new AppError(500, 'chart_renderer_missing', `the chart renderer (chromium) was not found at ${executablePath}`, { hint: 'install Debian\'s chromium (apt-get install -y chromium) or set CHROMIUM_PATH' });
  }
  const browser = await chromium.launch({
    executablePath, headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  try {
    const page = await browser.newPage({ viewport: { width: 1000, height: 500 }, deviceScaleFactor: 1 });
    // Nothing leaves the machine: the page is local markup only.
    await page.route('**/*', (route) => route.abort());
    const out: Buffer[] = [];
    for (const svg of svgs) {
      await page.setContent(`<!doctype html><html><body style="margin:0;background:#fff">${svg}</body></html>`);
      out.push(await page.locator('svg').first().screenshot({ type: 'png' }));
    }
    return out;
  } finally {
    await browser.close();
  }
}
