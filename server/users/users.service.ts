import type { DataSource } from 'typeorm';
import type { User, UserCreate, UserUpdate } from '../../shared/auth/user.js';
import { AppError, notFound } from '../http/errors.js';
import { forgetSessionUser } from '../auth/session-user.js';

const SELECT = `SELECT u.id, u.email, u.display_name, u.roles, u.is_chair, u.active, u.totp_enabled, u.locked_until, u.created_at,
       u.password_hash IS NULL AS invite_pending,
       COALESCE(array_agg(us.site_id) FILTER (WHERE us.site_id IS NOT NULL), '{}') AS site_ids
  FROM users u LEFT JOIN user_sites us ON us.user_id = u.id`;

function toUser(r: Record<string, any>): User {
  return {
    id: r.id, email: r.email, displayName: r.display_name, roles: r.roles, isChair: r.is_chair, active: r.active,
    totpEnabled: r.totp_enabled, invitePending: r.invite_pending, siteIds: r.site_ids,
    lockedUntil: r.locked_until ? new Date(r.locked_until).toISOString() : null, createdAt: new Date(r.created_at).toISOString(),
  };
}

export async function listUsers(ds: DataSource): Promise<User[]> {
  return (await ds.query(`${SELECT} GROUP BY u.id ORDER BY u.display_name`)).map(toUser);
}

export async function getUser(ds: DataSource, id: string): Promise<User> {
  const rows = await ds.query(`${SELECT} WHERE u.id = $1 GROUP BY u.id`, [id]);
  if (!rows[0]) throw notFound('the user');
  return toUser(rows[0]);
}

async function assertSitesExist(ds: DataSource, siteIds: string[]) {
  if (!siteIds.length) return;
  const [{ n }] = await ds.query(`SELECT count(*)::int AS n FROM sites WHERE id = ANY($1)`, [siteIds]);
  if (n !== new Set(siteIds).size) throw new AppError(400, 'unknown_site', 'one of the chosen sites does not exist', { fields: [{ path: 'siteIds', message: 'unknown site' }], hint: 'reload the page and choose again' });
}

export async function createUser(ds: DataSource, input: UserCreate): Promise<string> {
  await assertSitesExist(ds, input.siteIds);
  const exists = await ds.query(`SELECT 1 FROM users WHERE email = $1`, [input.email]);
  if (exists.length) throw new AppError(409, 'email_taken', 'a user with this e-mail already exists', { fields: [{ path: 'email', message: 'already in use' }], hint: 'search the user list instead' });
  return ds.transaction(async (tx) => {
    const [row] = await tx.query(`INSERT INTO users (email, display_name, roles, is_chair) VALUES ($1, $2, $3, $4) RETURNING id`, [input.email, input.displayName, input.roles, input.isChair && input.roles.includes('committee')]);
    for (const s of input.siteIds) await tx.query(`INSERT INTO user_sites (user_id, site_id) VALUES ($1, $2)`, [row.id, s]);
    return row.id as string;
  });
}

export async function updateUser(ds: DataSource, id: string, input: UserUpdate): Promise<{ before: User; after: User }> {
  const before = await getUser(ds, id);
  if (input.siteIds) await assertSitesExist(ds, input.siteIds);
  await ds.transaction(async (tx) => {
    const roles = input.roles ?? before.roles;
    await tx.query(
      `UPDATE users SET display_name = COALESCE($2, display_name), roles = $3, is_chair = $4, active = COALESCE($5, active) WHERE id = $1`,
      [id, input.displayName ?? null, roles, (input.isChair ?? before.isChair) && roles.includes('committee'), input.active ?? null],
    );
    if (input.siteIds) {
      await tx.query(`DELETE FROM user_sites WHERE user_id = $1`, [id]);
      for (const s of input.siteIds) await tx.query(`INSERT INTO user_sites (user_id, site_id) VALUES ($1, $2)`, [id, s]);
    }
    // A deactivated user is signed out everywhere at once.
    if (input.active === false) await tx.query(`DELETE FROM session WHERE sess->'passport'->>'user' = $1`, [id]);
  });
  forgetSessionUser(ds, id);
  return { before, after: await getUser(ds, id) };
}
