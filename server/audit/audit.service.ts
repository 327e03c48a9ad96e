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

/**
 * Appends entries to the audit table (inside the caller's transaction when one is given). One
 * array parameter per column (INSERT ... SELECT FROM unnest): the statement text is the same for
 * one entry or 5,000, so a bulk import's audit trail costs no parsing of long VALUES lists.
 */
export async function audit(db: DataSource | EntityManager, entries: AuditInput | AuditInput[]): Promise<void> {
  const list = Array.isArray(entries) ? entries : [entries];
  if (!list.length) return;
  const columns: unknown[][] = [[], [], [], [], [], [], [], [], [], [], []];
  for (const e of list) {
    const row = [e.actorId ?? null, e.actorEmail ?? null, e.action, e.entity ?? null, e.entityId ?? null, e.field ?? null, text(e.oldValue), text(e.newValue), e.reason ?? null, e.ip ?? null, e.details ? JSON.stringify(e.details) : null];
    row.forEach((v, i) => columns[i].push(v));
  }
  await db.query(
    `INSERT INTO audit_entries (actor_id, actor_email, action, entity, entity_id, field, old_value, new_value, reason, ip, details)
     SELECT * FROM unnest($1::uuid[], $2::text[], $3::text[], $4::text[], $5::text[], $6::text[], $7::text[], $8::text[], $9::text[], $10::text[], $11::jsonb[])`,
    columns,
  );
}

/** The actor fields of an audit entry for the signed-in user of a request. */
export function actor(req: Request): Pick<AuditInput, 'actorId' | 'actorEmail' | 'ip'> {
  const u = req.user as SessionUser | undefined;
  return { actorId: u?.id ?? null, actorEmail: u?.email ?? null, ip: req.ip ?? null };
}
