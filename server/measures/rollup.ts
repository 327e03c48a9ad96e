/**
 * The committee's monthly roll-up: a closed month's inputs are frozen into
 * committee_month_rollups when it is closed (what the committee reviewed does not move under
 * it; a correction comes in by re-opening, audited, and closing again). Open months are read
 * live from the registry. A 60-month series therefore reads the roll-up rows of the closed
 * months plus the few open months' cases through the surgery-date index.
 */
import { preparedRows } from '../db/prepared.js';
import type { DataSource, EntityManager } from 'typeorm';
import { MONTHLY_INPUTS } from '../../shared/committee/measures.js';
import { monthlyInputs, type MonthlyInputs } from './monthly-sql.js';
import { addMonths, monthStart, toMonth } from './months.js';

const COLUMNS: Record<(typeof MONTHLY_INPUTS)[number], string> = {
  cases: 'cases', anyPpc: 'any_ppc', atelectasis: 'atelectasis', pneumonia: 'pneumonia', pneumoniaDischarged: 'pneumonia_discharged',
  dischargedCases: 'discharged_cases', patientDays: 'patient_days', followedUp: 'followed_up', respiratoryReadmissions: 'respiratory_readmissions',
  atRisk: 'at_risk', earlyTherapy: 'early_therapy', adherenceCases: 'adherence_cases', adherenceSum: 'adherence_sum',
};

/** Recomputes one month's roll-up rows (inside the close transaction). */
export async function refreshRollup(tx: DataSource | EntityManager, month: string): Promise<void> {
  const rows = await monthlyInputs(tx, monthStart(month), monthStart(addMonths(month, 1)));
  await tx.query(`DELETE FROM committee_month_rollups WHERE month = $1::date`, [monthStart(month)]);
  for (const r of rows) {
    const cols = MONTHLY_INPUTS.map((k) => COLUMNS[k]);
    const values = [r.siteId, r.month, ...MONTHLY_INPUTS.map((k) => r[k]), JSON.stringify(r.losFrequencies)];
    await tx.query(
      `INSERT INTO committee_month_rollups (site_id, month, ${cols.join(', ')}, los_frequencies) VALUES (${values.map((_, i) => `$${i + 1}`).join(', ')})`,
      values,
    );
  }
}

/**
 * Monthly inputs per site for months [from, to]: closed months from the roll-up, others live.
 * @param closed the closed months ('YYYY-MM') among them
 */
/** The roll-up rows of some months ($1 date[]) and sites ($2 uuid[] or null = all). */
export const ROLLUP_SELECT_SQL = `SELECT site_id AS "siteId", to_char(month, 'YYYY-MM-DD') AS month, ${MONTHLY_INPUTS.map((k) => `${COLUMNS[k]} AS "${k}"`).join(', ')}, los_frequencies AS "losFrequencies"
  FROM committee_month_rollups WHERE month = ANY($1::date[]) AND ($2::uuid[] IS NULL OR site_id = ANY($2::uuid[]))`;

export async function readMonthly(db: DataSource, from: string, to: string, closed: ReadonlySet<string>, siteIds: readonly string[] | null): Promise<MonthlyInputs[]> {
  // Open months, in contiguous stretches, live from the registry.
  const stretches: [string, string][] = [];
  let start: string | null = null;
  for (let m = from; ; m = addMonths(m, 1)) {
    const open = m <= to && !closed.has(m);
    if (open && start === null) start = m;
    if (!open && start !== null) {
      stretches.push([monthStart(start), monthStart(m)]);
      start = null;
    }
    if (m > to) break;
  }
  const frozenMonths = [...closed].filter((m) => m >= from && m <= to).map(monthStart);
  // The roll-up rows and the live stretches are independent reads: at once.
  const [frozen, ...live] = await Promise.all([
    frozenMonths.length ? preparedRows<MonthlyInputs>(db, ROLLUP_SELECT_SQL, [frozenMonths, siteIds ? [...siteIds] : null]) : Promise.resolve([] as MonthlyInputs[]),
    ...stretches.map(([a, b]) => monthlyInputs(db, a, b, siteIds)),
  ]);
  return [...frozen, ...live.flat()].map((r) => ({ ...r, month: toMonth(r.month) }));
}
