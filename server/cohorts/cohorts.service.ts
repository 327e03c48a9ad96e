/**
 * Saved cohorts: a named CohortFilter with its owner. A user sees their own cohorts and, when
 * they are an administrator, analyst or committee member, the cohorts others shared with the
 * network. Only the owner (or an administrator) changes or deletes one.
 */
import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import { CohortFilterSchema } from '../../shared/analysis/cohort-filter.js';
import type { SavedCohort, SavedCohortCreate, SavedCohortUpdate } from '../../shared/analysis/cohorts.js';
import { AppError, conflict, forbidden, notFound } from '../http/errors.js';
import { audit, auditStatement } from '../audit/audit.service.js';

type Actor = { actorId: string | null; actorEmail: string | null; ip: string | null };

const SEES_SHARED = (u: SessionUser) => u.roles.some((r) => r === 'admin' || r === 'analyst' || r === 'committee');

interface Row { id: string; name: string; description: string | null; filter: unknown; shared: boolean; owner_id: string; owner_name: string | null; created_at: Date; updated_at: Date }

const SELECT = `SELECT c.id, c.name, c.description, c.filter, c.shared, c.owner_id, u.display_name AS owner_name, c.created_at, c.updated_at
  FROM saved_cohorts c LEFT JOIN users u ON u.id = c.owner_id`;

function toCohort(r: Row, user: SessionUser): SavedCohort {
  // A filter saved under an older schema may no longer parse; keep what still does.
  const parsed = CohortFilterSchema.safeParse(r.filter);
  return {
    id: r.id, name: r.name, description: r.description, filter: parsed.success ? parsed.data : {}, shared: r.shared,
    ownerId: r.owner_id, ownerName: r.owner_name ?? 'a former user', mine: r.owner_id === user.id,
    createdAt: new Date(r.created_at).toISOString(), updatedAt: new Date(r.updated_at).toISOString(),
  };
}

export async function listCohorts(ds: DataSource, user: SessionUser): Promise<{ items: SavedCohort[] }> {
  const rows = (await ds.query(`${SELECT} WHERE c.owner_id = $1 ${SEES_SHARED(user) ? 'OR c.shared' : ''} ORDER BY c.name, c.created_at`, [user.id])) as Row[];
  return { items: rows.map((r) => toCohort(r, user)) };
}

export async function getCohort(ds: DataSource, user: SessionUser, id: string): Promise<SavedCohort> {
  const rows = (await ds.query(`${SELECT} WHERE c.id = $1`, [id])) as Row[];
  const r = rows[0];
  if (!r || (r.owner_id !== user.id && !(r.shared && SEES_SHARED(user)))) throw notFound('the cohort');
  return toCohort(r, user);
}

function isUniqueViolation(e: unknown): boolean {
  return (e as { code?: string })?.code === '23505' || (e as { driverError?: { code?: string } })?.driverError?.code === '23505';
}

const duplicate = (name: string) => conflict(`you already have a cohort named "${name}"`, undefined, 'choose another name or open the existing cohort');

export async function createCohort(ds: DataSource, user: SessionUser, body: SavedCohortCreate, who: Actor): Promise<SavedCohort> {
  if (body.shared && !SEES_SHARED(user)) throw forbidden('only administrators, analysts and committee members share cohorts with the network');
  try {
    return await ds.transaction(async (m) => {
      const [row] = (await m.query(`INSERT INTO saved_cohorts (name, description, filter, owner_id, shared) VALUES ($1, $2, $3, $4, $5) RETURNING id`, [body.name, body.description ?? null, JSON.stringify(body.filter), user.id, body.shared])) as { id: string }[];
      await audit(m, { ...who, action: 'create', entity: 'saved_cohort', entityId: row.id, newValue: { name: body.name, shared: body.shared, filter: body.filter } });
      const rows = (await m.query(`${SELECT} WHERE c.id = $1`, [row.id])) as Row[];
      return toCohort(rows[0], user);
    });
  } catch (e) {
    if (isUniqueViolation(e)) throw duplicate(body.name);
    throw e;
  }
}

async function ownedRow(ds: DataSource, user: SessionUser, id: string): Promise<Row> {
  const rows = (await ds.query(`${SELECT} WHERE c.id = $1`, [id])) as Row[];
  const r = rows[0];
  const visible = r && (r.owner_id === user.id || (r.shared && SEES_SHARED(user)));
  if (!visible) throw notFound('the cohort');
  if (r.owner_id !== user.id && !user.roles.includes('admin')) throw new AppError(403, 'forbidden', 'only the owner of a cohort may change or delete it', { hint: 'save a copy under your own name instead' });
  return r;
}

export async function updateCohort(ds: DataSource, user: SessionUser, id: string, body: SavedCohortUpdate, who: Actor): Promise<SavedCohort> {
  const before = await ownedRow(ds, user, id);
  if (body.shared && !SEES_SHARED(user)) throw forbidden('only administrators, analysts and committee members share cohorts with the network');
  const next = {
    name: body.name ?? before.name,
    description: body.description === undefined ? before.description : body.description,
    filter: body.filter ?? before.filter,
    shared: body.shared ?? before.shared,
  };
  // One statement (atomic on its own): the update, its audit entry (only if a row changed) and
  // the saved row. As a transaction it took six round trips, each a wait under load.
  const entry = auditStatement([{ ...who, action: 'update', entity: 'saved_cohort', entityId: id, oldValue: { name: before.name, shared: before.shared, filter: before.filter }, newValue: next }], 6);
  try {
    const rows = (await ds.query(
      `WITH u AS (UPDATE saved_cohorts SET name = $2, description = $3, filter = $4, shared = $5, updated_at = now() WHERE id = $1 RETURNING *),
            a AS (${entry.sql} WHERE EXISTS (SELECT 1 FROM u))
       SELECT u.id, u.name, u.description, u.filter, u.shared, u.owner_id, o.display_name AS owner_name, u.created_at, u.updated_at
         FROM u LEFT JOIN users o ON o.id = u.owner_id`,
      [id, next.name, next.description, JSON.stringify(next.filter), next.shared, ...entry.params],
    )) as Row[];
    if (!rows.length) throw notFound('the cohort');
    return toCohort(rows[0], user);
  } catch (e) {
    if (isUniqueViolation(e)) throw duplicate(next.name);
    throw e;
  }
}

export async function deleteCohort(ds: DataSource, user: SessionUser, id: string, who: Actor): Promise<void> {
  const before = await ownedRow(ds, user, id);
  await ds.transaction(async (m) => {
    await m.query(`DELETE FROM saved_cohorts WHERE id = $1`, [id]);
    await audit(m, { ...who, action: 'delete', entity: 'saved_cohort', entityId: id, oldValue: { name: before.name, shared: before.shared, filter: before.filter } });
  });
}
