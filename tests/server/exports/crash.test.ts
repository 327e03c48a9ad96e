/**
 * A server killed (SIGKILL) while it generates an approved export leaves no downloadable file;
 * at the next start the orphaned job is failed and retryable, and a retry produces the file.
 */
import { testDbEnv } from '../../setup/db-env.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createDataSource } from '../../../server/db/create-data-source.js';
import type { DataSource } from 'typeorm';
import { startServerProcess, waitFor, type ServerProcess } from '../imports/server-process.js';

let db: DataSource;
const servers: ServerProcess[] = [];
const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'alveolog-exports-crash-'));
const env = { DATA_DIR: dataDir, LOG_LEVEL: 'warn' };

beforeAll(async () => { db = await createDataSource(testDbEnv().DATABASE_URL, 2).initialize(); });
afterAll(async () => {
  for (const s of servers) await s.stop().catch(() => undefined);
  await db.destroy();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('crash safety of export generation', () => {
  it('when the server is killed while it writes an export, then no file is offered and a retry after restart makes it', async () => {
    const a = await startServerProcess(env);
    servers.push(a);
    const researcher = await a.as('researcher');
    const admin = await a.as('admin');
    const req = await researcher.post('/api/exports', {
      purpose: 'Crash-safety check of export generation on the whole fictional demo registry.',
      cohort: { from: '2021-01-01', to: '2026-12-31' }, fields: ['sex', 'ageBand', 'procedureCategory', 'surgeryPeriod'], format: 'xlsx',
    });
    expect(req.status, JSON.stringify(req.body)).toBe(201);
    const id = req.body.id as string;
    const ok = await admin.post(`/api/exports/${id}/decision`, { decision: 'approve', reason: 'Crash-safety test of generation.', acceptRisk: true });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    const [{ job_id: jobId }] = await db.query(`SELECT job_id FROM export_requests WHERE id = $1`, [id]);
    await waitFor('the export job running', async () => {
      const [j] = await db.query(`SELECT status FROM jobs WHERE id = $1`, [jobId]);
      return j?.status === 'running' ? true : j?.status === 'succeeded' ? 'too-late' : null;
    }, 60_000, 2);
    a.child.kill('SIGKILL');
    await new Promise((r) => a.child.once('exit', r));
    const [mid] = await db.query(`SELECT status, file_path FROM export_requests WHERE id = $1`, [id]);
    expect(mid.status).not.toBe('ready');
    expect(mid.file_path).toBeNull();
    const dir = path.join(dataDir, 'exports');
    const finals = fs.existsSync(dir) ? fs.readdirSync(dir).filter((f) => !f.endsWith('.part')) : [];
    expect(finals).toEqual([]);

    const b = await startServerProcess(env);
    servers.push(b);
    const [failed] = await db.query(`SELECT status, error FROM jobs WHERE id = $1`, [jobId]);
    expect(failed.status).toBe('failed');
    expect(failed.error).toMatch(/retry/);
    const admin2 = await b.as('admin');
    expect((await admin2.post(`/api/jobs/${jobId}/retry`)).status).toBe(200);
    await waitFor('the retried export', async () => (await db.query(`SELECT status FROM export_requests WHERE id = $1`, [id]))[0].status === 'ready', 90_000, 200);
    const researcher2 = await b.as('researcher');
    const file = await researcher2.get(`/api/exports/${id}/file`);
    expect(file.status).toBe(200);
  }, 240_000);
});
