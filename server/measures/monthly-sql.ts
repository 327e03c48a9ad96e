/**
 * The committee measures' monthly inputs per site, computed by PostgreSQL (GROUP BY site and
 * month) from the registry's derived-measure view `case_derived` (migration Registry), so the
 * rules (counted statuses, any PPC, PNU1 pneumonia, stays, first therapy day) are the registry's.
 * No case row reaches Node: one row per site and month comes back.
 */
import type { DataSource, EntityManager } from 'typeorm';
import type { MonthlyInput } from '../../shared/committee/measures.js';

export type MonthlyInputs = Record<MonthlyInput, number> & {
  siteId: string;
  /** First day of the month, YYYY-MM-DD. */
  month: string;
  /** Length-of-stay frequency table, [[days, cases], ...], ascending. */
  losFrequencies: [number, number][];
};

const INPUT_SQL = `
WITH c AS (
  SELECT d.case_id, d.site_id, date_trunc('month', d.surgery_date)::date AS month, d.any_ppc, d.pneumonia_nhsn,
         d.patient_days, d.length_of_stay_days, d.days_to_first_therapy, d.ariscat_class,
         sc.readmitted_30d, sc.readmission_cause
    FROM case_derived d JOIN surgical_cases sc ON sc.id = d.case_id
   WHERE d.counts_in_analysis AND d.surgery_date >= $1::date AND d.surgery_date < $2::date
     AND ($3::uuid[] IS NULL OR d.site_id = ANY($3::uuid[]))
), atel AS (
  SELECT DISTINCT o.case_id FROM outcome_events o JOIN c ON c.case_id = o.case_id
   WHERE o.removed_at IS NULL AND o.type = 'atelectasis'
), adh AS (
  -- A case's adherence: sessions delivered over prescribed across its episodes, capped at 1.
  SELECT e.case_id, LEAST(1, sum(e.sessions_delivered)::float8 / sum(e.sessions_prescribed)) AS adherence
    FROM therapy_episodes e JOIN c ON c.case_id = e.case_id
   WHERE e.removed_at IS NULL AND e.sessions_prescribed > 0 AND e.sessions_delivered IS NOT NULL
   GROUP BY e.case_id
)
SELECT c.site_id AS "siteId", to_char(c.month, 'YYYY-MM-DD') AS month,
  count(*)::int AS cases,
  count(*) FILTER (WHERE c.any_ppc)::int AS "anyPpc",
  count(atel.case_id)::int AS atelectasis,
  count(*) FILTER (WHERE c.pneumonia_nhsn)::int AS pneumonia,
  count(*) FILTER (WHERE c.pneumonia_nhsn AND c.patient_days IS NOT NULL)::int AS "pneumoniaDischarged",
  count(c.patient_days)::int AS "dischargedCases",
  coalesce(sum(c.patient_days), 0)::int AS "patientDays",
  count(c.readmitted_30d)::int AS "followedUp",
  count(*) FILTER (WHERE c.readmitted_30d AND c.readmission_cause = 'respiratory')::int AS "respiratoryReadmissions",
  count(*) FILTER (WHERE c.ariscat_class IN ('intermediate', 'high'))::int AS "atRisk",
  count(*) FILTER (WHERE c.ariscat_class IN ('intermediate', 'high') AND c.days_to_first_therapy <= 1)::int AS "earlyTherapy",
  count(adh.adherence)::int AS "adherenceCases",
  coalesce(sum(adh.adherence), 0)::float8 AS "adherenceSum"
FROM c LEFT JOIN atel ON atel.case_id = c.case_id LEFT JOIN adh ON adh.case_id = c.case_id
GROUP BY c.site_id, c.month`;

const LOS_SQL = `
SELECT d.site_id AS "siteId", to_char(date_trunc('month', d.surgery_date), 'YYYY-MM-DD') AS month,
       d.length_of_stay_days::int AS los, count(*)::int AS n
  FROM case_derived d
 WHERE d.counts_in_analysis AND d.length_of_stay_days IS NOT NULL
   AND d.surgery_date >= $1::date AND d.surgery_date < $2::date
   AND ($3::uuid[] IS NULL OR d.site_id = ANY($3::uuid[]))
 GROUP BY 1, 2, 3 ORDER BY 1, 2, 3`;

/**
 * Monthly inputs of every site (or the given sites) for months in [fromMonth, toMonthExclusive).
 * @param fromMonth first day of the first month (YYYY-MM-01)
 * @param toMonthExclusive first day of the month after the last
 */
export async function monthlyInputs(db: DataSource | EntityManager, fromMonth: string, toMonthExclusive: string, siteIds: readonly string[] | null = null): Promise<MonthlyInputs[]> {
  const params = [fromMonth, toMonthExclusive, siteIds ? [...siteIds] : null];
  // One after the other: inside a transaction both share one connection.
  const rows = await db.query(INPUT_SQL, params);
  const los = await db.query(LOS_SQL, params);
  const freq = new Map<string, [number, number][]>();
  for (const r of los as { siteId: string; month: string; los: number; n: number }[]) {
    const k = `${r.siteId}|${r.month}`;
    if (!freq.has(k)) freq.set(k, []);
    freq.get(k)!.push([r.los, r.n]);
  }
  return (rows as MonthlyInputs[]).map((r) => ({ ...r, losFrequencies: freq.get(`${r.siteId}|${r.month}`) ?? [] }));
}
