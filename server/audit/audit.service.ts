import type { DataSource, EntityManager } from 'typeorm';
import type { Request } from 'express';
import type { SessionUser } from '../../shared/auth/user.js';

export interface AuditInput {
  action: string;
  actorId?: string | null;
  actorEmail?: string | null;
  entity?: string | null;
  entityId?: string | null;
  field?: string | null;
  oldValue?: unknown;
  newValue?: unknown;
  reason?: string | null;
  ip?: string | null;
  details?: Record<string, unknown> | null;
}

const text = (v: unknown): string | null => (v === undefined || v === null ? null : typeof v === 'string' ? v : JSON.stringify(v));

/** Appends entries to the audit table (inside the caller's transaction when one is given). */
export async function audit(db: DataSource | EntityManager, entries: AuditInput | AuditInput[]): Promise<void> {
  const list = Array.isArray(entries) ? entries : [entries];
  if (!list.length) return;
  const values: unknown[] = [];
  const rows = list.map((e, i) => {
    values.push(e.actorId ?? null, e.actorEmail ?? null, e.action, e.entity ?? null, e.entityId ?? null, e.field ?? null, text(e.oldValue), text(e.newValue), e.reason ?? null, e.ip ?? null, e.details ? JSON.stringify(e.details) : null);
    const b = i * 11;
    return `($${b + 1}, $${b + 2}, $${b + 3}, $${b + 4}, $${b + 5}, $${b + 6}, $${b + 7}, $${b + 8}, $${b + 9}, $${b + 10}, $${b + 11})`;
  });
  await db.query(
    `INSERT INTO audit_entries (actor_id, actor_email, action, entity, entity_id, field, old_value, new_value, reason, ip, details) VALUES ${rows.join(', ')}`,
    values,
  );
}

/** The actor fields of an audit entry for the signed-in user of a request. */
export function actor(req: Request): Pick<AuditInput, 'actorId' | 'actorEmail' | 'ip'> {
  const u = req.user as SessionUser | undefined;
  return { actorId: u?.id ?? null, actorEmail: u?.email ?? null, ip: req.ip ?? null };
}
