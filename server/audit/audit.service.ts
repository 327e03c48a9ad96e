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
 * The INSERT of audit entries with its parameters numbered from `firstParam`: one array
 * parameter per column (INSERT ... SELECT FROM unnest), so the statement text is the same for
 * one entry or 5,000 (a bulk import's audit trail costs no parsing of long VALUES lists), and a
 * caller can run it inside a larger statement (a data-modifying CTE, one round trip).
 */
export function auditStatement(entries: AuditInput[], firstParam = 1): { sql: string; params: unknown[][] } {
  const columns: unknown[][] = [[], [], [], [], [], [], [], [], [], [], []];
  for (const e of entries) {
    const row = [e.actorId ?? null, e.actorEmail ?? null, e.action, e.entity ?? null, e.entityId ?? null, e.field ?? null, text(e.oldValue), text(e.newValue), e.reason ?? null, e.ip ?? null, e.details ? JSON.stringify(e.details) : null];
    row.forEach((v, i) => columns[i].push(v));
  }
  const types = ['uuid', 'text', 'text', 'text', 'text', 'text', 'text', 'text', 'text', 'text', 'jsonb'];
  const arrays = types.map((t, i) => `$${firstParam + i}::${t}[]`).join(', ');
  return {
    sql: `INSERT INTO audit_entries (actor_id, actor_email, action, entity, entity_id, field, old_value, new_value, reason, ip, details) SELECT * FROM unnest(${arrays})`,
    params: columns,
  };
}

/** Appends entries to the audit table (inside the caller's transaction when one is given). */
export async function audit(db: DataSource | EntityManager, entries: AuditInput | AuditInput[]): Promise<void> {
  const list = Array.isArray(entries) ? entries : [entries];
  if (!list.length) return;
  const { sql, params } = auditStatement(list);
  await db.query(sql, params);
}

/** The actor fields of an audit entry for the signed-in user of a request. */
export function actor(req: Request): Pick<AuditInput, 'actorId' | 'actorEmail' | 'ip'> {
  const u = req.user as SessionUser | undefined;
  return { actorId: u?.id ?? null, actorEmail: u?.email ?? null, ip: req.ip ?? null };
}
