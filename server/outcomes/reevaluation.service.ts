/**
 * Re-applying a definition to earlier events: the reviewed list of differences (GET) between
 * each stored result and the result under the current version, and applying the reviewed
 * ones (POST, with a reason). Applying raises each case's version and is audited; it does not
 * send a verified case back to complete, because the abstracted data did not change.
 */
import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/user.js';
import type { Observation } from '../../shared/clinical/observations.js';
import type { PpcEventType } from '../../shared/clinical/codes.js';
import type { DefinitionEvaluation, DefinitionId } from '../../shared/registry/outcome.js';
import { audit } from '../audit/audit.service.js';
import { caseSiteScope } from '../http/scope.js';
import { AppError } from '../http/errors.js';
import { loadCase, loadEvents, type CaseRecord, type EventRecord } from '../cases/case.repo.js';
import type { Actor } from '../registry/case-write.js';
import { CURRENT_DEFINITION_VERSIONS } from './evaluate.js';
import { evaluateInCase } from './outcomes.service.js';

type Summary = Record<string, string>;

/** The comparable parts of a result: overall, and each criterion (or component, or MGS day count). */
export function summarise(e: DefinitionEvaluation | undefined): Summary {
  if (!e) return { result: 'not evaluated' };
  if (e.error) return { result: 'not evaluated', error: e.error };
  const out: Summary = { version: e.version, result: e.met ? 'met' : 'not met' };
  const r = e.result as Record<string, any> | null;
  if (!r) return out;
  if (Array.isArray(r.criteria)) for (const c of r.criteria) out[`criterion ${c.id}`] = c.status;
  if (Array.isArray(r.components)) for (const c of r.components) out[`component ${c.component}`] = c.met ? 'met' : 'not met';
  if (typeof r.maxCriteriaMet === 'number') out['most criteria on one day'] = String(r.maxCriteriaMet);
  if ('dateOfEvent' in r) out['date of event'] = r.dateOfEvent ?? '—';
  return out;
}

function differences(a: Summary, b: Summary): { item: string; stored: string | null; current: string | null }[] {
  const keys = [...new Set([...Object.keys(a), ...Object.keys(b)])];
  return keys.filter((k) => a[k] !== b[k]).map((k) => ({ item: k, stored: a[k] ?? null, current: b[k] ?? null }));
}

function fresh(definition: DefinitionId, ev: EventRecord, kase: CaseRecord, events: EventRecord[]): DefinitionEvaluation | undefined {
  const others = events.filter((o) => o.id !== ev.id);
  try {
    return evaluateInCase(ev.type as PpcEventType, ev.observations as Observation[], kase, others).evaluations.find((e) => e.definition === definition);
  } catch (e) {
    return { definition, ...CURRENT_DEFINITION_VERSIONS[definition], met: false, result: null, error: `not evaluated: ${(e as Error).message}`, evaluatedAt: new Date().toISOString() };
  }
}

async function candidates(ds: DataSource, user: SessionUser, definition: DefinitionId, siteId?: string, eventIds?: string[]) {
  const scope = caseSiteScope(user);
  const params: unknown[] = [];
  const w = [`o.removed_at IS NULL`, `c.status <> 'withdrawn'`];
  if (definition === 'nhsn-pnu1') w.push(`o.type = 'respiratory-infection'`);
  if (scope) { params.push(scope); w.push(`c.site_id = ANY($${params.length}::uuid[])`); }
  if (siteId) { params.push(siteId); w.push(`c.site_id = $${params.length}`); }
  if (eventIds) { params.push(eventIds); w.push(`o.id = ANY($${params.length}::uuid[])`); }
  return (await ds.query(`SELECT o.id, o.case_id FROM outcome_events o JOIN surgical_cases c ON c.id = o.case_id WHERE ${w.join(' AND ')} ORDER BY c.surgery_date, o.id`, params)) as { id: string; case_id: string }[];
}

export async function listDifferences(ds: DataSource, user: SessionUser, q: { definition: DefinitionId; siteId?: string; page: number; pageSize: number }) {
  const rows = await candidates(ds, user, q.definition, q.siteId);
  const byCase = new Map<string, string[]>();
  for (const r of rows) byCase.set(r.case_id, [...(byCase.get(r.case_id) ?? []), r.id]);
  const items = [];
  for (const [caseId, ids] of byCase) {
    const kase = (await loadCase(ds, caseId))!;
    const events = await loadEvents(ds, caseId);
    for (const ev of events.filter((e) => ids.includes(e.id))) {
      const stored = (ev.evaluations as DefinitionEvaluation[]).find((e) => e.definition === q.definition);
      const now = fresh(q.definition, ev, kase, events);
      const diff = differences(summarise(stored), summarise(now));
      if (diff.length) items.push({ eventId: ev.id, caseId, registryNumber: kase.registryNumber, caseStatus: kase.status, type: ev.type, storedVersion: stored?.version ?? null, currentVersion: now?.version ?? null, storedMet: stored?.met ?? null, currentMet: now?.met ?? null, differences: diff });
    }
  }
  const start = (q.page - 1) * q.pageSize;
  return { definition: q.definition, currentVersion: CURRENT_DEFINITION_VERSIONS[q.definition].version, scanned: rows.length, items: items.slice(start, start + q.pageSize), total: items.length, page: q.page, pageSize: q.pageSize };
}

export async function applyDefinition(ds: DataSource, actor: Actor, body: { definition: DefinitionId; eventIds: string[]; reason: string }) {
  const rows = await candidates(ds, actor.user, body.definition, undefined, body.eventIds);
  const found = new Set(rows.map((r) => r.id));
  const unknown = body.eventIds.filter((id) => !found.has(id));
  if (unknown.length) {
    throw new AppError(404, 'not_found', `${unknown.length} of the chosen events were not found (or are not of your sites, or the definition does not apply to them)`, { details: { eventIds: unknown }, hint: 'reload the list of differences and choose again' });
  }
  let changed = 0;
  await ds.transaction(async (tx) => {
    const caseIds = [...new Set(rows.map((r) => r.case_id))].sort();
    for (const caseId of caseIds) {
      const kase = (await loadCase(tx, caseId, true))!;
      const events = await loadEvents(tx, caseId);
      let caseChanged = false;
      for (const ev of events.filter((e) => found.has(e.id))) {
        const now = fresh(body.definition, ev, kase, events);
        const list = (ev.evaluations as DefinitionEvaluation[]).filter((e) => e.definition !== body.definition);
        const stored = (ev.evaluations as DefinitionEvaluation[]).find((e) => e.definition === body.definition);
        if (!now || !differences(summarise(stored), summarise(now)).length) continue;
        const next = [...list, now];
        const primary = ev.definition === body.definition;
        await tx.query(
          `UPDATE outcome_events SET evaluations = $2, definition_version = CASE WHEN $3 THEN $4 ELSE definition_version END,
                  pneumonia_nhsn_met = CASE WHEN $5 THEN $6 ELSE pneumonia_nhsn_met END, updated_at = now() WHERE id = $1`,
          [ev.id, JSON.stringify(next), primary, now.version, body.definition === 'nhsn-pnu1', now.met && !now.error],
        );
        await audit(tx, {
          action: 'definition-reapplied', actorId: actor.user.id, actorEmail: actor.user.email, ip: actor.ip, entity: 'case', entityId: caseId,
          field: `outcomes.${ev.id}.evaluations.${body.definition}`, oldValue: summarise(stored), newValue: summarise(now), reason: body.reason, details: { eventId: ev.id },
        });
        caseChanged = true;
        changed++;
      }
      if (caseChanged) await tx.query(`UPDATE surgical_cases SET version = version + 1, updated_at = now() WHERE id = $1`, [caseId]);
    }
  });
  return { applied: changed, unchanged: body.eventIds.length - changed };
}
