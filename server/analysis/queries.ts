/**
 * The SQL aggregates of the analysis service: every statistic rests on one of these two
 * queries, executed by PostgreSQL over the cohort's cells (server/analysis/cohort-sql.ts). They
 * return a handful of summed rows (per stratum, per period); case rows never reach Node.
 */
import type { DataSource } from 'typeorm';
import type { CohortFilter } from '../../shared/analysis/cohort-filter.js';
import { OUTCOME_COLUMNS, OUTCOME_FLAGS, ARISCAT_CODES, STATUS_CODES, codeOf } from './facts.js';
import { SqlParams, cohortCells, usesOnlyRollupDimensions } from './cohort-sql.js';
import { poolRows } from '../db/pool-rows.js';
import type { OutcomeFlag } from '../../shared/analysis/measures.js';

export type GroupKey = 'site' | 'month' | 'quarter' | 'ariscat' | 'therapy';
const GROUP_SQL: Record<GroupKey, string> = {
  site: 'c.site_id::text',
  month: `to_char(c.month, 'YYYY-MM')`,
  quarter: `to_char(c.month, 'YYYY-"Q"Q')`,
  ariscat: 'c.ariscat::int',
  therapy: 'c.therapy',
};

export interface CellTotals {
  groups: Partial<Record<GroupKey, string | number | boolean>>;
  n: number;
  verified: number;
  discharged: number;
  patientDays: number;
  pneumoniaDischarged: number;
  outcomes: Record<OutcomeFlag, number>;
}

export interface SqlText { text: string; values: unknown[] }

const VERIFIED_CODES = [codeOf(STATUS_CODES, 'verified'), codeOf(STATUS_CODES, 'locked')];

/** The SQL of cellTotals (also timed bare by the benchmark). */
export function cellTotalsSql(filter: CohortFilter, groupBy: readonly GroupKey[], restrictSites?: readonly string[] | null): SqlText {
  const params = new SqlParams();
  const source = cohortCells(filter, { params, restrictSites });
  const keys = groupBy.map((g, i) => `${GROUP_SQL[g]} AS g${i}`);
  const sums = [
    'sum(c.n)::int AS n',
    `(sum(c.n) FILTER (WHERE c.status IN (${VERIFIED_CODES.join(', ')})))::int AS verified`,
    'sum(c.discharged)::int AS discharged',
    'sum(c.patient_days)::bigint::float8 AS patient_days',
    'sum(c.pneumonia_discharged)::int AS pneumonia_discharged',
    ...OUTCOME_FLAGS.map((f) => `sum(c.${OUTCOME_COLUMNS[f].cell})::int AS ${OUTCOME_COLUMNS[f].cell}`),
  ];
  const group = groupBy.length ? ` GROUP BY ${groupBy.map((_, i) => i + 1).join(', ')} ORDER BY ${groupBy.map((_, i) => i + 1).join(', ')}` : '';
  return { text: `SELECT ${[...keys, ...sums].join(', ')} FROM (${source}) c${group}`, values: params.values };
}

function toTotals(row: Record<string, unknown>, groupBy: readonly GroupKey[]): CellTotals {
  const num = (k: string) => Number(row[k] ?? 0);
  const outcomes = Object.fromEntries(OUTCOME_FLAGS.map((f) => [f, num(OUTCOME_COLUMNS[f].cell)])) as Record<OutcomeFlag, number>;
  return {
    groups: Object.fromEntries(groupBy.map((g, i) => [g, row[`g${i}`] as string | number | boolean])),
    n: num('n'),
    verified: num('verified'),
    discharged: num('discharged'),
    patientDays: num('patient_days'),
    pneumoniaDischarged: num('pneumonia_discharged'),
    outcomes,
  };
}

/** Summed counts of a cohort, per combination of the groups asked for (no row when a group has no case). */
export async function cellTotals(ds: DataSource, filter: CohortFilter, groupBy: readonly GroupKey[], restrictSites?: readonly string[] | null): Promise<CellTotals[]> {
  const q = cellTotalsSql(filter, groupBy, restrictSites);
  const rows = await poolRows<Record<string, unknown>>(ds, q.text, q.values);
  return rows.filter((r) => Number(r.n ?? 0) > 0).map((r) => toTotals(r, groupBy));
}

/** The SQL of losFrequencies. */
export function losFrequenciesSql(filter: CohortFilter, restrictSites?: readonly string[] | null): SqlText {
  const params = new SqlParams();
  const source = cohortCells(filter, { params, restrictSites, los: true });
  return { text: `SELECT c.los::int AS value, sum(c.n)::int AS count FROM (${source}) c WHERE c.los >= 0 GROUP BY 1 ORDER BY 1`, values: params.values };
}

/** Length-of-stay frequency table (days -> cases) of the cohort's discharged cases. */
export async function losFrequencies(ds: DataSource, filter: CohortFilter, restrictSites?: readonly string[] | null): Promise<{ value: number; count: number }[]> {
  const q = losFrequenciesSql(filter, restrictSites);
  const rows = await poolRows<{ value: number; count: number }>(ds, q.text, q.values);
  return rows.map((r) => ({ value: Number(r.value), count: Number(r.count) }));
}

/** Which table answered (for the methods note and the benchmark). */
export function sourceOf(filter: CohortFilter): 'roll-up' | 'fact-table' {
  return usesOnlyRollupDimensions(filter) ? 'roll-up' : 'fact-table';
}

/** ARISCAT class of a group value (0 = unknown). */
export function ariscatOf(code: number): (typeof ARISCAT_CODES)[number] | null {
  return code >= 1 && code <= ARISCAT_CODES.length ? ARISCAT_CODES[code - 1] : null;
}
