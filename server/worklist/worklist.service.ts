/** The abstractor's worklist (shared/registry/worklist.ts), from the completeness view and follow-up dates. */
import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import type { Worklist, WorklistItem, WorklistQuery } from '../../shared/registry/worklist.js';
import { FOLLOW_UP_DAYS } from '../../shared/registry/derived.js';
import { caseSiteScope } from '../http/scope.js';

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
  // Written so that the (site_id, status, surgery_date) index applies: statuses listed (not
  // NOT IN) and the window end compared as a surgery-date range.
  const open = `c.status IN ('draft', 'complete', 'verified') AND c.eligible IS DISTINCT FROM false AND c.follow_up_completed_on IS NULL`;

  // count(*) OVER () is computed before LIMIT: the bucket's total in the same query.
  const bucket = async (from: string, cond: string, order: string, extraCols = '', extraParams: unknown[] = []) => {
    const rows: Record<string, any>[] = await c.ds.transaction(async (tx) => {
      // JIT compilation of the completeness expressions costs seconds and saves nothing on
      // an interactive list (PostgreSQL's jit is meant for long analytical queries).
      await tx.query(`SET LOCAL jit = off`);
      return tx.query(`${BASE}${extraCols}, count(*) OVER () AS total_count ${from} WHERE ${cond}${scoped} ORDER BY ${order} LIMIT ${lim}`, [...params, ...extraParams]);
    });
    return { rows, total: rows.length ? Number(rows[0].total_count) : 0 };
  };

  const fromCases = `FROM surgical_cases c JOIN sites s ON s.id = c.site_id`;
  // The completeness view is computed for the scoped draft and complete cases first
  // (MATERIALIZED), paged on its own surgery date, and only the page joined to the cases.
  const missingRows: Record<string, any>[] = await c.ds.transaction(async (tx) => {
    await tx.query(`SET LOCAL jit = off`);
    return tx.query(
      `WITH m AS MATERIALIZED (SELECT cc.case_id, cc.missing, cc.surgery_date FROM case_completeness cc
                                 WHERE cc.status IN ('draft', 'complete') AND NOT cc.complete${scoped.replaceAll('c.site_id', 'cc.site_id')}),
            page AS (SELECT m.*, count(*) OVER () AS total_count FROM m ORDER BY m.surgery_date, m.case_id LIMIT ${lim})
       ${BASE}, page.missing, page.total_count FROM page JOIN surgical_cases c ON c.id = page.case_id JOIN sites s ON s.id = c.site_id
        WHERE $1::date IS NOT NULL ORDER BY page.surgery_date, page.case_id`,
      params,
    );
  });
  const missing = { rows: missingRows, total: missingRows.length ? Number(missingRows[0].total_count) : 0 };
  const due = await bucket(fromCases, `${open} AND c.surgery_date BETWEEN $1::date - ${FOLLOW_UP_DAYS} AND $1::date - ${FOLLOW_UP_DAYS} + ${q.dueWithinDays}`, 'c.surgery_date, c.id');
  const overdue = await bucket(fromCases, `${open} AND c.surgery_date < $1::date - ${FOLLOW_UP_DAYS}`, 'c.surgery_date, c.id');
  const waiting = await bucket(fromCases,
    `c.status = 'complete' AND c.created_by IS DISTINCT FROM $${params.length + 1}::uuid AND NOT ($${params.length + 1}::uuid = ANY(c.editors_since_verification)) AND $1::date IS NOT NULL`,
    'c.completed_at NULLS FIRST, c.id', `, ($1::date - (c.completed_at AT TIME ZONE '${c.timeZone.replace(/'/g, '')}')::date) AS waiting_days`, [user.id]);

  const dayDiff = (a: string, b: string) => Math.round((Date.parse(a) - Date.parse(b)) / 86_400_000);
  return {
    today: c.today,
    missingData: { total: missing.total, items: missing.rows.map((r) => item(r, null, false, r.missing)) },
    followUpDue: { total: due.total, items: due.rows.map((r) => item(r, dayDiff(r.window_end, c.today), false)) },
    followUpOverdue: { total: overdue.total, items: overdue.rows.map((r) => item(r, dayDiff(c.today, r.window_end), true)) },
    awaitingVerification: { total: waiting.total, items: waiting.rows.map((r) => item(r, r.waiting_days ?? null, (r.waiting_days ?? 0) > c.verifyWaitDays)) },
  };
}
