/**
 * Test cases for the analysis tests: inserted straight into the registry tables (as the
 * application role), so that the analysis triggers see them exactly as they see the registry's
 * own writes. Deterministic (seeded), in a surgery-date window the demo data never uses.
 */
import type { DataSource } from 'typeorm';

export { mulberry32 } from '../../../analysis/random/mulberry32.js';
import { mulberry32 } from '../../../analysis/random/mulberry32.js';

const STATUSES = ['draft', 'complete', 'verified', 'verified', 'locked', 'locked', 'withdrawn'];
const CLASSES = ['low', 'low', 'intermediate', 'high', null];
const INCISIONS = ['peripheral', 'upper-abdominal', 'intrathoracic', 'lower-abdominal'];
const EVENTS = ['atelectasis', 'respiratory-infection', 'respiratory-failure', 'reintubation', 'pleural-effusion', 'ards'];
const MODALITIES = ['incentive-spirometry', 'pep', 'cpap'];

export interface MadeCases { ids: string[]; year: number }

/** Inserts `count` cases of `year` at the given sites (site ids), with events and therapy. */
export async function makeCases(ds: DataSource, siteIds: string[], opts: { count: number; year: number; seed: number; prefix: string }): Promise<MadeCases> {
  const rnd = mulberry32(opts.seed);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rnd() * xs.length)];
  const ids: string[] = [];
  for (let i = 0; i < opts.count; i++) {
    const site = siteIds[i % siteIds.length];
    const month = 1 + Math.floor(rnd() * 12);
    const day = 1 + Math.floor(rnd() * 28);
    const surgery = `${opts.year}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
    const admit = new Date(`${surgery}T00:00:00Z`); admit.setUTCDate(admit.getUTCDate() - Math.floor(rnd() * 3));
    const discharged = rnd() < 0.9;
    const dis = new Date(`${surgery}T00:00:00Z`); dis.setUTCDate(dis.getUTCDate() + 1 + Math.floor(rnd() * rnd() * 25));
    const [row] = (await ds.query(
      `INSERT INTO surgical_cases (registry_number, registry_year, registry_seq, site_id, status, surgery_date, admission_date, discharge_date,
         age, sex, asa_class, procedure_category, incision_site, approach, urgency, ariscat_class, readmitted_30d, died_30d, therapy_given)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15, $16, $17, $18, $19) RETURNING id`,
      [
        `${opts.prefix}-${opts.year}-${i}`, opts.year, 900000 + opts.seed * 1000 + i, site, pick(STATUSES), surgery, admit.toISOString().slice(0, 10),
        discharged ? dis.toISOString().slice(0, 10) : null, 30 + Math.floor(rnd() * 60), pick(['female', 'male']), pick(['I', 'II', 'III', 'IV']),
        pick(['colorectal', 'thoracic', 'orthopaedic', 'upper-gastrointestinal']), pick(INCISIONS), pick(['open', 'laparoscopic']),
        rnd() < 0.2 ? 'emergency' : 'elective', pick(CLASSES), rnd() < 0.08, rnd() < 0.02, null,
      ],
    )) as { id: string }[];
    ids.push(row.id);
    const nEvents = rnd() < 0.25 ? 1 + Math.floor(rnd() * 2) : 0;
    for (let e = 0; e < nEvents; e++) {
      const type = pick(EVENTS);
      await ds.query(
        `INSERT INTO outcome_events (case_id, type, onset_postoperative_day, definition, definition_version, pneumonia_nhsn_met, removed_at)
         VALUES ($1, $2, $3, 'test', '1', $4, $5)`,
        [row.id, type, 1 + Math.floor(rnd() * 6), type === 'respiratory-infection' && rnd() < 0.7, rnd() < 0.05 ? new Date() : null],
      );
    }
    if (rnd() < 0.6) {
      await ds.query(
        `INSERT INTO therapy_episodes (case_id, modality, start_postoperative_day, sessions_prescribed, sessions_delivered) VALUES ($1, $2, $3, $4, $5)`,
        [row.id, pick(MODALITIES), Math.floor(rnd() * 3), 12, Math.floor(rnd() * 14)],
      );
    }
  }
  return { ids, year: opts.year };
}

export async function siteIdsByCode(ds: DataSource): Promise<Record<string, string>> {
  const rows = (await ds.query(`SELECT id::text AS id, code FROM sites`)) as { id: string; code: string }[];
  return Object.fromEntries(rows.map((r) => [r.code, r.id]));
}
