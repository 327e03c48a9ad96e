import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from './helpers.js';
import { allSchedules } from '../../server/jobs/registry.js';

let t: TestApp;
beforeAll(async () => { t = await startTestApp(); });
afterAll(async () => { await t.close(); });

describe('retention', () => {
  it('when a session has expired, then the scheduled housekeeping deletes it and keeps live ones', async () => {
    await t.ds.query(`INSERT INTO session (sid, sess, expire) VALUES ('old-session', '{}', now() - interval '1 day'), ('live-session', '{}', now() + interval '1 hour')`);
    const job = allSchedules().find((s) => s.name === 'expired-sessions')!;
    await job.run(t.context);
    const rows = await t.ds.query(`SELECT sid FROM session WHERE sid IN ('old-session', 'live-session')`);
    expect(rows.map((r: { sid: string }) => r.sid)).toEqual(['live-session']);
  });
});
