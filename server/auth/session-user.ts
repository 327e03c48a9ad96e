import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import type { Role } from '../../shared/auth/roles.js';
import { CACHE_MAX_ENTRIES, forgetCachedSessions } from './session-store.js';

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

/**
 * Signed-in users as loaded above, kept for a few seconds per database (tests run several apps
 * on cloned databases with the same user ids). The lookup ran on every request; under load it
 * was a fifth of the database round trips. Every change the application makes to a user's
 * roles, sites, activity or second factor calls `forgetSessionUser`, so in this process a change
 * applies at once; `ttlMs` bounds how long another process (or `npm run create-admin`) can see
 * the old values. A lookup that overlapped a forget is not kept (it may have read the row
 * before the change).
 */
type UserCache = { entries: Map<string, { user: SessionUser | null; at: number }>; forgets: number };
const caches = new WeakMap<object, UserCache>();

export async function cachedSessionUser(ds: DataSource, id: string, demoMode: boolean, ttlMs: number): Promise<SessionUser | null> {
  let cache = caches.get(ds);
  if (!cache) caches.set(ds, (cache = { entries: new Map(), forgets: 0 }));
  const hit = cache.entries.get(id);
  const now = Date.now();
  if (hit && now - hit.at < ttlMs) return hit.user;
  const forgets = cache.forgets;
  const user = await loadSessionUser(ds, id, demoMode);
  if (cache.entries.size > CACHE_MAX_ENTRIES) cache.entries.clear();
  if (ttlMs > 0 && cache.forgets === forgets) cache.entries.set(id, { user, at: now });
  return user;
}

/**
 * Drops a user's cached entry and cached session rows (after any change to them, or after SQL
 * ended their sessions; call it once the transaction has committed); without an id, every entry.
 */
export function forgetSessionUser(ds: DataSource, id?: string): void {
  forgetCachedSessions(id);
  const cache = caches.get(ds);
  if (!cache) return;
  cache.forgets += 1;
  if (id) cache.entries.delete(id);
  else cache.entries.clear();
}
