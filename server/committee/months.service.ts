/**
 * Month close: the completeness of a surveillance month, closing it (its verified cases lock,
 * its committee inputs are frozen into the roll-up, new signals are e-mailed), re-opening with
 * a reason, and publishing (the review packet job). Every step is audited.
 */
import type { DataSource, EntityManager } from 'typeorm';
import type { CloseResult, MonthDetail, MonthState, SiteCompleteness } from '../../shared/committee/review.js';
import { audit, type AuditInput } from '../audit/audit.service.js';
import { AppError, conflict } from '../http/errors.js';
import { enqueueJob } from '../jobs/jobs.service.js';
import { refreshRollup } from '../measures/rollup.js';
import { addMonths, currentMonth, monthLabel, monthStart } from '../measures/months.js';
import { todayIn } from '../../shared/registry/derived.js';

export interface Who { id: string; email: string; ip: string | null }

type Row = Record<string, any>;
const iso = (d: unknown) => (d ? new Date(d as string).toISOString() : null);

export async function monthStates(ds: DataSource, months: string[]): Promise<MonthState[]> {
  const rows: Row[] = await ds.query(
    `SELECT to_char(m.month, 'YYYY-MM') AS month, m.closed, m.closed_at, u.display_name AS closed_by, m.published_at, m.packet_job_id,
            r.signed_at IS NOT NULL AS signed, (r.month IS NOT NULL OR EXISTS (SELECT 1 FROM committee_findings f WHERE f.month = m.month)) AS has_review
       FROM committee_month_closes m LEFT JOIN users u ON u.id = m.closed_by LEFT JOIN committee_reviews r ON r.month = m.month
      WHERE m.month = ANY($1::date[])`,
    [months.map(monthStart)],
  );
  const reviews: Row[] = await ds.query(
    `SELECT to_char(month, 'YYYY-MM') AS month, bool_or(signed) AS signed FROM (
       SELECT month, signed_at IS NOT NULL AS signed FROM committee_reviews WHERE month = ANY($1::date[])
       UNION ALL SELECT month, false FROM committee_findings WHERE month = ANY($1::date[])) x GROUP BY month`,
    [months.map(monthStart)],
  );
  const byMonth = new Map(rows.map((r) => [r.month, r]));
  const reviewOf = new Map(reviews.map((r) => [r.month, r.signed ? 'signed' : 'draft'] as const));
  return months.map((month) => {
    const r = byMonth.get(month);
    return {
      month, closed: r?.closed ?? false, closedAt: iso(r?.closed_at), closedBy: r?.closed_by ?? null,
      publishedAt: iso(r?.published_at), packetJobId: r?.packet_job_id ?? null, reviewStatus: reviewOf.get(month) ?? 'none',
    };
  });
}

/** The last `count` months up to the current one, newest first. */
export async function recentMonths(ds: DataSource, timeZone: string, count = 18): Promise<MonthState[]> {
  const now = currentMonth(timeZone);
  const months = Array.from({ length: count }, (_, i) => addMonths(now, -i));
  return monthStates(ds, months);
}

/** Cases of the month per site by status, and how many 30-day follow-up windows are still open. */
export async function monthDetail(ds: DataSource, month: string, timeZone: string): Promise<MonthDetail> {
  const today = todayIn(timeZone, new Date());
  const rows: Row[] = await ds.query(
    `SELECT s.id AS "siteId", s.code AS "siteCode", s.name AS "siteName",
            count(c.id)::int AS cases,
            count(*) FILTER (WHERE c.status = 'draft')::int AS draft,
            count(*) FILTER (WHERE c.status = 'complete')::int AS complete,
            count(*) FILTER (WHERE c.status = 'verified')::int AS verified,
            count(*) FILTER (WHERE c.status = 'locked')::int AS locked,
            count(*) FILTER (WHERE c.status = 'withdrawn')::int AS withdrawn,
            count(*) FILTER (WHERE c.status <> 'withdrawn' AND c.surgery_date + 30 >= $3::date)::int AS "windowsOpen"
       FROM sites s LEFT JOIN surgical_cases c ON c.site_id = s.id AND c.surgery_date >= $1::date AND c.surgery_date < $2::date
      GROUP BY s.id ORDER BY s.code`,
    [monthStart(month), monthStart(addMonths(month, 1)), today],
  );
  const sites = rows as SiteCompleteness[];
  const sum = (k: keyof SiteCompleteness) => sites.reduce((s, r) => s + Number(r[k]), 0);
  const [state] = await monthStates(ds, [month]);
  return {
    ...state, sites, ended: month < currentMonth(timeZone),
    totals: { cases: sum('cases'), draft: sum('draft'), complete: sum('complete'), verified: sum('verified'), locked: sum('locked'), withdrawn: sum('withdrawn'), windowsOpen: sum('windowsOpen') },
  };
}

/** Audit entries in slices (one INSERT carries at most 65,535 parameters). */
async function auditInSlices(tx: EntityManager, entries: AuditInput[]) {
  for (let i = 0; i < entries.length; i += 1000) await audit(tx, entries.slice(i, i + 1000));
}

/**
 * Closes a month: locks its verified cases (status 'locked', one audit entry each), freezes its
 * committee inputs, records the close. All or nothing. Signals are e-mailed by the caller after
 * the commit (a mail failure must not undo the close).
 */
export async function closeMonth(ds: DataSource, month: string, who: Who, timeZone: string): Promise<Omit<CloseResult, 'signalsNotified'>> {
  if (month >= currentMonth(timeZone)) {
    throw new AppError(409, 'month_not_ended', `${monthLabel(month)} has not ended yet`, { hint: 'a month can be closed from the first day of the next month' });
  }
  return ds.transaction(async (tx) => {
    const [state] = await tx.query(`SELECT closed FROM committee_month_closes WHERE month = $1::date FOR UPDATE`, [monthStart(month)]);
    if (state?.closed) throw conflict(`${monthLabel(month)} is already closed`, undefined, 're-open it first (with a reason) if it must change');
    const res = await tx.query(
      `UPDATE surgical_cases SET status = 'locked', version = version + 1, locked_by = $3, locked_at = now(), updated_at = now()
        WHERE status = 'verified' AND surgery_date >= $1::date AND surgery_date < $2::date RETURNING id`,
      [monthStart(month), monthStart(addMonths(month, 1)), who.id],
    );
    const locked: { id: string }[] = Array.isArray(res[0]) ? res[0] : res;
    const [{ n }] = await tx.query(
      `SELECT count(*)::int AS n FROM surgical_cases WHERE status IN ('draft', 'complete') AND surgery_date >= $1::date AND surgery_date < $2::date`,
      [monthStart(month), monthStart(addMonths(month, 1))],
    );
    await auditInSlices(tx, locked.map((r) => ({ action: 'status-changed', actorId: who.id, actorEmail: who.email, ip: who.ip, entity: 'case', entityId: r.id, field: 'status', oldValue: 'verified', newValue: 'locked', reason: `month ${month} closed` })));
    await refreshRollup(tx, month);
    await tx.query(
      `INSERT INTO committee_month_closes (month, closed, closed_at, closed_by) VALUES ($1::date, true, now(), $2)
       ON CONFLICT (month) DO UPDATE SET closed = true, closed_at = now(), closed_by = $2`,
      [monthStart(month), who.id],
    );
    await audit(tx, { action: 'month-closed', actorId: who.id, actorEmail: who.email, ip: who.ip, entity: 'month', entityId: month, field: 'closed', oldValue: false, newValue: true, details: { locked: locked.length, notLocked: n } });
    return { month, locked: locked.length, notLocked: n };
  });
}

/** Re-opens a closed month with a reason: its locked cases return to verified (audited), its roll-up is dropped. */
export async function reopenMonth(ds: DataSource, month: string, reason: string, who: Who): Promise<{ month: string; unlocked: number }> {
  return ds.transaction(async (tx) => {
    const [state] = await tx.query(`SELECT closed FROM committee_month_closes WHERE month = $1::date FOR UPDATE`, [monthStart(month)]);
    if (!state?.closed) throw conflict(`${monthLabel(month)} is not closed`, undefined, 'only a closed month can be re-opened');
    const res = await tx.query(
      `UPDATE surgical_cases SET status = 'verified', version = version + 1, locked_by = NULL, locked_at = NULL, updated_at = now()
        WHERE status = 'locked' AND surgery_date >= $1::date AND surgery_date < $2::date RETURNING id`,
      [monthStart(month), monthStart(addMonths(month, 1))],
    );
    const rows: { id: string }[] = Array.isArray(res[0]) ? res[0] : res;
    await auditInSlices(tx, rows.map((r) => ({ action: 'status-changed', actorId: who.id, actorEmail: who.email, ip: who.ip, entity: 'case', entityId: r.id, field: 'status', oldValue: 'locked', newValue: 'verified', reason: `month ${month} re-opened: ${reason}` })));
    await tx.query(`DELETE FROM committee_month_rollups WHERE month = $1::date`, [monthStart(month)]);
    await tx.query(`UPDATE committee_month_closes SET closed = false, published_at = NULL, published_by = NULL WHERE month = $1::date`, [monthStart(month)]);
    await audit(tx, { action: 'month-reopened', actorId: who.id, actorEmail: who.email, ip: who.ip, entity: 'month', entityId: month, field: 'closed', oldValue: true, newValue: false, reason, details: { unlocked: rows.length } });
    return { month, unlocked: rows.length };
  });
}

/** Publishes a closed month: queues the review packet job; its handler e-mails the committee when done. */
export async function publishMonth(ds: DataSource, month: string, who: Who, baseUrl: string): Promise<{ month: string; jobId: string }> {
  return ds.transaction(async (tx) => {
    const [state] = await tx.query(`SELECT closed FROM committee_month_closes WHERE month = $1::date FOR UPDATE`, [monthStart(month)]);
    if (!state?.closed) throw conflict(`${monthLabel(month)} is not closed`, undefined, 'close the month first: only closed data are published');
    const jobId = await enqueueJob(tx as unknown as DataSource, 'committee-packet', { month, baseUrl }, who.id);
    await tx.query(`UPDATE committee_month_closes SET published_at = now(), published_by = $2, packet_job_id = $3 WHERE month = $1::date`, [monthStart(month), who.id, jobId]);
    await audit(tx, { action: 'month-published', actorId: who.id, actorEmail: who.email, ip: who.ip, entity: 'month', entityId: month, details: { jobId } });
    return { month, jobId };
  });
}
