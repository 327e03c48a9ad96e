/**
 * A server killed (SIGKILL) in the middle of a commit keeps nothing: all rows are written in one
 * transaction, so PostgreSQL rolls it back; at the next start the runner marks the orphaned job
 * failed (failOrphanedJobs), and a retry imports every row.
 */
import { testDbEnv } from '../../setup/db-env.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createDataSource } from '../../../server/db/create-data-source.js';
import type { DataSource } from 'typeorm';
import { freshDataDir, upload, workbook } from './support.js';
import { startServerProcess, waitFor, type ServerProcess } from './server-process.js';

const ROWS = 2500;
const MARK_DATE = '2026-08-08';
let db: DataSource;
const servers: ServerProcess[] = [];
const dataDir = freshDataDir();
const env = { DATA_DIR: dataDir, IMPORT_BATCH_ROWS: '25', LOG_LEVEL: 'warn' };

beforeAll(async () => { db = await createDataSource(testDbEnv().DATABASE_URL, 2).initialize(); });
afterAll(async () => {
  for (const s of servers) await s.stop().catch(() => undefined);
  await db.destroy();
});

const marked = async () => (await db.query(`SELECT count(*)::int AS n FROM surgical_cases WHERE surgery_date = $1 AND weight_kg = 66.6`, [MARK_DATE]))[0].n as number;

describe('crash safety of the commit', () => {
  it('when the server is killed after reporting rows written inside the transaction, then no row is kept and after a restart the job is failed and retryable', async () => {
    const a = await startServerProcess(env);
    servers.push(a);
    const c = await a.as('abstractor');
    const [site] = await db.query(`SELECT id FROM sites WHERE code = 'HBR'`);
    const rows = Array.from({ length: ROWS }, (_, i) => [`K${i}`, MARK_DATE, 20 + (i % 70), i % 2 ? 'female' : 'male', 66.6]);
    const file = await workbook({ Cases: [['Case key (this file only)', 'Surgery date', 'Age', 'Sex', 'Weight'], ...rows] });
    const up = await upload(c, file, 'crash.xlsx', { siteId: site.id, decimal: 'point' });
    expect(up.status, JSON.stringify(up.body)).toBe(201);
    const mapping = Object.fromEntries(up.body.sheets.map((s: { kind: string; proposed: unknown }) => [s.kind, s.proposed]));
    expect((await c.post(`/api/imports/${up.body.id}/dry-run`, { mapping })).status).toBe(202);
    await waitFor('the dry run', async () => (await c.get(`/api/imports/${up.body.id}`)).body.status === 'validated');
    const before = await marked();
    const cm = await c.post(`/api/imports/${up.body.id}/commit`, { existing: 'skip' });
    expect(cm.status).toBe(202);
    const jobId = cm.body.commitJobId as string;
    // The server reports rows written from inside the open transaction (progress is its own statement).
    const written = await waitFor('rows written inside the transaction', async () => {
      const [j] = await db.query(`SELECT status, (progress->>'written')::int AS written FROM jobs WHERE id = $1`, [jobId]);
      return j?.status === 'running' && j.written > 0 && j.written < ROWS ? j.written : null;
    }, 60_000, 5);
    a.child.kill('SIGKILL');
    await new Promise((r) => a.child.once('exit', r));
    expect(written).toBeGreaterThan(0);
    expect(await marked()).toBe(before);
    const [orphan] = await db.query(`SELECT status FROM jobs WHERE id = $1`, [jobId]);
    expect(orphan.status).toBe('running');

    const b = await startServerProcess(env);
    servers.push(b);
    const [failed] = await db.query(`SELECT status, error FROM jobs WHERE id = $1`, [jobId]);
    expect(failed.status).toBe('failed');
    expect(failed.error).toMatch(/retry/);
    const c2 = await b.as('abstractor');
    expect((await c2.get(`/api/imports/${up.body.id}`)).body.status).toBe('failed');
    expect(await marked()).toBe(before);
    const retry = await c2.post(`/api/jobs/${jobId}/retry`);
    expect(retry.status).toBe(200);
    await waitFor('the retried commit', async () => (await c2.get(`/api/imports/${up.body.id}`)).body.status === 'committed', 90_000, 200);
    expect(await marked()).toBe(before + ROWS);
  }, 240_000);
});
