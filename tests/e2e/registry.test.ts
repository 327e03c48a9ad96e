/**
 * The abstraction workflow in the browser: an abstractor enters a complete case through the
 * form (no import), sees the ARISCAT score and the pneumonia definitions evaluated as they
 * type, saves it and marks it complete; a second abstractor verifies it; the audit trail shows
 * who changed what. Every page passes the accessibility check.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Locator, Page } from 'playwright-core';
import { startBrowserApp, signIn, expectAccessible, screenshot, type BrowserApp } from './browser.js';

let b: BrowserApp;
beforeAll(async () => { b = await startBrowserApp(); });
afterAll(async () => { await b?.close(); });

const yesNo = (scope: Page | Locator, legend: string, answer: 'Yes' | 'No') => scope.getByRole('group', { name: legend, exact: true }).getByLabel(answer, { exact: true }).check();
const text = (scope: Page | Locator, label: string | RegExp, value: string) => scope.getByLabel(label, { exact: typeof label === 'string' }).first().fill(value);
const choose = (scope: Page | Locator, label: string | RegExp, value: string) => scope.getByLabel(label, { exact: typeof label === 'string' }).first().selectOption(value);

let caseUrl = '';

describe('a case entered, scored, saved and verified in the browser', () => {
  it('when an abstractor fills in a complete case, then the ARISCAT score and PNU1 are evaluated live and the case saves', async () => {
    const page = await b.newPage({ width: 1280 });
    try {
      await signIn(page, b.baseUrl, 'abstractor');
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'New case', exact: true }).click();
      await page.getByRole('heading', { level: 1, name: 'New case' }).waitFor();
      await expectAccessible(page, 'new case form');

      const patient = page.locator('#sec-patient');
      await yesNo(patient, 'Eligible for surveillance', 'Yes');
      await text(patient, 'Admission date', '2026-10-05');
      await text(patient, 'Age (years)', '65');
      await choose(patient, 'Sex', 'male');
      await text(patient, 'Height (cm)', '175');
      await text(patient, 'Weight (kg)', '82');
      await choose(patient, 'ASA physical status', 'II');
      await yesNo(patient, 'ASA E modifier', 'No');
      await choose(patient, 'Smoking status', 'former');
      await choose(patient, 'Functional status', 'independent');
      await yesNo(patient, 'COPD', 'No');
      await yesNo(patient, 'Obstructive sleep apnoea', 'No');
      await yesNo(patient, 'Heart failure', 'No');
      await text(patient, 'Pre-operative SpO2 on room air (%)', '94');
      await text(patient, 'Pre-operative haemoglobin', '13');
      await yesNo(patient, 'Respiratory infection in the last month', 'No');

      const op = page.locator('#sec-operation');
      const hbr = await op.getByLabel('Site', { exact: true }).locator('option', { hasText: 'HBR' }).getAttribute('value');
      await op.getByLabel('Site', { exact: true }).selectOption(hbr!);
      await text(op, 'Surgery date', '2026-10-06');
      await choose(op, 'Procedure category', 'upper-gastrointestinal');
      await choose(op, 'Incision site', 'upper-abdominal');
      await choose(op, 'Approach', 'open');
      await choose(op, 'Urgency', 'elective');
      await choose(op, 'Anaesthesia', 'general');
      await text(op, 'Duration of surgery (min)', '150');

      // ARISCAT (Canet J et al., Anesthesiology 2010;113:1338-50, Table 4 points): age 51-80 = 3,
      // SpO2 91-95% = 8, upper abdominal incision = 15, duration 2-3 h = 16 -> 42, intermediate (26-44).
      const computed = page.getByRole('complementary', { name: 'Computed as you type' });
      await expect(computed.getByText('42', { exact: true }).count()).resolves.toBe(1);
      await expect(computed.getByText(/Intermediate/).count()).resolves.toBe(1);
      // BMI = 82 / 1.75^2 = 26.8 kg/m2 (WHO definition, weight / height squared).
      await expect(computed.getByText('26.8 kg/m²').count()).resolves.toBe(1);

      const therapy = page.locator('#sec-therapy');
      await yesNo(therapy, 'Lung-expansion therapy given', 'Yes');
      await therapy.getByRole('button', { name: 'Add a therapy episode' }).click();
      await choose(therapy, 'Modality', 'incentive-spirometry');
      await text(therapy, /^Post-operative day started/, '1');
      await text(therapy, /^Sessions prescribed/, '30');
      await text(therapy, /^Sessions delivered/, '24');
      await text(therapy, /^Inspiratory capacity/, '600');
      // Adherence 24/30 = 80% (delivered / prescribed, common practice, no source).
      await expect(therapy.getByText('80%').count()).resolves.toBeGreaterThan(0);
      // PBW (ARDS Network, NEJM 2000;342:1301-8): 50 + 0.91 x (175 - 152.4) = 70.6 kg; 600 mL is 8.5 mL/kg,
      // under 10 mL/kg, so the indication check flags it (threshold: common practice, no source).
      await therapy.getByText(/8\.5 mL\/kg PBW is below 10 mL\/kg/).waitFor();
      await expect(therapy.getByText(/clinician's judgement decide/).count()).resolves.toBeGreaterThan(0);

      const outcomes = page.locator('#sec-outcomes');
      await yesNo(outcomes, 'Pulmonary complications reviewed', 'Yes');
      await outcomes.getByRole('button', { name: 'Add a complication' }).click();
      await choose(outcomes, 'Complication', 'respiratory-infection');
      await text(outcomes, /^Onset/, '3');
      await choose(outcomes, 'Severity (Clavien–Dindo)', 'II');
      const addObs = async (kind: string) => {
        await outcomes.getByLabel('Kind of observation').selectOption(kind);
        await outcomes.getByRole('button', { name: 'Add observation' }).click();
        return outcomes.getByRole('list', { name: 'Observations of event 1' }).getByRole('listitem').last();
      };
      // A new infiltrate on a definitive radiograph, fever above 38.0 °C, new purulent sputum and new
      // cough: CDC/NHSN PNU1 (2022 manual, ch. 6) imaging + 1 sign + 2 symptoms in a patient
      // without underlying cardiac or pulmonary disease.
      let o = await addObs('chest-imaging');
      await text(o, 'Date', '2026-10-09');
      await choose(o, 'Imaging', 'radiograph');
      await o.getByLabel('Definitive report (not "possible")').check();
      o = await addObs('temperature-max');
      await text(o, 'Date', '2026-10-09');
      await text(o, 'Value', '38.6');
      o = await addObs('sputum');
      await text(o, 'Date', '2026-10-09');
      await o.getByLabel('New purulent sputum').check();
      o = await addObs('respiratory-sign');
      await text(o, 'Date', '2026-10-09');
      await choose(o, 'Sign', 'cough');
      await choose(o, 'New or worse', 'new');
      const defs = outcomes.getByRole('region', { name: 'Definitions evaluated as you type' });
      await defs.getByText(/CDC\/NHSN PNU1.*✓ Met/).waitFor();
      await expect(defs.getByText(/Melbourne Group Scale/).count()).resolves.toBeGreaterThan(0);

      const follow = page.locator('#sec-follow-up');
      await text(follow, 'Discharge date', '2026-10-14');
      await text(follow, 'ICU days', '0');
      await text(follow, 'Ventilator days', '0');
      await yesNo(follow, 'Readmitted within 30 days', 'No');
      await yesNo(follow, 'Died within 30 days', 'No');
      await text(follow, '30-day follow-up done on', '2026-11-06');
      // Length of stay 2026-10-05 to 2026-10-14 = 9 days (discharge minus admission, common practice).
      await expect(computed.getByText('9 days').count()).resolves.toBe(1);
      await expect(computed.getByText('All required data entered').count()).resolves.toBe(1);
      await expectAccessible(page, 'filled case form');
      await screenshot(page, 'registry-form-filled-1280');

      await page.getByRole('button', { name: 'Save case' }).first().click();
      await page.getByRole('heading', { level: 1, name: /^Case HBR-/ }).waitFor();
      caseUrl = page.url();
      await page.getByText('42 points').first().waitFor();
      await expectAccessible(page, 'saved case');
      await page.getByRole('button', { name: 'Mark complete' }).click();
      await page.locator('header').getByText('Complete').waitFor();
      // The creator cannot verify: the button is disabled and says why.
      const verify = page.getByRole('button', { name: 'Verify' });
      await expect(verify.isDisabled()).resolves.toBe(true);
      await expect(page.getByText(/Verify is not available/).count()).resolves.toBe(1);
      await screenshot(page, 'registry-case-saved-1280');
    } catch (err) {
      await screenshot(page, 'registry-failure');
      throw err;
    } finally {
      await page.context().close();
    }
  });

  it('when a second abstractor opens the complete case, then they verify it and the audit trail shows each change', async () => {
    expect(caseUrl).toMatch(/\/cases\//);
    const page = await b.newPage({ width: 820 });
    try {
      await signIn(page, b.baseUrl, 'abstractor2');
      await page.goto(caseUrl);
      await page.getByRole('heading', { level: 1, name: /^Case HBR-/ }).waitFor();
      await page.getByRole('button', { name: 'Verify' }).click();
      await page.locator('header').getByText('Verified').waitFor();
      const audit = page.getByRole('table', { name: /Every change to this case/ });
      await audit.getByRole('cell', { name: 'abstractor2@tidewater.example' }).first().waitFor();
      // Who, when, field, old and new value: the creation per field, the score, and both status moves.
      const rows = audit.getByRole('row');
      await expect(rows.filter({ hasText: 'case created' }).filter({ hasText: 'Age' }).filter({ hasText: '65' }).count()).resolves.toBe(1);
      await expect(rows.filter({ hasText: 'ARISCAT' }).filter({ hasText: '42 (intermediate)' }).count()).resolves.toBe(1);
      await expect(rows.filter({ hasText: 'therapy added' }).count()).resolves.toBeGreaterThan(0);
      await expect(rows.filter({ hasText: 'outcome added' }).count()).resolves.toBeGreaterThan(0);
      await expect(rows.filter({ hasText: 'abstractor@tidewater.example' }).filter({ hasText: 'status changed' }).filter({ hasText: 'complete' }).count()).resolves.toBe(1);
      await expect(rows.filter({ hasText: 'abstractor2@tidewater.example' }).filter({ hasText: 'status changed' }).filter({ hasText: 'verified' }).count()).resolves.toBe(1);
      await expectAccessible(page, 'verified case at tablet width');
      await screenshot(page, 'registry-case-verified-820');
    } catch (err) {
      await screenshot(page, 'registry-failure-2');
      console.log(await page.getByRole('table', { name: /Every change to this case/ }).innerText().catch(() => 'no audit table'));
      throw err;
    } finally {
      await page.context().close();
    }
  });

  it('when two abstractors change the same case, then the second save shows both versions and keeps the choice made', async () => {
    expect(caseUrl).toMatch(/\/cases\//);
    const id = caseUrl.split('/cases/')[1];
    const page = await b.newPage({ width: 1280 });
    try {
      await signIn(page, b.baseUrl, 'abstractor');
      await page.goto(`${b.baseUrl}/cases/${id}/edit`);
      await page.getByRole('heading', { level: 1, name: /^Edit case HBR-/ }).waitFor();
      await text(page.locator('#sec-patient'), 'Weight (kg)', '84');
      // Leaving with unsaved changes asks first.
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Cases', exact: true }).click();
      const dialog = page.getByRole('alertdialog', { name: 'Leave without saving?' });
      await dialog.waitFor();
      await expectAccessible(page, 'unsaved-change dialog');
      await dialog.getByRole('button', { name: 'Stay and keep editing' }).click();
      await expect(page.getByLabel('Weight (kg)').inputValue()).resolves.toBe('84');

      // Meanwhile the second abstractor saves other values through the API.
      const other = await b.t.as('abstractor2');
      const current = (await other.get(`/api/cases/${id}`)).body as { version: number };
      const r = await other.patch(`/api/cases/${id}`, { version: current.version, weightKg: 80, icuDays: 1 });
      expect(r.status).toBe(200);

      await page.getByRole('button', { name: 'Save changes' }).first().click();
      const panel = page.getByRole('alertdialog', { name: 'Someone else saved this case while you were editing' });
      await panel.waitFor();
      const row = panel.getByRole('row').filter({ hasText: 'Weight (kg)' });
      await expect(row.getByRole('cell').nth(0).innerText()).resolves.toBe('84');
      await expect(row.getByRole('cell').nth(1).innerText()).resolves.toBe('80');
      await expectAccessible(page, 'conflict panel');
      await screenshot(page, 'registry-conflict-1280');
      await panel.getByRole('button', { name: 'Apply my choices to the saved version' }).click();
      await page.getByRole('button', { name: 'Save changes' }).first().click();
      await page.getByRole('heading', { level: 1, name: /^Case HBR-/ }).waitFor();
      // Mine kept for the field both changed; theirs taken for the field only they changed.
      const panel2 = (title: string) => page.locator('section').filter({ has: page.getByRole('heading', { name: title, exact: true }) });
      await expect(panel2('Patient').getByText('84 kg').count()).resolves.toBe(1);
      await expect(panel2('Follow-up').getByText('1 days').count()).resolves.toBe(1);
    } finally {
      await page.context().close();
    }
  });

  it('when a researcher signs in, then the Registry group offers the data dictionary only, with its downloads', async () => {
    const page = await b.newPage();
    try {
      await signIn(page, b.baseUrl, 'researcher');
      const nav = page.getByRole('navigation', { name: 'Main' });
      await expect(nav.getByRole('link', { name: 'Data dictionary' }).count()).resolves.toBe(1);
      for (const hidden of ['Cases', 'New case', 'Worklist']) await expect(nav.getByRole('link', { name: hidden, exact: true }).count()).resolves.toBe(0);
      await nav.getByRole('link', { name: 'Data dictionary' }).click();
      await page.getByRole('cell', { name: 'ariscatPoints' }).waitFor();
      await expect(page.getByRole('link', { name: 'Download .csv' }).getAttribute('href')).resolves.toBe('/api/dictionary?format=csv');
      await expect(page.getByRole('link', { name: 'Download .xlsx' }).getAttribute('href')).resolves.toBe('/api/dictionary?format=xlsx');
      await expectAccessible(page, 'dictionary for a researcher');
    } finally {
      await page.context().close();
    }
  });
});
