// The SQL views (case_derived, case_completeness, therapy_episode_derived) must give the same
// answers as the TypeScript rules (shared/registry/derived.ts, completeness.ts), whose rules are
// the pure functions of analysis/clinical. Checked row by row over every case in the database:
// the fictional demo cases plus edge cases made here.
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers.js';
import { caseCompleteness } from '../../../shared/registry/completeness.js';
import { deriveCase, episodeAdherence } from '../../../shared/registry/derived.js';
import { rowToFields } from '../../../server/cases/case.repo.js';
import { THERAPY_COLUMNS, fromDb } from '../../../server/registry/columns.js';
import { registryViewsSql } from '../../../server/registry/views.js';
import { completeCase, createCase, siteIds, todayIso } from './factories.js';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
  const site = await siteIds(t.ds);
  const ab = await t.as('abstractor');
  // Edge cases the demo data may not hold.
  await createCase(ab, { siteId: site.HBR, surgeryDate: completeCase(site.HBR).surgeryDate });
  await createCase(ab, { siteId: site.HBR, surgeryDate: completeCase(site.HBR).surgeryDate, eligible: false, exclusionReason: 'day case' });
  await createCase(ab, { siteId: site.HBR, surgeryDate: completeCase(site.HBR).surgeryDate, eligible: false });
  await createCase(ab, completeCase(site.HBR, { therapyGiven: true }));
  await createCase(ab, completeCase(site.HBR, { readmitted30d: true }));
  await createCase(ab, completeCase(site.HBR, { died30d: true, complicationsReviewed: false }));
  const withEpisode = await createCase(ab, completeCase(site.KSV, { therapyGiven: false }));
  const e1 = (await ab.post(`/api/cases/${withEpisode.id}/therapy`, { caseVersion: 1, modality: 'chest-physiotherapy' })).body;
  const e2 = (await ab.post(`/api/cases/${withEpisode.id}/therapy`, { caseVersion: 2, modality: 'early-mobilisation', startPostoperativeDay: 2, sessionsPrescribed: 0, sessionsDelivered: 0 })).body;
  await ab.agent.delete(`/api/cases/${withEpisode.id}/therapy/${e1.therapy[0].id}`).set('x-csrf-token', ab.csrf).send({ caseVersion: e2.version, reason: 'duplicate entry' });
  const withEvent = await createCase(ab, completeCase(site.KSV));
  await ab.post(`/api/cases/${withEvent.id}/outcomes`, { caseVersion: 1, type: 'ards', onsetPostoperativeDay: 2 });
  const sameDay = await createCase(ab, completeCase(site.KSV, { dischargeDate: completeCase(site.KSV).surgeryDate }));
  await ab.post(`/api/cases/${sameDay.id}/outcomes`, { caseVersion: 1, type: 'bronchospasm', onsetPostoperativeDay: 0, clavienDindo: 'II' });
}, 60_000);
afterAll(async () => { await t.close(); });

const sortArr = (a: string[]) => [...a].sort();

describe('views match the derived-measure rules', () => {
  it('when the views are generated from the rules today, then the migration holds the same SQL (no silent drift)', () => {
    const dir = path.resolve('server/db/migrations');
    const text = fs.readdirSync(dir).filter((f) => f.endsWith('.ts')).map((f) => fs.readFileSync(path.join(dir, f), 'utf8')).join('\n').replace(/\s+/g, ' ');
    for (const sql of registryViewsSql()) expect(text).toContain(sql.replace(/\s+/g, ' '));
  });

  it('when every case is computed both ways, then case_derived and case_completeness agree with derived.ts and completeness.ts', async () => {
    const today = todayIso(t.config.NETWORK_TIME_ZONE);
    const cases: Record<string, any>[] = await t.ds.query(`SELECT * FROM surgical_cases`);
    const episodes: Record<string, any>[] = await t.ds.query(`SELECT * FROM therapy_episodes WHERE removed_at IS NULL ORDER BY created_at, id`);
    const events: Record<string, any>[] = await t.ds.query(`SELECT * FROM outcome_events WHERE removed_at IS NULL ORDER BY created_at, id`);
    const derived = new Map<string, any>((await t.ds.query(`SELECT *, surgery_date::text AS sd, follow_up_window_end::text AS fwe FROM case_derived`)).map((r: any) => [r.case_id, r]));
    const completeness = new Map<string, any>((await t.ds.query(`SELECT * FROM case_completeness`)).map((r: any) => [r.case_id, r]));
    const group = <T extends { case_id: string }>(rows: T[]) => rows.reduce((m, r) => m.set(r.case_id, [...(m.get(r.case_id) ?? []), r]), new Map<string, T[]>());
    const eps = group(episodes as any);
    const evs = group(events as any);
    expect(cases.length).toBeGreaterThan(9000);
    let checked = 0;
    for (const c of cases) {
      const f = rowToFields(c);
      const ce = (eps.get(c.id) ?? []).map((e: any) => ({ id: e.id, ...Object.fromEntries(Object.entries(THERAPY_COLUMNS).map(([k, s]) => [k, fromDb(s.kind, e[s.column])])) }));
      const cv = (evs.get(c.id) ?? []).map((e: any) => ({ id: e.id, type: e.type, onsetPostoperativeDay: e.onset_postoperative_day, clavienDindo: e.clavien_dindo, pneumoniaNhsnMet: e.pneumonia_nhsn_met }));
      const ts = deriveCase({ status: c.status, admissionDate: f.admissionDate, surgeryDate: f.surgeryDate as string, dischargeDate: f.dischargeDate, heightCm: f.heightCm, weightKg: f.weightKg }, ce as any, cv as any, today);
      const sql = derived.get(c.id);
      const mine = {
        lengthOfStayDays: ts.lengthOfStayDays, postoperativeStayDays: ts.postoperativeStayDays, patientDays: ts.postoperativeStayDays, daysToFirstTherapy: ts.daysToFirstTherapy,
        anyPpc: ts.anyPpc, pneumoniaNhsn: ts.pneumoniaNhsn, reintubation: ts.reintubation, ards: ts.ards, countsInAnalysis: ts.countsInAnalysis,
        followUpWindowEnd: ts.followUpWindowEnd, surveillanceMonth: ts.surveillanceMonth,
      };
      const theirs = {
        lengthOfStayDays: sql.length_of_stay_days, postoperativeStayDays: sql.postoperative_stay_days, patientDays: sql.patient_days, daysToFirstTherapy: sql.days_to_first_therapy,
        anyPpc: sql.any_ppc, pneumoniaNhsn: sql.pneumonia_nhsn, reintubation: sql.reintubation, ards: sql.ards, countsInAnalysis: sql.counts_in_analysis,
        followUpWindowEnd: sql.fwe, surveillanceMonth: sql.surveillance_month,
      };
      expect(theirs, c.registry_number).toEqual(mine);
      const tc = caseCompleteness(f, ce, cv);
      const sc = completeness.get(c.id);
      expect(sortArr(sc.missing), c.registry_number).toEqual(sortArr(tc.missing.map((m) => m.field)));
      expect(sc.complete).toBe(tc.complete);
      expect({ patient: sc.missing_patient.length, operation: sc.missing_operation.length, therapy: sc.missing_therapy.length, outcomes: sc.missing_outcomes.length, 'follow-up': sc.missing_follow_up.length }).toEqual(tc.sections);
      checked++;
    }
    expect(checked).toBe(cases.length);
  });

  it('when adherence is computed both ways, then therapy_episode_derived agrees with episodeAdherence', async () => {
    const rows: any[] = await t.ds.query(`SELECT e.sessions_delivered, e.sessions_prescribed, d.adherence FROM therapy_episodes e JOIN therapy_episode_derived d ON d.episode_id = e.id`);
    expect(rows.length).toBeGreaterThan(1000);
    for (const r of rows) {
      const ts = episodeAdherence({ sessionsDelivered: r.sessions_delivered, sessionsPrescribed: r.sessions_prescribed });
      if (ts === null) expect(r.adherence).toBeNull();
      else expect(Number(r.adherence)).toBeCloseTo(ts, 12);
    }
  });

  it('when analysed_cases is read, then it holds exactly the complete, verified and locked cases', async () => {
    const [r] = await t.ds.query(`SELECT (SELECT count(*) FROM analysed_cases)::int AS a, (SELECT count(*) FROM surgical_cases WHERE status IN ('complete', 'verified', 'locked'))::int AS b`);
    expect(r.a).toBe(r.b);
  });
});
