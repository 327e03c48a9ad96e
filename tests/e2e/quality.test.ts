/**
 * Data quality in the browser: an admin draws a seeded sample, a second abstractor re-abstracts
 * it blind, and the agreement report shows kappa and limits of agreement equal to analysis/ on
 * the same data (cohenKappa, blandAltman); then a disagreement is adjudicated. The other quality
 * pages open, pass the accessibility check and are photographed.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { blandAltman, cohenKappa } from '../../analysis/index.js';
import { runOne } from '../../server/jobs/jobs.service.js';
import { startBrowserApp, signIn, expectAccessible, screenshot, type BrowserApp } from './browser.js';

let b: BrowserApp;
beforeAll(async () => { b = await startBrowserApp(); });
afterAll(async () => { await b?.close(); });

const SEED = 4242;
const LABELS = { asaClass: 'ASA physical status', smokingStatus: 'Smoking status', copd: 'COPD', urgency: 'Urgency', age: 'Age (years)', heightCm: 'Height (cm)', weightKg: 'Weight (kg)', durationMinutes: 'Duration of surgery (min)' } as const;
type F = keyof typeof LABELS;
const CODED: F[] = ['asaClass', 'smokingStatus', 'copd', 'urgency'];
const NUMERIC: F[] = ['age', 'heightCm', 'weightKg', 'durationMinutes'];

/** What the second abstractor "reads in the chart": the first values with deliberate differences. */
function chart(o: Record<string, unknown>, i: number): Record<string, unknown> {
  const v = { ...o };
  if (i === 0) v.copd = !o.copd;
  if (i === 1) v.age = (o.age as number) + 1;
  if (i === 2) v.heightCm = (o.heightCm as number) - 2;
  if (i === 3) v.asaClass = o.asaClass === 'II' ? 'III' : 'II';
  if (i === 4) v.durationMinutes = (o.durationMinutes as number) + 15;
  return v;
}

describe('re-abstraction in the browser', () => {
  let sampleId = '';
  const entered: { o: Record<string, unknown>; r: Record<string, unknown> }[] = [];

  it('when an admin draws a sample, then the seed is shown', async () => {
    const page = await b.newPage();
    try {
      await signIn(page, b.baseUrl, 'admin');
      await page.goto(`${b.baseUrl}/quality/reabstraction`);
      await page.getByRole('heading', { name: 'Re-abstraction', level: 1 }).waitFor();
      await page.getByLabel('HBR').check();
      await page.getByLabel('Number of cases').fill('5');
      const who = await page.locator('#rs-who option', { hasText: 'abstractor2@tidewater.example' }).getAttribute('value');
      await page.getByLabel('Second abstractor').selectOption(who!);
      await page.getByLabel('Seed (optional)').fill(String(SEED));
      await page.getByRole('button', { name: 'Draw the sample' }).click();
      await expect(page.getByTestId('drawn-seed').textContent()).resolves.toBe(String(SEED));
      await expectAccessible(page, 're-abstraction draw');
      await screenshot(page, 'quality-reabstraction-draw');
      [{ id: sampleId }] = await b.t.ds.query(`SELECT id FROM reabstraction_samples WHERE seed = $1 ORDER BY created_at DESC LIMIT 1`, [SEED]);
    } finally {
      await page.context().close();
    }
  });

  it('when the second abstractor re-abstracts every case, then the form never shows the first values', async () => {
    const page = await b.newPage();
    try {
      await signIn(page, b.baseUrl, 'abstractor2');
      await page.goto(`${b.baseUrl}/quality/reabstraction`);
      await page.getByRole('link', { name: 'Re-abstract', exact: true }).first().click();
      await page.getByRole('heading', { name: 'Blind re-abstraction' }).waitFor();
      await expectAccessible(page, 'blind entry');
      const items = await b.t.ds.query(`SELECT i.original_values, c.registry_number FROM reabstraction_items i JOIN surgical_cases c ON c.id = i.case_id WHERE i.sample_id = $1 ORDER BY i.ordinal`, [sampleId]);
      for (const [i, it] of items.entries()) {
        await expect(page.getByTestId('blind-case').textContent()).resolves.toBe(it.registry_number);
        for (const f of NUMERIC) await expect(page.getByLabel(LABELS[f], { exact: true }).inputValue()).resolves.toBe('');
        if (i === 0) await screenshot(page, 'quality-blind-entry');
        const v = chart(it.original_values, i);
        for (const f of CODED) await page.getByLabel(LABELS[f], { exact: true }).selectOption(String(v[f]));
        for (const f of NUMERIC) await page.getByLabel(LABELS[f], { exact: true }).fill(String(v[f]));
        await page.getByRole('button', { name: 'Save and go to the next case' }).click();
        entered.push({ o: it.original_values, r: v });
        if (i < items.length - 1) await expect.poll(() => page.getByTestId('blind-case').textContent()).toBe(items[i + 1].registry_number);
      }
      await page.getByText('All cases are re-abstracted').waitFor();
    } finally {
      await page.context().close();
    }
  });

  it('when the admin opens the report, then kappa and limits of agreement match analysis/ and a disagreement can be adjudicated', async () => {
    const page = await b.newPage({ width: 1280, height: 1000 });
    try {
      await signIn(page, b.baseUrl, 'admin');
      await page.goto(`${b.baseUrl}/quality/reabstraction/${sampleId}/report`);
      await page.getByRole('heading', { name: 'Agreement report' }).waitFor();
      await expect(page.getByTestId('report-seed').textContent()).resolves.toBe(String(SEED));
      const k = cohenKappa(entered.map((p) => [String(p.o.copd), String(p.r.copd)] as [string, string]));
      await expect(page.getByTestId('kappa-copd').textContent()).resolves.toBe(k.kappa === null ? '—' : k.kappa.toFixed(3));
      const ba = blandAltman(entered.map((p) => p.o.age as number), entered.map((p) => p.r.age as number));
      await expect(page.getByTestId('loa-age').textContent()).resolves.toBe(`${ba.lower!.toFixed(2)} to ${ba.upper!.toFixed(2)} years`);
      const baH = blandAltman(entered.map((p) => p.o.heightCm as number), entered.map((p) => p.r.heightCm as number));
      await expect(page.getByTestId('loa-heightCm').textContent()).resolves.toBe(`${baH.lower!.toFixed(2)} to ${baH.upper!.toFixed(2)} cm`);
      await expectAccessible(page, 'agreement report');
      await screenshot(page, 'quality-agreement-report');

      const row = page.getByRole('row').filter({ hasText: 'Age' }).filter({ has: page.getByRole('combobox') }).first();
      await row.getByRole('combobox').selectOption('reabstracted');
      await row.getByRole('textbox').fill('age on the day of surgery in the admission note');
      await row.getByRole('button', { name: 'Adjudicate' }).click();
      await page.getByText('second abstraction taken · case changed (audited)').waitFor();
      await screenshot(page, 'quality-agreement-adjudicated');
    } finally {
      await page.context().close();
    }
  });
});

describe('the other data-quality pages', () => {
  it('when an analyst opens completeness, capture and findings, then they show figures, accessibly', async () => {
    const page = await b.newPage();
    try {
      await signIn(page, b.baseUrl, 'analyst');
      await page.goto(`${b.baseUrl}/quality`);
      await page.getByTestId('dq-share').waitFor();
      await page.getByRole('heading', { name: 'Complete cases over the months' }).waitFor();
      await expectAccessible(page, 'completeness');
      await screenshot(page, 'quality-completeness');
      await page.goto(`${b.baseUrl}/quality/capture`);
      await page.getByRole('heading', { name: 'Capture by month' }).waitFor();
      await expectAccessible(page, 'capture');
      await screenshot(page, 'quality-capture');
      await page.goto(`${b.baseUrl}/quality/findings`);
      await page.getByRole('button', { name: 'Run the check' }).click();
      // No background runner in tests: run the queued job here while the page polls it.
      await expect.poll(async () => (await b.t.ds.query(`SELECT count(*)::int AS n FROM jobs WHERE kind = 'quality-consistency-check'`))[0].n).toBe(1);
      while (await runOne(b.t.context)) { /* run it */ }
      await page.getByText(/Check succeeded/).waitFor({ timeout: 60_000 });
      await page.getByRole('table', { name: 'Consistency findings' }).waitFor();
      await expectAccessible(page, 'findings');
      await screenshot(page, 'quality-findings');
    } finally {
      await page.context().close();
    }
  });

  it('when an abstractor opens completeness at tablet width, then it fits', async () => {
    const page = await b.newPage({ width: 820, height: 1100 });
    try {
      await signIn(page, b.baseUrl, 'abstractor');
      await page.goto(`${b.baseUrl}/quality`);
      await page.getByTestId('dq-share').waitFor();
      await screenshot(page, 'quality-completeness-tablet');
    } finally {
      await page.context().close();
    }
  });
});
