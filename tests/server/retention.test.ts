import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from './helpers.js';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import { allSchedules } from '../../server/jobs/registry.js';
import { exportDir } from '../../server/exports/generate.js';
import '../../server/exports/retention.js';

let t: TestApp;
beforeAll(async () => { t = await startTestApp({ DATA_DIR: fs.mkdtempSync(path.join(os.tmpdir(), 'alveolog-retention-')) }); });
afterAll(async () => { await t.close(); });

describe('retention', () => {
  it('when a session has expired, then the scheduled housekeeping deletes it and keeps live ones', async () => {
    await t.ds.query(`INSERT INTO session (sid, sess, expire) VALUES ('old-session', '{}', now() - interval '1 day'), ('live-session', '{}', now() + interval '1 hour')`);
    const job = allSchedules().find((s) => s.name === 'expired-sessions')!;
    await job.run(t.context);
    const rows = await t.ds.query(`SELECT sid FROM session WHERE sid IN ('old-session', 'live-session')`);
    expect(rows.map((r: { sid: string }) => r.sid)).toEqual(['live-session']);
  });

  it('when a half-written export file is left by a generation that did not finish, then the housekeeping deletes it once old, audited', async () => {
    const dir = exportDir(t.context);
    fs.mkdirSync(dir, { recursive: true });
    const old = path.join(dir, `${randomUUID()}.zip.part`);
    const fresh = path.join(dir, `${randomUUID()}.xlsx.part`);
    fs.writeFileSync(old, 'partial');
    fs.writeFileSync(fresh, 'partial');
    const twoHoursAgo = new Date(Date.now() - 2 * 3_600_000);
    fs.utimesSync(old, twoHoursAgo, twoHoursAgo);
    await allSchedules().find((s) => s.name === 'export-abandoned-parts')!.run(t.context);
    expect(fs.existsSync(old)).toBe(false);
    expect(fs.existsSync(fresh)).toBe(true); // may still be being written
    const [entry] = await t.ds.query(`SELECT details FROM audit_entries WHERE action = 'export-part-deleted' ORDER BY at DESC LIMIT 1`);
    expect(entry.details.file).toBe(path.basename(old));
  });
});
