import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import type { Role } from '../../shared/auth/roles.js';

/** Loads the signed-in user's current roles and sites (on every request: a change applies at once). */
export async function loadSessionUser(ds: DataSource, id: string, demoMode: boolean): Promise<SessionUser | null> {
  const rows = await ds.query(
    `SELECT u.id, u.email, u.display_name, u.roles, u.is_chair, u.totp_enabled, u.active,
            COALESCE(array_agg(us.site_id) FILTER (WHERE us.site_id IS NOT NULL), '{}') AS site_ids
       FROM users u LEFT JOIN user_sites us ON us.user_id = u.id
      WHERE u.id = $1 GROUP BY u.id`,
    [id],
  );
  const u = rows[0];
  if (!u || !u.active) return null;
  const roles = u.roles as Role[];
  return {
    id: u.id,
    email: u.email,
    displayName: u.display_name,
    roles,
    isChair: u.is_chair,
    siteIds: u.site_ids,
    totpEnabled: u.totp_enabled,
    mustEnrollTotp: roles.includes('admin') && !u.totp_enabled && !demoMode,
  };
}
