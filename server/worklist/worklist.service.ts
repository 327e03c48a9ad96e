/** The abstractor's worklist (shared/registry/worklist.ts), from the completeness view and follow-up dates. */
import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import type { Worklist, WorklistItem, WorklistQuery } from '../../shared/registry/worklist.js';
import { FOLLOW_UP_DAYS } from '../../shared/registry/derived.js';
import { caseSiteScope } from '../http/scope.js';
import { preparedRows } from '../db/prepared.js';

interface Ctx { ds: DataSource; today: string; timeZone: string; verifyWaitDays: number }

const BASE = `SELECT c.id, c.registry_number, s.code AS site_code, c.status, c.surgery_date::text AS surgery_date,
                     (c.surgery_date + ${FOLLOW_UP_DAYS})::text AS window_end`;

function item(r: Record<string, any>, days: number | null, overdue: boolean, missing: string[] = []): WorklistItem {
  return { id: r.id, registryNumber: r.registry_number, siteCode: r.site_code, status: r.status, surgeryDate: r.surgery_date, followUpWindowEnd: r.window_end, missing, days, overdue };
}

export async function buildWorklist(c: Ctx, user: SessionUser, q: WorklistQuery): Promise<Worklist> {
  const scope = caseSiteScope(user);
  const params: unknown[] = [c.today];
  const where: string[] = [];
  if (scope) { params.push(scope); where.push(`c.site_id = ANY($${params.length}::uuid[])`); }
  if (q.siteId) { params.push(q.siteId); where.push(`c.site_id = $${params.length}`); }
  const scoped = where.length ? ` AND ${where.join(' AND ')}` : '';
  params.push(q.limit);
  const lim = `$${params.length}`;
  // Written so that the partial indexes apply (migration WorklistIndexes repeats these conditions
  // word for word; change both together): statuses listed (not NOT IN) and the window end
  // compared as a surgery-date range.
  const open = `c.status IN ('draft', 'complete', 'verified') AND c.eligible IS DISTINCT FROM false AND c.follow_up_completed_on IS NULL`;

  // count(*) OVER () is computed before LIMIT: the bucket's total in the same query. The page's
  // ids first (an index-only scan of the list's partial index), the shown columns for those rows
  // only: computed below the LIMIT they cost a row each (0.2 s for 52,000 cases to verify).
  const bucket = async (cond: string, order: string, extraCols = '', extraParams: unknown[] = []) => {
    const rows: Record<string, any>[] = await preparedRows(c.ds,
      `WITH page AS (SELECT c.id, count(*) OVER () AS total_count FROM surgical_cases c WHERE ${cond}${scoped} ORDER BY ${order} LIMIT ${lim})
       ${BASE}${extraCols}, page.total_count FROM page JOIN surgical_cases c ON c.id = page.id JOIN sites s ON s.id = c.site_id ORDER BY ${order}`,
      [...params, ...extraParams]);
    return { rows, total: rows.length ? Number(rows[0].total_count) : 0 };
  };

  // Incomplete open cases are found through the fact table's `complete` flag (kept by the
  // registry's triggers, partial index on surgery date); the completeness view, which lists the
  // missing fields, is computed for the page's rows only.
  const missingList = async () => {
    const rows: Record<string, any>[] = await preparedRows(c.ds,
      `WITH page AS (SELECT f.case_id, f.surgery_date, count(*) OVER () AS total_count FROM analysis_case_facts f
                      WHERE NOT f.complete AND f.status IN (1, 2)${scoped.replaceAll('c.site_id', 'f.site_id')}
                      ORDER BY f.surgery_date, f.case_id LIMIT ${lim})
       ${BASE}, cc.missing, page.total_count FROM page JOIN surgical_cases c ON c.id = page.case_id JOIN sites s ON s.id = c.site_id
         JOIN case_completeness cc ON cc.case_id = page.case_id
        WHERE $1::date IS NOT NULL ORDER BY page.surgery_date, page.case_id`,
      params,
    );
    return { rows, total: rows.length ? Number(rows[0].total_count) : 0 };
  };
  // The four lists are independent reads: at once, on four pool connections.
  const [missing, due, overdue, waiting] = await Promise.all([
    missingList(),
    bucket(`${open} AND c.surgery_date BETWEEN $1::date - ${FOLLOW_UP_DAYS} AND $1::date - ${FOLLOW_UP_DAYS} + $${params.length + 1}::int`, 'c.surgery_date, c.id', '', [q.dueWithinDays]),
    bucket(`${open} AND c.surgery_date < $1::date - ${FOLLOW_UP_DAYS}`, 'c.surgery_date, c.id'),
    bucket(
      `c.status = 'complete' AND c.created_by IS DISTINCT FROM $${params.length + 1}::uuid AND NOT ($${params.length + 1}::uuid = ANY(c.editors_since_verification)) AND $1::date IS NOT NULL`,
      'c.completed_at NULLS FIRST, c.id', `, ($1::date - (c.completed_at AT TIME ZONE '${c.timeZone.replace(/'/g, '')}')::date) AS waiting_days`, [user.id]),
  ]);

  const dayDiff = (a: string, b: string) => Math.round((Date.parse(a) - Date.parse(b)) / 86_400_000);
  return {
    today: c.today,
    missingData: { total: missing.total, items: missing.rows.map((r) => item(r, null, false, r.missing)) },
    followUpDue: { total: due.total, items: due.rows.map((r) => item(r, dayDiff(r.window_end, c.today), false)) },
    followUpOverdue: { total: overdue.total, items: overdue.rows.map((r) => item(r, dayDiff(c.today, r.window_end), true)) },
    awaitingVerification: { total: waiting.total, items: waiting.rows.map((r) => item(r, r.waiting_days ?? null, (r.waiting_days ?? 0) > c.verifyWaitDays)) },
  };
}
