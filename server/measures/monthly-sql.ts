/**
 * The committee measures' monthly inputs per site, computed by PostgreSQL (GROUP BY site and
 * month) over the analysis issue's narrow fact table `analysis_case_facts` (one row per case,
 * kept current by triggers on the registry tables; migration AnalysisCohorts), so the rules
 * (counted statuses, any PPC, PNU1 pneumonia, stays, patient-days, first therapy day, adherence)
 * are computed once, in the same place as the cohort pages'. Only the respiratory cause of a
 * readmission is read from the case row, for readmitted cases alone. No case row reaches Node:
 * one row per site and month comes back.
 */
import type { DataSource, EntityManager } from 'typeorm';
import type { MonthlyInput } from '../../shared/committee/measures.js';
import { preparedRows } from '../db/prepared.js';

export type MonthlyInputs = Record<MonthlyInput, number> & {
  siteId: string;
  /** First day of the month, YYYY-MM-DD. */
  month: string;
  /** Length-of-stay frequency table, [[days, cases], ...], ascending. */
  losFrequencies: [number, number][];
};

// Codes of server/analysis/facts.ts (frozen lists): status complete 2, verified 3, locked 4;
// ARISCAT intermediate 2, high 3; event bit 1 = atelectasis; 247 = the any-PPC composite mask.
const COUNTED = `f.status IN (2, 3, 4)`;
const RANGE = `f.month >= $1::date AND f.month < $2::date AND ($3::uuid[] IS NULL OR f.site_id = ANY($3::uuid[]))`;

export const INPUT_SQL = `
WITH f AS MATERIALIZED (
  SELECT f.case_id, f.site_id, f.month, f.event_types, f.pneumonia, f.patient_days, f.readmitted, f.ariscat, f.first_therapy_day, f.adherence
    FROM analysis_case_facts f WHERE ${COUNTED} AND ${RANGE}
), resp AS (
  -- One primary-key probe per readmitted case (a join lets the planner scan every case row).
  SELECT f.site_id, f.month, count(*)::int AS n FROM f
   WHERE f.readmitted AND (SELECT sc.readmission_cause FROM surgical_cases sc WHERE sc.id = f.case_id) = 'respiratory' GROUP BY 1, 2
)
SELECT f.site_id AS "siteId", to_char(f.month, 'YYYY-MM-DD') AS month,
  count(*)::int AS cases,
  count(*) FILTER (WHERE f.event_types & 247 <> 0)::int AS "anyPpc",
  count(*) FILTER (WHERE f.event_types & 1 <> 0)::int AS atelectasis,
  count(*) FILTER (WHERE f.pneumonia)::int AS pneumonia,
  count(*) FILTER (WHERE f.pneumonia AND f.patient_days IS NOT NULL)::int AS "pneumoniaDischarged",
  count(f.patient_days)::int AS "dischargedCases",
  coalesce(sum(f.patient_days), 0)::int AS "patientDays",
  count(*)::int AS "followedUp",
  coalesce(max(resp.n), 0)::int AS "respiratoryReadmissions",
  count(*) FILTER (WHERE f.ariscat IN (2, 3))::int AS "atRisk",
  count(*) FILTER (WHERE f.ariscat IN (2, 3) AND f.first_therapy_day <= 1)::int AS "earlyTherapy",
  count(f.adherence)::int AS "adherenceCases",
  -- real (float4) summed in float8: the sum must not depend on the order rows arrive in.
  coalesce(sum(f.adherence::float8), 0)::float8 AS "adherenceSum"
FROM f LEFT JOIN resp ON resp.site_id = f.site_id AND resp.month = f.month
GROUP BY f.site_id, f.month`;

export const LOS_SQL = `
SELECT f.site_id AS "siteId", to_char(f.month, 'YYYY-MM-DD') AS month, f.los::int AS los, count(*)::int AS n
  FROM analysis_case_facts f
 WHERE ${COUNTED} AND f.los IS NOT NULL AND f.los >= 0 AND ${RANGE}
 GROUP BY 1, 2, 3 ORDER BY 1, 2, 3`;

/**
 * Monthly inputs of every site (or the given sites) for months in [fromMonth, toMonthExclusive).
 * @param fromMonth first day of the first month (YYYY-MM-01)
 * @param toMonthExclusive first day of the month after the last
 */
export async function monthlyInputs(db: DataSource | EntityManager, fromMonth: string, toMonthExclusive: string, siteIds: readonly string[] | null = null): Promise<MonthlyInputs[]> {
  const params = [fromMonth, toMonthExclusive, siteIds ? [...siteIds] : null];
  // Both aggregates at once on a DataSource (two pool connections); one after the other inside a
  // transaction, which has one connection. (JIT is off on every connection: create-data-source.ts.)
  const inTx = !('transaction' in db) || !!(db as EntityManager).queryRunner?.isTransactionActive;
  const [rows, los] = inTx
    ? [await db.query(INPUT_SQL, params), await db.query(LOS_SQL, params)]
    : await Promise.all([preparedRows(db as DataSource, INPUT_SQL, params), preparedRows(db as DataSource, LOS_SQL, params)]);
  const freq = new Map<string, [number, number][]>();
  for (const r of los as { siteId: string; month: string; los: number; n: number }[]) {
    const k = `${r.siteId}|${r.month}`;
    if (!freq.has(k)) freq.set(k, []);
    freq.get(k)!.push([r.los, r.n]);
  }
  return (rows as MonthlyInputs[]).map((r) => ({ ...r, losFrequencies: freq.get(`${r.siteId}|${r.month}`) ?? [] }));
}
