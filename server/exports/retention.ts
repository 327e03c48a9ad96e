/** Expired export files are deleted on a schedule; each deletion is audited (the request row stays). */
import { rm } from 'node:fs/promises';
import { audit } from '../audit/audit.service.js';
import type { AppContext } from '../context.js';
import { logger } from '../logger.js';
import { registerSchedule } from '../jobs/registry.js';

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
