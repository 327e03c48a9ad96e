/**
 * The committee's record of a month: per measure whether a signal was seen and the discussion,
 * actions with owner and due date, and the chair's sign-off (after which the findings are
 * fixed; actions can still be marked done). Every change is audited.
 */
import type { DataSource } from 'typeorm';
import type { Action, ActionCreate, ActionUpdate, FindingWrite, Member, Review } from '../../shared/committee/review.js';
import type { MeasureKey } from '../../shared/committee/measures.js';
import { audit } from '../audit/audit.service.js';
import { badRequest, conflict, notFound } from '../http/errors.js';
import { monthLabel, monthStart } from '../measures/months.js';
import type { Who } from '../committee/months.service.js';

type Row = Record<string, any>;

function toAction(r: Row, today: string): Action {
  return {
    id: r.id, month: r.month, measureKey: r.measure_key, description: r.description, ownerId: r.owner_id, ownerName: r.owner_name,
    dueDate: r.due_date, status: r.status, overdue: r.status === 'open' && r.due_date < today, note: r.note, createdAt: new Date(r.created_at).toISOString(),
  };
}

const ACTION_SQL = `SELECT a.id, to_char(a.month, 'YYYY-MM') AS month, a.measure_key, a.description, a.owner_id, u.display_name AS owner_name,
  to_char(a.due_date, 'YYYY-MM-DD') AS due_date, a.status, a.note, a.created_at
  FROM committee_actions a JOIN users u ON u.id = a.owner_id`;

export async function getReview(ds: DataSource, month: string, today: string): Promise<Review> {
  const [r] = await ds.query(`SELECT r.signed_at, u.display_name AS signed_by FROM committee_reviews r LEFT JOIN users u ON u.id = r.signed_by WHERE r.month = $1::date`, [monthStart(month)]);
  const findings: Row[] = await ds.query(
    `SELECT f.measure_key, f.signal_seen, f.discussion, u.display_name AS updated_by, f.updated_at FROM committee_findings f LEFT JOIN users u ON u.id = f.updated_by
      WHERE f.month = $1::date ORDER BY f.measure_key`,
    [monthStart(month)],
  );
  const actions: Row[] = await ds.query(`${ACTION_SQL} WHERE a.month = $1::date ORDER BY a.created_at`, [monthStart(month)]);
  return {
    month,
    status: r?.signed_at ? 'signed' : r || findings.length ? 'draft' : 'none',
    signedBy: r?.signed_by ?? null,
    signedAt: r?.signed_at ? new Date(r.signed_at).toISOString() : null,
    findings: findings.map((f) => ({ measureKey: f.measure_key, signalSeen: f.signal_seen, discussion: f.discussion, updatedBy: f.updated_by, updatedAt: new Date(f.updated_at).toISOString() })),
    actions: actions.map((a) => toAction(a, today)),
  };
}

async function assertNotSigned(ds: DataSource, month: string) {
  const [r] = await ds.query(`SELECT signed_at FROM committee_reviews WHERE month = $1::date`, [monthStart(month)]);
  if (r?.signed_at) throw conflict(`the review of ${monthLabel(month)} is signed off`, undefined, 'a signed review is fixed; record further discussion in the next month\'s review');
}

export async function saveFinding(ds: DataSource, month: string, key: MeasureKey, input: FindingWrite, who: Who): Promise<void> {
  await assertNotSigned(ds, month);
  await ds.transaction(async (tx) => {
    const [old] = await tx.query(`SELECT signal_seen, discussion FROM committee_findings WHERE month = $1::date AND measure_key = $2`, [monthStart(month), key]);
    await tx.query(`INSERT INTO committee_reviews (month) VALUES ($1::date) ON CONFLICT (month) DO NOTHING`, [monthStart(month)]);
    await tx.query(
      `INSERT INTO committee_findings (month, measure_key, signal_seen, discussion, updated_by, updated_at) VALUES ($1::date, $2, $3, $4, $5, now())
       ON CONFLICT (month, measure_key) DO UPDATE SET signal_seen = $3, discussion = $4, updated_by = $5, updated_at = now()`,
      [monthStart(month), key, input.signalSeen, input.discussion, who.id],
    );
    await audit(tx, { action: 'review-finding-saved', actorId: who.id, actorEmail: who.email, ip: who.ip, entity: 'review', entityId: month, field: key, oldValue: old ?? null, newValue: input });
  });
}

export async function addAction(ds: DataSource, month: string, input: ActionCreate, who: Who, today: string): Promise<Action> {
  await assertNotSigned(ds, month);
  const [owner] = await ds.query(`SELECT id FROM users WHERE id = $1 AND active`, [input.ownerId]);
  if (!owner) throw badRequest('the owner is not an active user', 'choose the owner from the list', [{ path: 'ownerId', message: 'not an active user' }]);
  const id = await ds.transaction(async (tx) => {
    await tx.query(`INSERT INTO committee_reviews (month) VALUES ($1::date) ON CONFLICT (month) DO NOTHING`, [monthStart(month)]);
    const [row] = await tx.query(
      `INSERT INTO committee_actions (month, measure_key, description, owner_id, due_date, created_by) VALUES ($1::date, $2, $3, $4, $5::date, $6) RETURNING id`,
      [monthStart(month), input.measureKey, input.description, input.ownerId, input.dueDate, who.id],
    );
    await audit(tx, { action: 'review-action-added', actorId: who.id, actorEmail: who.email, ip: who.ip, entity: 'review-action', entityId: row.id, newValue: input, details: { month } });
    return row.id as string;
  });
  const [row] = await ds.query(`${ACTION_SQL} WHERE a.id = $1`, [id]);
  return toAction(row, today);
}

export async function updateAction(ds: DataSource, id: string, input: ActionUpdate, who: Who, today: string): Promise<Action> {
  const [old] = await ds.query(`SELECT status, to_char(due_date, 'YYYY-MM-DD') AS due_date, note FROM committee_actions WHERE id = $1`, [id]);
  if (!old) throw notFound('the action');
  await ds.transaction(async (tx) => {
    await tx.query(
      `UPDATE committee_actions SET status = coalesce($2, status), due_date = coalesce($3::date, due_date), note = coalesce($4, note),
              done_at = CASE WHEN $2 = 'done' THEN now() WHEN $2 = 'open' THEN NULL ELSE done_at END,
              last_reminded_at = CASE WHEN $3::date IS NOT NULL THEN NULL ELSE last_reminded_at END
        WHERE id = $1`,
      [id, input.status ?? null, input.dueDate ?? null, input.note ?? null],
    );
    await audit(tx, { action: 'review-action-changed', actorId: who.id, actorEmail: who.email, ip: who.ip, entity: 'review-action', entityId: id, oldValue: old, newValue: input });
  });
  const [row] = await ds.query(`${ACTION_SQL} WHERE a.id = $1`, [id]);
  return toAction(row, today);
}

export async function signOff(ds: DataSource, month: string, who: Who): Promise<void> {
  await ds.transaction(async (tx) => {
    const [closed] = await tx.query(`SELECT closed FROM committee_month_closes WHERE month = $1::date`, [monthStart(month)]);
    if (!closed?.closed) throw conflict(`${monthLabel(month)} is not closed`, undefined, 'close the month first: the review signs off closed data');
    const [r] = await tx.query(`SELECT signed_at FROM committee_reviews WHERE month = $1::date FOR UPDATE`, [monthStart(month)]);
    const [{ n }] = await tx.query(`SELECT count(*)::int AS n FROM committee_findings WHERE month = $1::date`, [monthStart(month)]);
    if (!r || n === 0) throw conflict(`nothing is recorded for ${monthLabel(month)} yet`, undefined, 'record at least one measure\'s finding before signing off');
    if (r.signed_at) throw conflict(`the review of ${monthLabel(month)} is already signed off`);
    await tx.query(`UPDATE committee_reviews SET signed_by = $2, signed_at = now() WHERE month = $1::date`, [monthStart(month), who.id]);
    await audit(tx, { action: 'review-signed-off', actorId: who.id, actorEmail: who.email, ip: who.ip, entity: 'review', entityId: month, details: { findings: n } });
  });
}

export async function listReviews(ds: DataSource): Promise<{ month: string; status: 'draft' | 'signed'; signedBy: string | null; signedAt: string | null; findings: number; signals: number; openActions: number }[]> {
  const rows: Row[] = await ds.query(
    `SELECT to_char(r.month, 'YYYY-MM') AS month, r.signed_at, u.display_name AS signed_by,
            (SELECT count(*)::int FROM committee_findings f WHERE f.month = r.month) AS findings,
            (SELECT count(*)::int FROM committee_findings f WHERE f.month = r.month AND f.signal_seen) AS signals,
            (SELECT count(*)::int FROM committee_actions a WHERE a.month = r.month AND a.status = 'open') AS open_actions
       FROM committee_reviews r LEFT JOIN users u ON u.id = r.signed_by ORDER BY r.month DESC LIMIT 60`,
  );
  return rows.map((r) => ({ month: r.month, status: r.signed_at ? 'signed' : 'draft', signedBy: r.signed_by, signedAt: r.signed_at ? new Date(r.signed_at).toISOString() : null, findings: r.findings, signals: r.signals, openActions: r.open_actions }));
}

export async function listActions(ds: DataSource, status: 'open' | 'done' | 'all', today: string): Promise<Action[]> {
  const rows: Row[] = await ds.query(`${ACTION_SQL} WHERE ($1 = 'all' OR a.status = $1) ORDER BY a.due_date, a.created_at LIMIT 500`, [status]);
  return rows.map((r) => toAction(r, today));
}

/** Who may own an action: active committee members, analysts and admins. */
export async function members(ds: DataSource): Promise<Member[]> {
  const rows: Row[] = await ds.query(
    `SELECT id, display_name, roles FROM users WHERE active AND roles && ARRAY['committee', 'analyst', 'admin']::text[] ORDER BY display_name`,
  );
  return rows.map((r) => ({ id: r.id, displayName: r.display_name, roles: r.roles }));
}
