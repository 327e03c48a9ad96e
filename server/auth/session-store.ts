/**
 * The session store: connect-pg-simple's table, with a short read-through cache in front.
 * express-session reads the row on every API request; under load that read was, after the
 * user lookup, the commonest database round trip. A row is reused for `ttlMs` at most, and
 * every write or destroy through this store drops it first, so sign-in, sign-out, session
 * regeneration and the once-a-minute refresh take effect at once in this process. Sessions
 * ended by SQL (a deactivated user, a password reset) are dropped by `forgetCachedSessions`,
 * which `forgetSessionUser` calls; `ttlMs` bounds what another process can still see.
 */
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import type pg from 'pg';

type Entry = { json: string; userId: string | null; at: number };
/**
 * A store's cache with write counters: a read that overlapped a write of the same session, or a
 * forget of many (`epoch`), is not cached (it may predate the change). Counting per session keeps
 * one user's once-a-minute refresh from spoiling everyone else's reads in flight.
 */
type Cache = { entries: Map<string, Entry>; writes: Map<string, number>; epoch: number };
type SessionData = session.SessionData;
type Callback<T> = (err?: unknown, value?: T | null) => void;

/** A bound on each cache of signed-in users and sessions, far above the staff signed in at once. */
export const CACHE_MAX_ENTRIES = 10_000;

/** Every live store's cache in this process (tests build several apps). */
const caches = new Set<Cache>();

const userOf = (s: SessionData): string | null => {
  const id = (s as unknown as { passport?: { user?: unknown } }).passport?.user;
  return typeof id === 'string' ? id : null;
};

export function createSessionStore(opts: { pool: pg.Pool; ttlMs: number; pruneSeconds: number }): session.Store {
  const PgStore = connectPgSimple(session);
  const cache: Cache = { entries: new Map(), writes: new Map(), epoch: 0 };
  caches.add(cache);
  const drop = (sid: string) => {
    // Bounded like the entries; clearing moves the epoch, so no read in flight is kept after it.
    if (cache.writes.size > CACHE_MAX_ENTRIES) { cache.writes.clear(); cache.epoch += 1; }
    cache.writes.set(sid, (cache.writes.get(sid) ?? 0) + 1);
    cache.entries.delete(sid);
  };
  class CachedPgStore extends PgStore {
    override get(sid: string, cb: Callback<SessionData>): void {
      const hit = cache.entries.get(sid);
      // A parsed copy per request: express-session mutates the object it is given.
      if (hit && Date.now() - hit.at < opts.ttlMs) return cb(null, JSON.parse(hit.json) as SessionData);
      const at = Date.now();
      const epoch = cache.epoch;
      const writes = cache.writes.get(sid) ?? 0;
      super.get(sid, (err?: unknown, sess?: SessionData | null) => {
        // express-session reads an error with code ENOENT as "no such session" (file stores) and
        // starts a new one; over the Unix socket a stopped database is "connect ENOENT", which
        // must stay an error (503), not sign the user out.
        if ((err as { code?: string } | undefined)?.code === 'ENOENT') err = Object.assign(new Error((err as Error).message), { code: '08006', cause: err });
        if (!err && sess && opts.ttlMs > 0 && cache.epoch === epoch && (cache.writes.get(sid) ?? 0) === writes) {
          if (cache.entries.size > CACHE_MAX_ENTRIES) cache.entries.clear();
          cache.entries.set(sid, { json: JSON.stringify(sess), userId: userOf(sess), at });
        }
        cb(err, sess);
      });
    }
    override set(sid: string, sess: SessionData, cb?: (err?: unknown) => void): void {
      // Dropped before and after the write, so no read around it keeps the old row.
      drop(sid);
      super.set(sid, sess, (err?: unknown) => { drop(sid); cb?.(err); });
    }
    override destroy(sid: string, cb?: (err?: unknown) => void): void {
      drop(sid);
      super.destroy(sid, (err?: unknown) => { drop(sid); cb?.(err); });
    }
    override close(): void {
      caches.delete(cache);
      super.close();
    }
  }
  return new CachedPgStore({ pool: opts.pool, tableName: 'session', pruneSessionInterval: opts.pruneSeconds, disableTouch: true });
}

/** Drops the cached sessions of one user (after SQL ended them), or every cached session. */
export function forgetCachedSessions(userId?: string): void {
  for (const cache of caches) {
    cache.epoch += 1;
    if (!userId) { cache.entries.clear(); continue; }
    for (const [sid, e] of cache.entries) if (e.userId === userId) cache.entries.delete(sid);
  }
}
