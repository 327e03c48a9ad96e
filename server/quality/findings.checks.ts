/**
 * The definition-consistency checks (kinds and rules in shared/quality/findings.ts). Duplicates
 * and LOS outliers are SQL aggregates; PNU1 and therapy ranges re-run the pure rules of
 * analysis/clinical over the stored records, in batches (keyset on id) to bound memory.
 */
import type { DataSource } from 'typeorm';
import { checkTherapyEpisode, pneumoniaNhsnPnu1 } from '../../analysis/index.js';
import type { Observation } from '../../shared/clinical/observations.js';
import { LOS_RULE, type FindingKind } from '../../shared/quality/findings.js';
import { THERAPY_COLUMNS, fromDb } from '../registry/columns.js';
import { therapyCheckSettings } from '../registry/settings.js';

export interface FoundItem { kind: FindingKind; caseId: string; siteId: string; key: string; message: string; details: Record<string, unknown> }
type Sink = (f: FoundItem) => void;
const BATCH = 2000;

export async function duplicateSuspects(ds: DataSource, siteIds: string[], sink: Sink): Promise<void> {
  const rows = await ds.query(
    `SELECT site_id, surgery_date::text AS d, array_agg(id ORDER BY registry_number) AS ids, array_agg(registry_number ORDER BY registry_number) AS numbers
       FROM surgical_cases WHERE identifier_hash IS NOT NULL AND status <> 'withdrawn' AND site_id = ANY($1)
      GROUP BY site_id, identifier_hash, surgery_date HAVING count(*) > 1`,
    [siteIds],
  );
  for (const r of rows) {
    (r.ids as string[]).forEach((id, i) => {
      const others = (r.numbers as string[]).filter((_, j) => j !== i);
      sink({ kind: 'duplicate-suspect', caseId: id, siteId: r.site_id, key: `${r.d}`, message: `same patient (keyed hash) and surgery date ${r.d} as ${others.join(', ')}`, details: { surgeryDate: r.d, others } });
    });
  }
}

export async function losOutliers(ds: DataSource, siteIds: string[], sink: Sink): Promise<void> {
  const rows = await ds.query(
    `WITH s AS (
       SELECT d.case_id, d.site_id, c.procedure_category AS cat, d.postoperative_stay_days AS los
         FROM analysed_cases d JOIN surgical_cases c ON c.id = d.case_id
        WHERE d.site_id = ANY($1) AND d.postoperative_stay_days IS NOT NULL AND c.procedure_category IS NOT NULL
     ), q AS (
       SELECT cat, count(*)::int AS n, percentile_cont(0.25) WITHIN GROUP (ORDER BY los) AS q1, percentile_cont(0.75) WITHIN GROUP (ORDER BY los) AS q3
         FROM s GROUP BY cat HAVING count(*) >= $2
     )
     SELECT s.case_id, s.site_id, s.cat, s.los, q.n, q.q1::float8 AS q1, q.q3::float8 AS q3, (q.q3 + $3 * (q.q3 - q.q1))::float8 AS fence
       FROM s JOIN q ON q.cat = s.cat WHERE s.los > q.q3 + $3 * (q.q3 - q.q1)`,
    [siteIds, LOS_RULE.minCases, LOS_RULE.multiplier],
  );
  for (const r of rows) {
    sink({
      kind: 'los-outlier', caseId: r.case_id, siteId: r.site_id, key: String(r.los),
      message: `post-operative stay ${r.los} days is above ${r.fence} days (Q3 ${r.q3} + 3 × IQR ${r.q3 - r.q1}) for ${r.cat} (${r.n} cases)`,
      details: { los: r.los, q1: r.q1, q3: r.q3, fence: r.fence, category: r.cat, n: r.n },
    });
  }
}

export async function pneumoniaConsistency(ds: DataSource, siteIds: string[], sink: Sink, progress: (n: number) => Promise<void>): Promise<{ evaluated: number; notEvaluable: number }> {
  let last = '00000000-0000-0000-0000-000000000000';
  let evaluated = 0;
  let notEvaluable = 0;
  for (;;) {
    const rows = await ds.query(
      `SELECT o.id, o.case_id, c.site_id, o.type, o.observations, o.pneumonia_nhsn_met, c.admission_date::text AS adm, c.surgery_date::text AS surg, c.age, c.copd, c.heart_failure,
              EXISTS (SELECT 1 FROM outcome_events x WHERE x.case_id = o.case_id AND x.removed_at IS NULL AND x.type = 'respiratory-infection') AS has_infection
         FROM outcome_events o JOIN surgical_cases c ON c.id = o.case_id
        WHERE o.removed_at IS NULL AND c.status <> 'withdrawn' AND c.site_id = ANY($1) AND o.id > $2
          AND (o.type = 'respiratory-infection' OR jsonb_path_exists(o.observations, '$[*] ? (@.kind == "chest-imaging")'))
        ORDER BY o.id LIMIT ${BATCH}`,
      [siteIds, last],
    );
    if (!rows.length) break;
    for (const r of rows) {
      last = r.id;
      if (!r.adm || r.age == null) { notEvaluable++; continue; }
      let met: boolean;
      try {
        met = pneumoniaNhsnPnu1({
          observations: (r.observations ?? []) as Observation[], admissionDate: r.adm, surgeryDate: r.surg, ageYears: r.age,
          underlyingCardiacOrPulmonaryDisease: r.copd === true || r.heart_failure === true,
        }).met;
      } catch {
        notEvaluable++;
        continue;
      }
      evaluated++;
      const base = { caseId: r.case_id, siteId: r.site_id, key: r.id, details: { eventId: r.id, eventType: r.type, pnu1Met: met, stored: r.pneumonia_nhsn_met } };
      if (r.type === 'respiratory-infection') {
        if (!met) sink({ ...base, kind: 'pneumonia-not-met', message: 'a respiratory infection is recorded but its observations do not meet CDC/NHSN PNU1 (2022)' });
        if (met !== r.pneumonia_nhsn_met) sink({ ...base, kind: 'pneumonia-flag-stale', message: `the stored PNU1 result (${r.pneumonia_nhsn_met ? 'met' : 'not met'}) differs from evaluating the observations now (${met ? 'met' : 'not met'})` });
      } else if (met && !r.has_infection) {
        sink({ ...base, kind: 'pneumonia-unrecorded', message: `the observations of a ${r.type} event meet CDC/NHSN PNU1 (2022) but no respiratory infection is recorded` });
      }
    }
    await progress(evaluated + notEvaluable);
  }
  return { evaluated, notEvaluable };
}

export async function therapyRanges(ds: DataSource, siteIds: string[], sink: Sink, progress: (n: number) => Promise<void>): Promise<number> {
  const settings = await therapyCheckSettings(ds);
  let last = '00000000-0000-0000-0000-000000000000';
  let n = 0;
  for (;;) {
    const rows = await ds.query(
      `SELECT e.*, c.site_id AS case_site_id FROM therapy_episodes e JOIN surgical_cases c ON c.id = e.case_id
        WHERE e.removed_at IS NULL AND c.status <> 'withdrawn' AND c.site_id = ANY($1) AND e.id > $2 ORDER BY e.id LIMIT ${BATCH}`,
      [siteIds, last],
    );
    if (!rows.length) break;
    for (const r of rows) {
      last = r.id;
      n++;
      const fields: Record<string, unknown> = {};
      for (const [name, spec] of Object.entries(THERAPY_COLUMNS)) fields[name] = fromDb(spec.kind, r[spec.column]);
      let result;
      try {
        result = checkTherapyEpisode(fields as never, settings);
      } catch {
        continue;
      }
      for (const e of result.errors) sink({ kind: 'therapy-range', caseId: r.case_id, siteId: r.case_site_id, key: `${r.id}:${e.path}`, message: `${e.message} (not a possible value)`, details: { episodeId: r.id, modality: r.modality, path: e.path, severity: 'impossible', hint: e.hint } });
      for (const w of result.warnings) sink({ kind: 'therapy-range', caseId: r.case_id, siteId: r.case_site_id, key: `${r.id}:${w.path}`, message: w.message, details: { episodeId: r.id, modality: r.modality, path: w.path, severity: 'unusual', caution: w.caution } });
    }
    await progress(n);
  }
  return n;
}
