/** Expired export files are deleted on a schedule; each deletion is audited (the request row stays). */
import { readdir, rm, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { audit } from '../audit/audit.service.js';
import type { AppContext } from '../context.js';
import { logger } from '../logger.js';
import { registerSchedule } from '../jobs/registry.js';
import { exportDir } from './generate.js';

/** Deletes every export file past its expiry; returns how many were deleted. */
export async function deleteExpiredExports(context: AppContext, now = new Date()): Promise<number> {
  const { ds } = context;
  const due: { id: string; file_path: string | null; expires_at: Date }[] = await ds.query(
    `SELECT id, file_path, expires_at FROM export_requests WHERE status = 'ready' AND expires_at <= $1 ORDER BY expires_at`, [now],
  );
  let n = 0;
  for (const r of due) {
    try {
      if (r.file_path) await rm(r.file_path, { force: true });
    } catch (err) {
      logger.warn({ request: r.id, err: (err as Error).message }, 'export file could not be deleted; will retry');
      continue;
    }
    await ds.transaction(async (tx) => {
      const res = await tx.query(`UPDATE export_requests SET status = 'expired', deleted_at = now(), file_path = NULL WHERE id = $1 AND status = 'ready' RETURNING id`, [r.id]);
      const changed = Array.isArray(res[0]) ? res[0] : res;
      if (changed.length) await audit(tx, { action: 'export-expire', entity: 'export_request', entityId: r.id, details: { expiredAt: new Date(r.expires_at).toISOString(), fileDeleted: true } });
    });
    n += 1;
  }
  return n;
}

registerSchedule({ name: 'export-retention', everyMs: 10 * 60_000, run: async (context) => { await deleteExpiredExports(context); } });

/**
 * Deletes half-written export files (`<request id>.<ext>.part`) left by a generation that did
 * not finish (a crash, a killed server) once they are older than `minAgeMs` and their request
 * is no longer generating; returns how many were deleted. A retry writes a new one.
 */
export async function deleteAbandonedParts(context: AppContext, now = Date.now(), minAgeMs = 60 * 60_000): Promise<number> {
  const dir = exportDir(context);
  let names: string[];
  try {
    names = (await readdir(dir)).filter((n) => n.endsWith('.part'));
  } catch {
    return 0; // no export folder yet
  }
  let n = 0;
  for (const name of names) {
    const id = name.split('.')[0];
    const path = join(dir, name);
    const info = await stat(path).catch(() => null);
    if (!info || now - info.mtimeMs < minAgeMs) continue;
    const [row] = /^[0-9a-f-]{36}$/.test(id) ? await context.ds.query(`SELECT status FROM export_requests WHERE id = $1`, [id]) : [];
    if (row?.status === 'generating') continue;
    await rm(path, { force: true });
    await audit(context.ds, { action: 'export-part-deleted', entity: 'export_request', entityId: row ? id : null, details: { file: name, reason: 'half-written file of a generation that did not finish' } });
    n += 1;
  }
  return n;
}

registerSchedule({ name: 'export-abandoned-parts', everyMs: 30 * 60_000, run: async (context) => { await deleteAbandonedParts(context); } });
