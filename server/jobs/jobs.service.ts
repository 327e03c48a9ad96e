import type { DataSource } from 'typeorm';
import type { AppContext } from '../context.js';
import { logger } from '../logger.js';
import { JobCancelled, jobHandler, type JobRecord } from './registry.js';

export interface JobView {
  id: string; kind: string; status: string; progress: Record<string, number | string>;
  result: Record<string, unknown> | null; error: string | null; createdBy: string | null;
  createdAt: string; startedAt: string | null; finishedAt: string | null; attempts: number;
}

export function toJobView(r: Record<string, any>): JobView {
  const iso = (d: unknown) => (d ? new Date(d as string).toISOString() : null);
  return { id: r.id, kind: r.kind, status: r.status, progress: r.progress ?? {}, result: r.result, error: r.error, createdBy: r.created_by,
    createdAt: iso(r.created_at)!, startedAt: iso(r.started_at), finishedAt: iso(r.finished_at), attempts: r.attempts };
}

export async function enqueueJob(ds: DataSource, kind: string, payload: Record<string, unknown>, createdBy: string | null): Promise<string> {
  const [row] = await ds.query(`INSERT INTO jobs (kind, payload, created_by) VALUES ($1, $2, $3) RETURNING id`, [kind, JSON.stringify(payload), createdBy]);
  return row.id;
}

export async function getJob(ds: DataSource, id: string): Promise<JobView | null> {
  const [row] = await ds.query(`SELECT * FROM jobs WHERE id = $1`, [id]);
  return row ? toJobView(row) : null;
}

/**
 * Jobs left 'running' by a server that died are marked failed and retryable (called at start).
 */
export async function failOrphanedJobs(ds: DataSource): Promise<number> {
  const res = await ds.query(
    `UPDATE jobs SET status = 'failed', finished_at = now(), error = 'the server stopped while this job was running; nothing it wrote was kept — retry it' WHERE status = 'running'`,
  );
  return Array.isArray(res) ? Number(res[1] ?? 0) : 0;
}

/** Claims the oldest queued job (SKIP LOCKED, so several servers can share the queue). */
async function claim(ds: DataSource): Promise<Record<string, any> | null> {
  const res = await ds.query(
    `UPDATE jobs SET status = 'running', started_at = now(), heartbeat_at = now(), attempts = attempts + 1, error = NULL
      WHERE id = (SELECT id FROM jobs WHERE status = 'queued' ORDER BY created_at FOR UPDATE SKIP LOCKED LIMIT 1)
      RETURNING *`,
  );
  const rows = Array.isArray(res[0]) ? res[0] : res;
  return rows[0] ?? null;
}

/** Runs one job to its end; the handler does its own all-or-nothing transaction. */
export async function runOne(context: AppContext): Promise<boolean> {
  const { ds } = context;
  const row = await claim(ds);
  if (!row) return false;
  const job: JobRecord = { id: row.id, kind: row.kind, payload: row.payload, createdBy: row.created_by, attempts: row.attempts };
  const handler = jobHandler(job.kind);
  try {
    if (!handler) throw new Error(`no handler for job kind ${job.kind}`);
    const result = await handler(job, {
      progress: async (p) => { await ds.query(`UPDATE jobs SET progress = progress || $2::jsonb, heartbeat_at = now() WHERE id = $1`, [job.id, JSON.stringify(p)]); },
      isCancelled: async () => (await ds.query(`SELECT cancel_requested FROM jobs WHERE id = $1`, [job.id]))[0]?.cancel_requested === true,
    }, context);
    await ds.query(`UPDATE jobs SET status = 'succeeded', result = $2, finished_at = now() WHERE id = $1`, [job.id, JSON.stringify(result ?? {})]);
  } catch (err) {
    const cancelled = err instanceof JobCancelled;
    if (!cancelled) logger.warn({ job: job.id, kind: job.kind, err: (err as Error).message }, 'job failed');
    await ds.query(`UPDATE jobs SET status = $2, error = $3, finished_at = now() WHERE id = $1`, [job.id, cancelled ? 'cancelled' : 'failed', (err as Error).message.slice(0, 2000)]).catch(() => undefined);
  }
  return true;
}

export async function retryJob(ds: DataSource, id: string): Promise<boolean> {
  const res = await ds.query(`UPDATE jobs SET status = 'queued', cancel_requested = false, progress = '{}', error = NULL, finished_at = NULL WHERE id = $1 AND status IN ('failed', 'cancelled') RETURNING id`, [id]);
  return (Array.isArray(res[0]) ? res[0] : res).length > 0;
}

export async function requestCancel(ds: DataSource, id: string): Promise<void> {
  await ds.query(`UPDATE jobs SET cancel_requested = true, status = CASE WHEN status = 'queued' THEN 'cancelled' ELSE status END WHERE id = $1`, [id]);
}
