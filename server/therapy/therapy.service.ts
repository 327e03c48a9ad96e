/** Therapy episodes of a case: add, change, remove (never deleted). Each raises the case version. */
import type { EntityManager } from 'typeorm';
import type { Case } from '../../shared/registry/record.js';
import type { RecordRemove, TherapyEpisodeCreate, TherapyEpisodeFields, TherapyEpisodeUpdate, TherapyFieldName } from '../../shared/registry/therapy.js';
import { THERAPY_COLUMNS } from '../registry/columns.js';
import { writeCase, type Actor } from '../registry/case-write.js';
import { therapyCheckSettings } from '../registry/settings.js';
import { validationError } from '../registry/validation.js';
import { notFound } from '../http/errors.js';
import { loadEpisode, type CaseRecord } from '../cases/case.repo.js';
import { buildCaseView } from '../cases/case.view.js';
import { getCaseView, today, type Services } from '../cases/case.service.js';
import { checkEpisode } from './therapy.rules.js';

const view = (services: Services, actor: Actor) => (db: EntityManager, rec: CaseRecord) => buildCaseView(db, rec, actor.user, today(services.config));

async function checked(tx: EntityManager, fields: TherapyEpisodeFields, current: CaseRecord) {
  const r = checkEpisode(fields, current.fields, await therapyCheckSettings(tx));
  if (r.errors.length) throw validationError(r.errors, 'therapy episode');
  return r;
}

const dbValue = (name: TherapyFieldName, v: unknown) => (v === undefined ? null : v);

export async function addEpisode(services: Services, caseId: string, input: TherapyEpisodeCreate, actor: Actor): Promise<Case> {
  const { caseVersion, amendmentReason, ...fields } = input;
  await writeCase(services.ds, { caseId, actor, expectedVersion: caseVersion, amendmentReason, yours: input, currentView: view(services, actor) }, async (tx, current) => {
    const r = await checked(tx, fields, current);
    const names = Object.keys(THERAPY_COLUMNS) as TherapyFieldName[];
    const cols = names.map((n) => THERAPY_COLUMNS[n].column);
    const [row] = await tx.query(
      `INSERT INTO therapy_episodes (case_id, created_by, warnings, ${cols.map((c) => `"${c}"`).join(', ')}) VALUES ($1, $2, $3, ${cols.map((_, i) => `$${i + 4}`).join(', ')}) RETURNING id`,
      [current.id, actor.user.id, JSON.stringify(r.warnings), ...names.map((n) => dbValue(n, r.fields[n]))],
    );
    const audit = names.filter((n) => r.fields[n] != null).map((n) => ({ action: 'therapy-added', field: `therapy.${row.id}.${n}`, newValue: r.fields[n], details: { episodeId: row.id } }));
    return { audit };
  });
  return getCaseView(services, caseId, actor.user);
}

export async function updateEpisode(services: Services, caseId: string, episodeId: string, input: TherapyEpisodeUpdate, actor: Actor): Promise<Case> {
  const { caseVersion, amendmentReason, ...changes } = input;
  await writeCase(services.ds, { caseId, actor, expectedVersion: caseVersion, amendmentReason, yours: input, currentView: view(services, actor) }, async (tx, current) => {
    const existing = await loadEpisode(tx, current.id, episodeId);
    if (!existing) throw notFound('the therapy episode');
    const merged = { ...(existing.fields as unknown as TherapyEpisodeFields), ...changes } as TherapyEpisodeFields;
    const r = await checked(tx, merged, current);
    const audit = [];
    const sets: string[] = [];
    const params: unknown[] = [episodeId];
    for (const n of Object.keys(THERAPY_COLUMNS) as TherapyFieldName[]) {
      const before = existing.fields[n] ?? null;
      const after = r.fields[n] ?? null;
      if (JSON.stringify(before) === JSON.stringify(after)) continue;
      params.push(after);
      sets.push(`"${THERAPY_COLUMNS[n].column}" = $${params.length}`);
      audit.push({ action: 'therapy-changed', field: `therapy.${episodeId}.${n}`, oldValue: before, newValue: after, details: { episodeId } });
    }
    if (audit.length) {
      params.push(JSON.stringify(r.warnings));
      await tx.query(`UPDATE therapy_episodes SET ${sets.join(', ')}, warnings = $${params.length}, updated_at = now() WHERE id = $1`, params);
    }
    return { audit };
  });
  return getCaseView(services, caseId, actor.user);
}

export async function removeEpisode(services: Services, caseId: string, episodeId: string, input: RecordRemove, actor: Actor): Promise<Case> {
  await writeCase(services.ds, { caseId, actor, expectedVersion: input.caseVersion, amendmentReason: input.reason, yours: input, currentView: view(services, actor) }, async (tx, current) => {
    const existing = await loadEpisode(tx, current.id, episodeId);
    if (!existing) throw notFound('the therapy episode');
    await tx.query(`UPDATE therapy_episodes SET removed_at = now(), removed_by = $2, removed_reason = $3 WHERE id = $1`, [episodeId, actor.user.id, input.reason]);
    return { audit: [{ action: 'therapy-removed', field: `therapy.${episodeId}`, oldValue: existing.fields.modality, newValue: null, details: { episodeId, reason: input.reason } }] };
  });
  return getCaseView(services, caseId, actor.user);
}
