/**
 * GET /api/cases: one SQL query with server-side filters, sort and page, scoped to the user's
 * sites. Above 10,000 rows the total is the planner's estimate, flagged so the table says
 * "about" (exact counts of a million rows are slow and the footer needs only the magnitude).
 */
import { preparedRows } from '../db/prepared.js';
import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import { parseSort } from '../../shared/api/pagination.js';
import { type CaseListItem, type CaseListPage, type CaseListQuery } from '../../shared/registry/list.js';
import { ANY_PPC_COMPONENTS } from '../../shared/registry/derived.js';
import { caseSiteScope } from '../http/scope.js';

export const ESTIMATE_ABOVE = 10_000;

const SORT_SQL: Record<string, string> = {
  registryNumber: 'c.registry_number',
  surgeryDate: 'c.surgery_date',
  status: 'c.status',
  ariscatPoints: 'c.ariscat_points',
  procedureCategory: 'c.procedure_category',
  age: 'c.age',
  updatedAt: 'c.updated_at',
  siteCode: 's.code',
};

function whereClause(q: CaseListQuery, user: SessionUser): { sql: string; params: unknown[] } {
  const params: unknown[] = [];
  const p = (v: unknown) => {
    params.push(v);
    return `$${params.length}`;
  };
  // One value is written as `=`, not `= ANY(...)`: before PostgreSQL 17 an index scan cannot
  // return rows in index order past an = ANY on a leading column, so a sorted page would sort.
  const oneOf = (col: string, values: readonly string[], type: 'uuid' | 'text') =>
    values.length === 1 ? `${col} = ${p(values[0])}::${type}` : `${col} = ANY(${p(values)}::${type}[])`;
  const w: string[] = [];
  const scope = caseSiteScope(user);
  if (scope) w.push(oneOf('c.site_id', scope, 'uuid'));
  if (q.siteId) w.push(oneOf('c.site_id', q.siteId, 'uuid'));
  if (q.surgeryFrom) w.push(`c.surgery_date >= ${p(q.surgeryFrom)}`);
  if (q.surgeryTo) w.push(`c.surgery_date <= ${p(q.surgeryTo)}`);
  if (q.status) w.push(oneOf('c.status', q.status, 'text'));
  if (q.procedureCategory) w.push(oneOf('c.procedure_category', q.procedureCategory, 'text'));
  if (q.riskClass) {
    const classes = q.riskClass.filter((r) => r !== 'unscored');
    const parts = [];
    if (classes.length) parts.push(`c.ariscat_class = ANY(${p(classes)}::text[])`);
    if (q.riskClass.includes('unscored')) parts.push('c.ariscat_class IS NULL');
    w.push(`(${parts.join(' OR ')})`);
  }
  if (q.outcome) {
    const ev = (cond: string) => `EXISTS (SELECT 1 FROM outcome_events o WHERE o.case_id = c.id AND o.removed_at IS NULL AND ${cond})`;
    if (q.outcome === 'any-ppc') w.push(ev(`o.type = ANY(${p([...ANY_PPC_COMPONENTS])}::text[])`));
    else if (q.outcome === 'no-ppc') w.push(`NOT ${ev(`o.type = ANY(${p([...ANY_PPC_COMPONENTS])}::text[])`)}`);
    else if (q.outcome === 'pneumonia-nhsn') w.push(ev(`o.type = 'respiratory-infection' AND o.pneumonia_nhsn_met`));
    else w.push(ev(`o.type = ${p(q.outcome)}`));
  }
  if (q.q) w.push(`c.registry_number LIKE ${p(`${q.q.toUpperCase().replace(/[%_\\]/g, '')}%`)}`);
  return { sql: w.length ? `WHERE ${w.join(' AND ')}` : '', params };
}

async function plannerEstimate(ds: DataSource, where: { sql: string; params: unknown[] }): Promise<number> {
  const [row] = await ds.query(`EXPLAIN (FORMAT JSON) SELECT 1 FROM surgical_cases c ${where.sql}`, where.params);
  const plan = (row['QUERY PLAN'] as { Plan: { 'Plan Rows': number } }[])[0].Plan;
  return Math.round(plan['Plan Rows']);
}

/**
 * The list's total: exact up to ESTIMATE_ABOVE rows, else the planner's estimate (shown as
 * "about") — counting a million rows exactly costs more than the page. The exact count is
 * bounded (it stops at ESTIMATE_ABOVE + 1 rows), so a list of any size costs one count, and the
 * estimate is asked for only past it: one round trip for the lists people page through.
 */
async function listTotal(ds: DataSource, where: { sql: string; params: unknown[] }): Promise<{ total: number; estimate: boolean }> {
  const [{ n }] = await preparedRows<{ n: number }>(ds, `SELECT count(*)::int AS n FROM (SELECT 1 FROM surgical_cases c ${where.sql} LIMIT ${ESTIMATE_ABOVE + 1}) x`, where.params);
  if (n <= ESTIMATE_ABOVE) return { total: n, estimate: false };
  return { total: Math.max(await plannerEstimate(ds, where), n), estimate: true };
}

export async function listCases(ds: DataSource, q: CaseListQuery, user: SessionUser): Promise<CaseListPage> {
  const where = whereClause(q, user);
  const sort = parseSort(q.sort) ?? { field: 'surgeryDate', direction: 'DESC' as const };
  // Nullable columns sort their blanks last; NOT NULL ones name no NULLS clause, so that
  // ORDER BY matches the (surgery_date DESC, id DESC) indexes exactly.
  const nullable = ['ariscatPoints', 'procedureCategory', 'age'].includes(sort.field);
  const order = `${SORT_SQL[sort.field] ?? 'c.surgery_date'} ${sort.direction}${nullable ? ' NULLS LAST' : ''}, c.id ${sort.direction}`;
  const n = where.params.length;
  // The page's ids first (an index walk with OFFSET), then the columns, the per-case event list
  // and the completeness flag (kept in the fact table by the registry's triggers) for those
  // rows only: a select-list subquery below OFFSET would run for every skipped row.
  // The total (an exact count, or the planner's estimate above ESTIMATE_ABOVE rows) runs alongside.
  const [rows, total] = await Promise.all([
    preparedRows(ds,
      `WITH page AS (SELECT c.id FROM surgical_cases c ${where.sql} ORDER BY ${order} LIMIT $${n + 1} OFFSET $${n + 2})
       SELECT c.id, c.registry_number, c.site_id, s.code AS site_code, u.code AS unit_code, c.status, c.surgery_date::text AS surgery_date,
              c.procedure_category, c.age, c.ariscat_points, c.ariscat_class, c.version, c.updated_at,
              ARRAY(SELECT DISTINCT o.type FROM outcome_events o WHERE o.case_id = c.id AND o.removed_at IS NULL ORDER BY o.type) AS event_types,
              coalesce(f.complete, false) AS complete
         FROM page JOIN surgical_cases c ON c.id = page.id JOIN sites s ON s.id = c.site_id LEFT JOIN units u ON u.id = c.unit_id
         LEFT JOIN analysis_case_facts f ON f.case_id = c.id
        ORDER BY ${order}`,
      [...where.params, q.pageSize, (q.page - 1) * q.pageSize],
    ),
    listTotal(ds, where),
  ]);
  const items: CaseListItem[] = rows.map((r: Record<string, any>) => ({
    id: r.id, registryNumber: r.registry_number, siteId: r.site_id, siteCode: r.site_code, unitCode: r.unit_code, status: r.status, surgeryDate: r.surgery_date,
    procedureCategory: r.procedure_category, age: r.age, ariscatPoints: r.ariscat_points, ariscatClass: r.ariscat_class,
    anyPpc: (r.event_types as string[]).some((t) => (ANY_PPC_COMPONENTS as readonly string[]).includes(t)), eventTypes: r.event_types,
    complete: r.complete, version: r.version, updatedAt: new Date(r.updated_at).toISOString(),
  }));
  return { items, total: total.total, totalIsEstimate: total.estimate, page: q.page, pageSize: q.pageSize };
}
