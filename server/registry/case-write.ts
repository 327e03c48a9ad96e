/**
 * The one path by which a case, its therapy episodes or its outcome events change: lock the
 * case row, check site scope, status and version (optimistic concurrency), apply the change,
 * raise the version, send a verified case back to complete, remember the editor (who may then
 * not verify it) and write the audit trail, all in one transaction: a refused change writes nothing.
 */
import type { EntityManager, DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import { audit, type AuditInput } from '../audit/audit.service.js';
import { AppError, conflict, notFound } from '../http/errors.js';
import { caseSiteScope } from '../http/scope.js';
import { loadCase, type CaseRecord } from '../cases/case.repo.js';

export interface Actor { user: SessionUser; ip: string | null }

export interface CaseChange<T> {
  /** One entry per changed field (without actor, entity or reason: added here). Empty = nothing changed. */
  audit: Omit<AuditInput, 'actorId' | 'actorEmail' | 'ip' | 'entity' | 'entityId' | 'reason'>[];
  result?: T;
}

export interface WriteOptions {
  caseId: string;
  actor: Actor;
  expectedVersion: number;
  amendmentReason?: string;
  /** What the caller sent, shown beside the current case in a 409 (never the local identifier). */
  yours: unknown;
  /** Builds the current case as the client sees it, for the 409 details. */
  currentView: (db: EntityManager, current: CaseRecord) => Promise<unknown>;
}

export function inScope(user: SessionUser, siteId: string): boolean {
  const scope = caseSiteScope(user);
  return !scope || scope.includes(siteId);
}

/** Loads the case for a write, or answers 404 (unknown or another site's case). */
export async function lockCase(tx: EntityManager, caseId: string, user: SessionUser): Promise<CaseRecord> {
  const current = await loadCase(tx, caseId, true);
  if (!current || !inScope(user, current.siteId)) throw notFound('the case');
  return current;
}

export async function versionConflict(tx: EntityManager, current: CaseRecord, opts: Pick<WriteOptions, 'expectedVersion' | 'yours' | 'currentView'>): Promise<AppError> {
  return conflict(
    `someone else saved this case since you opened it (you have version ${opts.expectedVersion}, the saved case is version ${current.version})`,
    { yourVersion: opts.expectedVersion, currentVersion: current.version, current: await opts.currentView(tx, current), yours: opts.yours },
    'compare your changes with the saved case below, then apply yours to the saved version and save again; nothing of yours was lost or saved',
  );
}

export async function writeCase<T>(ds: DataSource, opts: WriteOptions, change: (tx: EntityManager, current: CaseRecord) => Promise<CaseChange<T>>): Promise<{ changed: boolean; result?: T }> {
  return ds.transaction(async (tx) => {
    const current = await lockCase(tx, opts.caseId, opts.actor.user);
    if (current.status === 'withdrawn') {
      throw new AppError(409, 'case_withdrawn', `case ${current.registryNumber} is withdrawn and cannot be changed`, { hint: 'an administrator can reinstate it first' });
    }
    if (current.version !== opts.expectedVersion) throw await versionConflict(tx, current, opts);
    const locked = current.status === 'locked';
    if (locked && !opts.amendmentReason) {
      throw new AppError(400, 'amendment_reason_required', `case ${current.registryNumber} is locked (its month is closed): a change is an amendment and needs a reason`, {
        hint: 'give the reason for the amendment in amendmentReason',
        fields: [{ path: 'amendmentReason', message: 'give the reason for amending a locked case' }],
      });
    }
    const r = await change(tx, current);
    if (!r.audit.length) return { changed: false, result: r.result };
    const uid = opts.actor.user.id;
    await tx.query(
      `UPDATE surgical_cases SET version = version + 1, updated_at = now(), updated_by = $2,
              editors_since_verification = CASE WHEN $2 = ANY(editors_since_verification) THEN editors_since_verification ELSE array_append(editors_since_verification, $2) END,
              status = CASE WHEN status = 'verified' THEN 'complete' ELSE status END,
              verified_by = CASE WHEN status = 'verified' THEN NULL ELSE verified_by END,
              verified_at = CASE WHEN status = 'verified' THEN NULL ELSE verified_at END
        WHERE id = $1`,
      [current.id, uid],
    );
    const base = { actorId: uid, actorEmail: opts.actor.user.email, ip: opts.actor.ip, entity: 'case', entityId: current.id, reason: opts.amendmentReason ?? null };
    const entries: AuditInput[] = r.audit.map((e) => ({ ...base, ...e, action: locked ? 'case-amended' : e.action }));
    if (current.status === 'verified') {
      entries.push({ ...base, action: 'status-changed', field: 'status', oldValue: 'verified', newValue: 'complete', reason: 'changed after verification: needs verifying again' });
    }
    await audit(tx, entries);
    return { changed: true, result: r.result };
  });
}
