/**
 * Surgical cases: create, update, read, status moves and the audit trail. Plain objects in and
 * out (no req/res); every write goes through `writeCase` (server/registry/case-write.ts).
 */
import type { DataSource, EntityManager } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import { CASE_FIELD_NAMES, type CaseCreate, type CaseFieldName, type CaseFields, type CaseUpdate } from '../../shared/registry/case.js';
import { caseCompleteness } from '../../shared/registry/completeness.js';
import type { Case, CaseAuditEntry } from '../../shared/registry/record.js';
import { findTransition, type StatusChange } from '../../shared/registry/status.js';
import { audit, type AuditInput } from '../audit/audit.service.js';
import { AppError, notFound } from '../http/errors.js';
import type { Config } from '../config.js';
import { identifierHash } from '../registry/identifier-hash.js';
import { CASE_COLUMNS } from '../registry/columns.js';
import { inScope, lockCase, versionConflict, writeCase, type Actor } from '../registry/case-write.js';
import { validationError } from '../registry/validation.js';
import { todayIn } from '../../shared/registry/derived.js';
import { loadCase, loadEpisodes, loadEvents, nextRegistryNumber, otherCasesOfPatient, storedValue, updateCaseColumns, type CaseRecord, type Db } from './case.repo.js';
import { caseWarnings, computeAriscat, serverContradictions } from './case.rules.js';
import { buildCaseView, verificationVerdict } from './case.view.js';

export interface Services { ds: DataSource; config: Config }

export const today = (config: Config) => todayIn(config.NETWORK_TIME_ZONE, new Date());

function contradictionsOrThrow(f: Partial<CaseFields>, config: Config): void {
  const c = serverContradictions(f, today(config));
  if (c.length) throw validationError(c, 'case form');
}

async function checkUnit(db: Db, siteId: string, unitId: string | null | undefined): Promise<void> {
  if (!unitId) return;
  const rows = await db.query(`SELECT 1 FROM units WHERE id = $1 AND site_id = $2`, [unitId, siteId]);
  if (!rows.length) throw validationError([{ path: 'unitId', message: 'is not a unit of this site; choose one of the site\u2019s units' }], 'case form');
}

/** Same patient (keyed hash) and same surgery date at the site: refuse unless acknowledged. */
async function duplicateCheck(db: Db, siteId: string, hash: string, surgeryDate: string, selfId: string | null, acknowledged: boolean | undefined): Promise<boolean> {
  const same = (await otherCasesOfPatient(db, siteId, hash, selfId)).filter((o) => o.surgeryDate === surgeryDate);
  if (!same.length) return false;
  if (!acknowledged) {
    throw new AppError(409, 'possible_duplicate', `this patient already has a case on ${surgeryDate} at this site (${same.map((o) => o.registryNumber).join(', ')})`, {
      hint: 'open that case instead; if this really is a second operation on the same day, send acknowledgeDuplicate: true',
      details: { registryNumbers: same.map((o) => o.registryNumber), caseIds: same.map((o) => o.id) },
      fields: [{ path: 'localIdentifier', message: 'matches a case with the same surgery date' }],
    });
  }
  return true;
}

const auditValue = (name: CaseFieldName, v: unknown) => (v == null ? null : name === 'preopHaemoglobin' ? `${storedValue(name, v)} g/dL` : v);

function columnValues(f: Partial<CaseFields>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const name of Object.keys(f) as CaseFieldName[]) {
    if (!(CASE_FIELD_NAMES as string[]).includes(name)) continue;
    out[CASE_COLUMNS[name].column] = storedValue(name, f[name]);
  }
  return out;
}

const dbView = (services: Services, user: SessionUser) => (db: EntityManager | DataSource, rec: CaseRecord) => buildCaseView(db, rec, user, today(services.config));

export async function getCaseView(services: Services, id: string, user: SessionUser): Promise<Case> {
  const rec = await loadCase(services.ds, id);
  if (!rec || !inScope(user, rec.siteId)) throw notFound('the case');
  return dbView(services, user)(services.ds, rec);
}

/** GET /api/cases/:id: the case, and a "case-read" audit entry. */
export async function readCase(services: Services, id: string, actor: Actor): Promise<Case> {
  const view = await getCaseView(services, id, actor.user);
  await audit(services.ds, { action: 'case-read', actorId: actor.user.id, actorEmail: actor.user.email, ip: actor.ip, entity: 'case', entityId: id });
  return view;
}

export async function createCase(services: Services, input: CaseCreate, actor: Actor): Promise<Case> {
  const { ds, config } = services;
  const { siteId, localIdentifier, acknowledgeDuplicate, ...fields } = input;
  if (!inScope(actor.user, siteId)) {
    throw new AppError(403, 'not_your_site', 'you can only enter cases for the sites you are assigned to', { fields: [{ path: 'siteId', message: 'choose one of your sites' }], hint: 'ask an administrator to assign you to this site' });
  }
  const [site] = await ds.query(`SELECT id, code FROM sites WHERE id = $1 AND active`, [siteId]);
  if (!site) throw validationError([{ path: 'siteId', message: 'is not an active site' }], 'case form');
  contradictionsOrThrow(fields, config);
  await checkUnit(ds, siteId, fields.unitId);
  const hash = localIdentifier ? identifierHash(config.IDENTIFIER_HASH_SECRET, siteId, localIdentifier) : null;
  const id = await ds.transaction(async (tx) => {
    const duplicate = hash ? await duplicateCheck(tx, siteId, hash, fields.surgeryDate, null, acknowledgeDuplicate) : false;
    const year = Number(today(config).slice(0, 4));
    const { number, seq } = await nextRegistryNumber(tx, siteId, site.code, year);
    const ariscat = computeAriscat(fields);
    const cols: Record<string, unknown> = {
      ...columnValues(fields),
      registry_number: number, registry_year: year, registry_seq: seq, site_id: siteId, status: 'draft', created_via: 'form',
      ariscat_points: ariscat?.points ?? null, ariscat_class: ariscat?.riskClass ?? null,
      identifier_hash: hash, possible_duplicate: duplicate, warnings: JSON.stringify(caseWarnings(fields)), created_by: actor.user.id, updated_by: actor.user.id,
    };
    const names = Object.keys(cols);
    const [row] = await tx.query(`INSERT INTO surgical_cases (${names.map((n) => `"${n}"`).join(', ')}) VALUES (${names.map((_, i) => `$${i + 1}`).join(', ')}) RETURNING id`, names.map((n) => cols[n]));
    const base = { actorId: actor.user.id, actorEmail: actor.user.email, ip: actor.ip, entity: 'case', entityId: row.id as string };
    const entries: AuditInput[] = [{ ...base, action: 'case-created', field: 'registryNumber', newValue: number, details: { siteId } }];
    for (const name of CASE_FIELD_NAMES) if (fields[name as keyof typeof fields] != null) entries.push({ ...base, action: 'case-created', field: name, newValue: auditValue(name, fields[name as keyof typeof fields]) });
    if (ariscat) entries.push({ ...base, action: 'case-created', field: 'ariscat', newValue: `${ariscat.points} (${ariscat.riskClass})` });
    if (hash) entries.push({ ...base, action: 'case-created', field: 'localIdentifier', newValue: '(keyed hash recorded)' });
    if (duplicate) entries.push({ ...base, action: 'duplicate-acknowledged', field: 'localIdentifier', newValue: 'same patient and surgery date as an existing case' });
    await audit(tx, entries);
    return row.id as string;
  });
  return getCaseView(services, id, actor.user);
}

export async function updateCase(services: Services, id: string, input: CaseUpdate, actor: Actor): Promise<Case> {
  const { ds, config } = services;
  const { version, localIdentifier, acknowledgeDuplicate, amendmentReason, ...changes } = input;
  const { localIdentifier: _omit, ...yours } = input;
  await writeCase(ds, { caseId: id, actor, expectedVersion: version, amendmentReason, yours, currentView: dbView(services, actor.user) }, async (tx, current) => {
    const merged: Partial<CaseFields> = { ...current.fields, ...changes };
    contradictionsOrThrow(merged, config);
    if ('unitId' in changes) await checkUnit(tx, current.siteId, changes.unitId);
    const entries: CaseChangeEntry[] = [];
    const cols: Record<string, unknown> = {};
    for (const name of Object.keys(changes) as CaseFieldName[]) {
      const before = storedValue(name, current.fields[name]);
      const after = storedValue(name, changes[name]);
      if (JSON.stringify(before) === JSON.stringify(after)) continue;
      cols[CASE_COLUMNS[name].column] = after;
      entries.push({ action: 'case-changed', field: name, oldValue: auditValue(name, current.fields[name]), newValue: auditValue(name, changes[name]) });
    }
    let hash = current.identifierHash;
    if (localIdentifier !== undefined) {
      const next = localIdentifier === null ? null : identifierHash(config.IDENTIFIER_HASH_SECRET, current.siteId, localIdentifier);
      if (next !== hash) {
        cols.identifier_hash = next;
        entries.push({ action: 'case-changed', field: 'localIdentifier', oldValue: hash ? '(keyed hash recorded)' : null, newValue: next ? '(keyed hash recorded)' : null });
        hash = next;
      }
    }
    if (hash && (cols.identifier_hash !== undefined || cols.surgery_date !== undefined)) {
      const dup = await duplicateCheck(tx, current.siteId, hash, merged.surgeryDate as string, current.id, acknowledgeDuplicate);
      if (dup !== current.possibleDuplicate) cols.possible_duplicate = dup;
    } else if (!hash && current.possibleDuplicate) cols.possible_duplicate = false;
    const ariscat = computeAriscat(merged);
    const oldA = current.ariscatPoints != null ? `${current.ariscatPoints} (${current.ariscatClass})` : null;
    const newA = ariscat ? `${ariscat.points} (${ariscat.riskClass})` : null;
    if (oldA !== newA) {
      cols.ariscat_points = ariscat?.points ?? null;
      cols.ariscat_class = ariscat?.riskClass ?? null;
      entries.push({ action: 'case-changed', field: 'ariscat', oldValue: oldA, newValue: newA });
    }
    if (entries.length) {
      cols.warnings = JSON.stringify(caseWarnings(merged));
      await updateCaseColumns(tx, current.id, cols);
    }
    return { audit: entries };
  });
  return getCaseView(services, id, actor.user);
}
type CaseChangeEntry = { action: string; field: string; oldValue: unknown; newValue: unknown };

/** POST /api/cases/:id/status: one move of the workflow, with its rules. */
export async function changeStatus(services: Services, id: string, input: StatusChange, actor: Actor): Promise<Case> {
  const { ds } = services;
  await ds.transaction(async (tx) => {
    const current = await lockCase(tx, id, actor.user);
    const t = findTransition(current.status, input.to);
    if (!t) {
      throw new AppError(409, 'transition_not_allowed', `a ${current.status} case cannot be moved to ${input.to}`, {
        hint: current.status === 'draft' && input.to === 'verified' ? 'mark it complete first' : 'reload the case to see its current status',
        details: { status: current.status },
      });
    }
    if (!actor.user.roles.some((r) => t.roles.includes(r))) throw new AppError(403, 'forbidden', `your role cannot ${t.label.toLowerCase()} a case`, { hint: `this needs one of: ${t.roles.join(', ')}` });
    if (current.version !== input.version) throw await versionConflict(tx, current, { expectedVersion: input.version, yours: input, currentView: dbView(services, actor.user) });
    if (t.needsReason && !input.reason) throw validationError([{ path: 'reason', message: `give the reason (${t.label.toLowerCase()})` }], 'status change');
    if (t.needsComplete) {
      const c = caseCompleteness(current.fields, (await loadEpisodes(tx, id)).map((e) => ({ id: e.id, ...e.fields })), await loadEvents(tx, id) as unknown as Record<string, unknown>[]);
      if (!c.complete) {
        throw new AppError(400, 'case_incomplete', `case ${current.registryNumber} is missing ${c.missing.length} required item${c.missing.length === 1 ? '' : 's'}`, {
          hint: 'fill in the fields listed, then try again',
          fields: c.missing.map((m) => ({ path: m.field, message: m.message })),
        });
      }
    }
    if (input.to === 'verified') {
      const v = verificationVerdict(current, actor.user);
      if (!v.allowed) throw new AppError(403, 'verification_not_allowed', v.reason ?? 'you cannot verify this case', { hint: 'verification is by a second person' });
    }
    const uid = actor.user.id;
    const sets: Record<string, string> = {
      complete: `completed_at = now()`,
      draft: current.status === 'withdrawn' ? `withdrawn_at = NULL, withdrawn_by = NULL, withdrawn_reason = NULL` : `completed_at = NULL`,
      verified: `verified_by = $2, verified_at = now(), editors_since_verification = '{}'`,
      locked: `locked_by = $2, locked_at = now()`,
      withdrawn: `withdrawn_by = $2, withdrawn_at = now(), withdrawn_reason = $4::text`,
    };
    const params: unknown[] = [id, uid, input.to];
    if (input.to === 'withdrawn') params.push(input.reason);
    await tx.query(`UPDATE surgical_cases SET status = $3, version = version + 1, updated_at = now(), ${sets[input.to]}, updated_by = $2 WHERE id = $1`, params);
    await audit(tx, { action: 'status-changed', actorId: uid, actorEmail: actor.user.email, ip: actor.ip, entity: 'case', entityId: id, field: 'status', oldValue: current.status, newValue: input.to, reason: input.reason ?? null });
  });
  return getCaseView(services, id, actor.user);
}

/** Locks the verified cases of a site and month (for month close); returns how many. */
export async function lockVerifiedCases(tx: EntityManager, siteId: string, month: string, actor: Actor): Promise<number> {
  const rows: { id: string }[] = await tx.query(
    `UPDATE surgical_cases SET status = 'locked', version = version + 1, locked_by = $3, locked_at = now(), updated_at = now()
      WHERE site_id = $1 AND status = 'verified' AND to_char(surgery_date, 'YYYY-MM') = $2 RETURNING id`,
    [siteId, month, actor.user.id],
  );
  await audit(tx, rows.map((r) => ({ action: 'status-changed', actorId: actor.user.id, actorEmail: actor.user.email, ip: actor.ip, entity: 'case', entityId: r.id, field: 'status', oldValue: 'verified', newValue: 'locked', reason: `month ${month} closed` })));
  return rows.length;
}

export async function caseAudit(services: Services, id: string, user: SessionUser, q: { includeReads: boolean; page: number; pageSize: number }): Promise<{ items: CaseAuditEntry[]; total: number; page: number; pageSize: number }> {
  const rec = await loadCase(services.ds, id);
  if (!rec || !inScope(user, rec.siteId)) throw notFound('the case');
  const filter = `entity = 'case' AND entity_id = $1 ${q.includeReads ? '' : `AND action <> 'case-read'`}`;
  const [{ n }] = await services.ds.query(`SELECT count(*)::int AS n FROM audit_entries WHERE ${filter}`, [id]);
  const rows = await services.ds.query(
    `SELECT id::text, at, actor_email, action, field, old_value, new_value, reason FROM audit_entries WHERE ${filter} ORDER BY at, id LIMIT $2 OFFSET $3`,
    [id, q.pageSize, (q.page - 1) * q.pageSize],
  );
  return {
    items: rows.map((r: Record<string, any>) => ({ id: r.id, at: new Date(r.at).toISOString(), actorEmail: r.actor_email, action: r.action, field: r.field, oldValue: r.old_value, newValue: r.new_value, reason: r.reason })),
    total: n, page: q.page, pageSize: q.pageSize,
  };
}

