/**
 * SQL views that compute the derived measures of shared/registry/derived.ts in the database,
 * from the same constants (composite components, analysed statuses, follow-up days). The
 * Registry migration created them from this text; a test compares the two row by row.
 * `follow_up_window_end` is a date: whether the window has closed depends on today's date in
 * the network time zone, which the query passes in (`follow_up_window_end < $today`).
 */
import { ANALYSED_CASE_STATUSES, ANY_PPC_COMPONENTS, FOLLOW_UP_DAYS } from '../../shared/registry/derived.js';
import { caseCompletenessViewSql } from './completeness-sql.js';

const list = (xs: readonly string[]) => xs.map((x) => `'${x}'`).join(', ');
const activeEvent = (cond: string) => `EXISTS (SELECT 1 FROM outcome_events o WHERE o.case_id = c.id AND o.removed_at IS NULL AND ${cond})`;

export function caseDerivedViewSql(): string {
  return `CREATE VIEW case_derived AS
SELECT c.id AS case_id, c.site_id, c.status, c.surgery_date,
  to_char(c.surgery_date, 'YYYY-MM') AS surveillance_month,
  c.status IN (${list(ANALYSED_CASE_STATUSES)}) AS counts_in_analysis,
  CASE WHEN c.discharge_date >= c.admission_date THEN c.discharge_date - c.admission_date END AS length_of_stay_days,
  CASE WHEN c.discharge_date >= c.surgery_date THEN c.discharge_date - c.surgery_date END AS postoperative_stay_days,
  CASE WHEN c.discharge_date >= c.surgery_date THEN c.discharge_date - c.surgery_date END AS patient_days,
  c.surgery_date + ${FOLLOW_UP_DAYS} AS follow_up_window_end,
  (SELECT min(e.start_postoperative_day) FROM therapy_episodes e WHERE e.case_id = c.id AND e.removed_at IS NULL)::int AS days_to_first_therapy,
  ${activeEvent(`o.type IN (${list(ANY_PPC_COMPONENTS)})`)} AS any_ppc,
  ${activeEvent(`o.type = 'respiratory-infection' AND o.pneumonia_nhsn_met`)} AS pneumonia_nhsn,
  ${activeEvent(`o.type = 'reintubation'`)} AS reintubation,
  ${activeEvent(`o.type = 'ards'`)} AS ards,
  c.ariscat_points, c.ariscat_class
FROM surgical_cases c`;
}

export function therapyEpisodeDerivedViewSql(): string {
  return `CREATE VIEW therapy_episode_derived AS
SELECT e.id AS episode_id, e.case_id, e.modality, e.start_postoperative_day,
  CASE WHEN e.sessions_prescribed > 0 AND e.sessions_delivered IS NOT NULL
       THEN LEAST(1, e.sessions_delivered::numeric / e.sessions_prescribed) END AS adherence
FROM therapy_episodes e
WHERE e.removed_at IS NULL`;
}

/** Cases that count in analyses, with their derived measures (never draft or withdrawn). */
export function analysedCasesViewSql(): string {
  return `CREATE VIEW analysed_cases AS
SELECT d.* FROM case_derived d WHERE d.counts_in_analysis`;
}

/** Every view of the registry, in creation order. */
export function registryViewsSql(): string[] {
  return [caseDerivedViewSql(), therapyEpisodeDerivedViewSql(), analysedCasesViewSql(), caseCompletenessViewSql()];
}
