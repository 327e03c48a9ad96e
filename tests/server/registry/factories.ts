/**
 * Factories for the registry API tests: each test makes its own cases through the API.
 * Dates are relative to today in the network time zone, so the "not in the future" rule
 * never trips whatever day the suite runs.
 */
import type { DataSource } from 'typeorm';
import type { Client } from '../helpers.js';

export const DAY = 86_400_000;
export function todayIso(timeZone = 'Europe/Lisbon'): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
}
export const daysAgo = (n: number, from = todayIso()) => new Date(Date.parse(`${from}T00:00:00Z`) - n * DAY).toISOString().slice(0, 10);

export async function siteIds(ds: DataSource): Promise<Record<string, string>> {
  const rows: { id: string; code: string }[] = await ds.query(`SELECT id, code FROM sites`);
  return Object.fromEntries(rows.map((r) => [r.code, r.id]));
}

/**
 * A case that passes every completeness rule. Its ARISCAT inputs are the worked example used
 * below: age 65 (3 points), SpO2 94% (8), no recent infection (0), Hb 13 g/dL (0), upper
 * abdominal incision (15), 150 min (16), elective (0) = 42, intermediate (Canet J et al.,
 * Anesthesiology 2010;113:1338-50, point table as in TRADE.md).
 */
export function completeCase(siteId: string, overrides: Record<string, unknown> = {}): Record<string, unknown> {
  const surgery = daysAgo(60);
  return {
    siteId,
    surgeryDate: surgery,
    admissionDate: daysAgo(61),
    eligible: true,
    age: 65,
    sex: 'male',
    heightCm: 175,
    weightKg: 80,
    asaClass: 'II',
    asaEmergency: false,
    smokingStatus: 'former',
    copd: false,
    obstructiveSleepApnoea: false,
    heartFailure: false,
    preopSpO2: 94,
    preopHaemoglobin: { value: 13, unit: 'g/dL' },
    respiratoryInfectionLastMonth: false,
    functionalStatus: 'independent',
    procedureCategory: 'upper-gastrointestinal',
    incisionSite: 'upper-abdominal',
    approach: 'open',
    urgency: 'elective',
    anaesthesia: 'general',
    durationMinutes: 150,
    therapyGiven: false,
    complicationsReviewed: true,
    dischargeDate: daysAgo(53),
    icuDays: 0,
    ventilatorDays: 0,
    readmitted30d: false,
    died30d: false,
    followUpCompletedOn: daysAgo(25),
    ...overrides,
  };
}

/** Creates a case through the API and returns the body (throws with the answer if not 201). */
export async function createCase(c: Client, body: Record<string, unknown>): Promise<any> {
  const r = await c.post('/api/cases', body);
  if (r.status !== 201) throw new Error(`case create failed: ${r.status} ${JSON.stringify(r.body)}`);
  return r.body;
}

export async function setStatus(c: Client, kase: { id: string; version: number }, to: string, reason?: string) {
  return c.post(`/api/cases/${kase.id}/status`, { to, version: kase.version, ...(reason ? { reason } : {}) });
}

export async function counts(ds: DataSource): Promise<{ cases: number; episodes: number; events: number; audit: number }> {
  const [r] = await ds.query(`SELECT (SELECT count(*) FROM surgical_cases)::int AS cases, (SELECT count(*) FROM therapy_episodes)::int AS episodes,
    (SELECT count(*) FROM outcome_events)::int AS events, (SELECT count(*) FROM audit_entries)::int AS audit`);
  return r;
}
