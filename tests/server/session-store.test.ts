/**
 * The session store's read-through cache (server/auth/session-store.ts) on the real session
 * table: a row read is reused within the TTL; a read that overlapped a write or destroy of the
 * same session, or a forget, is not kept; a write of another session does not spoil it. Session
 * rows deleted behind the store's back show what is cached. (OWASP ASVS 4.0.3 V3.3.1: a session
 * ended on the server must not live on in a cache.)
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import type session from 'express-session';
import { testDbEnv } from '../setup/db-env.js';
import { createSessionStore, forgetCachedSessions } from '../../server/auth/session-store.js';

let pool: pg.Pool;
let store: session.Store;
const cookie = { originalMaxAge: 60_000, expires: new Date(Date.now() + 60_000), httpOnly: true, path: '/' };
const data = (user: string) => ({ cookie, passport: { user } }) as unknown as session.SessionData;

const call = <T>(fn: (cb: (err?: unknown, v?: T) => void) => void) => new Promise<T | undefined>((res, rej) => fn((err, v) => (err ? rej(err) : res(v))));
const get = (sid: string) => call<session.SessionData | null>((cb) => store.get(sid, cb));
const set = (sid: string, s: session.SessionData) => call<void>((cb) => store.set(sid, s, cb));
/** Removes the row in SQL only: the store does not know. */
const deleteBehind = (sid: string) => pool.query(`DELETE FROM session WHERE sid = $1`, [sid]);
const userOf = (s: session.SessionData | null | undefined) => (s as unknown as { passport?: { user?: string } } | null)?.passport?.user ?? null;

beforeAll(() => {
  pool = new pg.Pool({ connectionString: testDbEnv().DATABASE_URL, max: 3 });
  store = createSessionStore({ pool, ttlMs: 60_000, pruneSeconds: 3600 });
});
afterAll(async () => {
  (store as unknown as { close(): void }).close();
  await pool.end();
});

describe('the session store cache', () => {
  it('when a session was read, then a second read within the TTL comes from the cache', async () => {
    await set('s-cached', data('u1'));
    expect(userOf(await get('s-cached'))).toBe('u1');
    await deleteBehind('s-cached');
    expect(userOf(await get('s-cached')), 'served from the cache').toBe('u1');
  });

  it('when the same session is written while it is being read, then that read is not kept', async () => {
    await set('s-raced', data('u2'));
    const reading = get('s-raced');
    const writing = set('s-raced', data('u2-new'));
    await Promise.all([reading, writing]);
    await deleteBehind('s-raced');
    expect(await get('s-raced'), 'nothing cached from the overlapping read').toBeFalsy();
  });

  it('when another session is written while one is being read, then the read is still kept', async () => {
    await set('s-mine', data('u3'));
    await set('s-other', data('u4'));
    const reading = get('s-mine');
    const writing = set('s-other', data('u4-new'));
    await Promise.all([reading, writing]);
    await deleteBehind('s-mine');
    expect(userOf(await get('s-mine')), 'cached despite the other session\'s write').toBe('u3');
  });

  it('when sessions are forgotten while one is being read, then that read is not kept', async () => {
    await set('s-forgot', data('u5'));
    const reading = get('s-forgot');
    forgetCachedSessions();
    await reading;
    await deleteBehind('s-forgot');
    expect(await get('s-forgot')).toBeFalsy();
  });

  it("when one user's sessions are forgotten, then that user's cached rows go and others stay", async () => {
    await set('s-a', data('ua'));
    await set('s-b', data('ub'));
    await get('s-a');
    await get('s-b');
    await deleteBehind('s-a');
    await deleteBehind('s-b');
    forgetCachedSessions('ua');
    expect(await get('s-a')).toBeFalsy();
    expect(userOf(await get('s-b'))).toBe('ub');
  });
});
