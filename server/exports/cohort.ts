/**
 * The cohort of an export: the cases the analysis service's CohortFilter selects (only statuses
 * that count in analyses), as conditions on `analysis_case_facts` joined to the case row.
 */
import type { CohortFilter } from '../../shared/analysis/cohort-filter.js';
import { factConditions, SqlParams } from '../analysis/cohort-sql.js';

export { SqlParams };

/** FROM clause and WHERE conditions giving the cohort's case rows as `c` (surgical_cases). */
export function cohortFrom(filter: CohortFilter, params: SqlParams): { from: string; where: string[] } {
  return {
    from: 'analysis_case_facts f JOIN surgical_cases c ON c.id = f.case_id',
    where: factConditions(filter, 'f', { params }),
  };
}

/** The cohort's case ids as a subquery (for restricting per-case aggregates). */
export function cohortCaseIds(filter: CohortFilter, params: SqlParams, alias = 'f2'): string {
  return `SELECT ${alias}.case_id FROM analysis_case_facts ${alias} WHERE ${factConditions(filter, alias, { params }).join(' AND ')}`;
}
