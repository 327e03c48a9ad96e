/**
 * Re-abstraction: draw a reproducible random sample of verified cases, let the assigned second
 * abstractor enter the chosen fields blind, report agreement per field, adjudicate
 * disagreements (writing the adjudicated value through the registry's audited case update).
 */
import { randomInt } from 'node:crypto';
import type { DataSource } from 'typeorm';
import type { z } from 'zod';
import type { SessionUser } from '../../shared/auth/user.js';
import { CASE_FIELDS, type CaseUpdate } from '../../shared/registry/case.js';
import { fieldMeta, innerSchema } from '../../shared/registry/meta.js';
import {
  REABSTRACTION_FIELDS,
  fieldLabel,
  fieldUnit,
  type Adjudication,
  type AgreementReport,
  type BlindField,
  type BlindWork,
  type Disagreement,
  type ReabstractionField,
  type SampleDraw,
  type SampleSummary,
} from '../../shared/quality/reabstraction.js';
import type { ErrorField } from '../../shared/api/error.js';
import { audit } from '../audit/audit.service.js';
import type { Config } from '../config.js';
import { AppError, badRequest, notFound } from '../http/errors.js';
import { caseSiteScope } from '../http/scope.js';
import type { Actor } from '../registry/case-write.js';
import { validationError } from '../registry/validation.js';
import { loadCase, storedValue } from '../cases/case.repo.js';
import { updateCase } from '../cases/case.service.js';
import { fieldAgreement, sameValue, valueText } from './agreement.js';
import { sampleWithoutReplacement } from './prng.js';
import { ABSTRACTED_BY_SQL, ADJUDICATION_REASON_PREFIX, hasAbstracted, listSamples, loadAdjudications, loadItem, loadItems, loadSample, type SampleRecord } from './reabstraction.repo.js';

export interface Services { ds: DataSource; config: Config }

const ANALYSTS = ['admin', 'analyst'] as const;
const isAnalyst = (u: SessionUser) => u.roles.some((r) => (ANALYSTS as readonly string[]).includes(r));
const inScope = (u: SessionUser, siteIds: readonly string[]) => {
  const scope = caseSiteScope(u);
  return !scope || siteIds.every((s) => scope.includes(s));
};

/** Abstractors who could re-abstract cases of all the given sites. */
export async function candidateAbstractors(ds: DataSource, user: SessionUser, siteIds: readonly string[] | undefined): Promise<{ id: string; email: string; displayName: string }[]> {
  const ids = siteIds ?? caseSiteScope(user);
  return ds.query(
    `SELECT u.id, u.email, u.display_name AS "displayName" FROM users u
      WHERE u.active AND 'abstractor' = ANY(u.roles)
        AND ($1::uuid[] IS NULL OR NOT EXISTS (SELECT 1 FROM unnest($1::uuid[]) s(id) WHERE NOT EXISTS (SELECT 1 FROM user_sites us WHERE us.user_id = u.id AND us.site_id = s.id)))
      ORDER BY u.display_name`,
    [ids],
  );
}

/** Verified (or locked: verified, month closed) cases of the sites that the re-abstractor never abstracted. */
async function pool(ds: DataSource, input: SampleDraw): Promise<string[]> {
  const rows: { id: string }[] = await ds.query(
    `SELECT c.id FROM surgical_cases c
      WHERE c.site_id = ANY($1) AND c.status IN ('verified', 'locked')
        AND ($3::date IS NULL OR c.surgery_date >= $3) AND ($4::date IS NULL OR c.surgery_date <= $4)
        AND NOT ${ABSTRACTED_BY_SQL('c', '$2')}
      ORDER BY c.registry_number`,
    [input.siteIds, input.reabstractorId, input.surgeryFrom ?? null, input.surgeryTo ?? null],
  );
  return rows.map((r) => r.id);
}

function pickValues(fields: Record<string, unknown>, chosen: readonly ReabstractionField[]): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const f of chosen) out[f] = storedValue(f, fields[f]);
  return out;
}

export async function drawSample(ds: DataSource, input: SampleDraw, actor: Actor): Promise<SampleSummary> {
  if (!inScope(actor.user, input.siteIds)) throw badRequest('a chosen site is not one of your sites', 'choose among your sites', [{ path: 'siteIds', message: 'includes a site you are not assigned to' }]);
  const known = await ds.query(`SELECT id FROM sites WHERE id = ANY($1)`, [input.siteIds]);
  if (known.length !== new Set(input.siteIds).size) throw validationError([{ path: 'siteIds', message: 'includes a site that does not exist' }], 'sample');
  const candidates = await candidateAbstractors(ds, actor.user, input.siteIds);
  if (!candidates.some((c) => c.id === input.reabstractorId)) {
    throw validationError([{ path: 'reabstractorId', message: 'is not an active abstractor assigned to every chosen site' }], 'sample');
  }
  if (input.reabstractorId === actor.user.id) throw validationError([{ path: 'reabstractorId', message: 'choose someone other than yourself: you drew the sample' }], 'sample');
  const ids = await pool(ds, input);
  if (ids.length < 2) {
    throw new AppError(400, 'sample_pool_too_small', `only ${ids.length} verified case${ids.length === 1 ? '' : 's'} at these sites can be re-abstracted by this abstractor`, {
      hint: 'choose more sites, a wider date range, or another second abstractor (cases they entered or changed are left out)',
      fields: [{ path: 'size', message: 'the pool has fewer than 2 cases' }],
    });
  }
  const seed = input.seed ?? randomInt(0, 2 ** 32);
  const chosen = sampleWithoutReplacement(ids, input.size, seed);
  const sampleId = await ds.transaction(async (tx) => {
    const [s] = await tx.query(
      `INSERT INTO reabstraction_samples (seed, size, pool_size, site_ids, fields, reabstractor_id, surgery_from, surgery_to, created_by)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9) RETURNING id`,
      [seed, chosen.length, ids.length, input.siteIds, input.fields, input.reabstractorId, input.surgeryFrom ?? null, input.surgeryTo ?? null, actor.user.id],
    );
    for (const [i, caseId] of chosen.entries()) {
      const rec = await loadCase(tx, caseId, true);
      if (!rec) throw notFound('a sampled case');
      await tx.query(
        `INSERT INTO reabstraction_items (sample_id, case_id, ordinal, original_values, original_version) VALUES ($1, $2, $3, $4, $5)`,
        [s.id, caseId, i + 1, JSON.stringify(pickValues(rec.fields as Record<string, unknown>, input.fields)), rec.version],
      );
    }
    await audit(tx, {
      action: 'reabstraction-sample-drawn', actorId: actor.user.id, actorEmail: actor.user.email, ip: actor.ip, entity: 'reabstraction-sample', entityId: s.id,
      details: { seed, size: chosen.length, asked: input.size, poolSize: ids.length, siteIds: input.siteIds, fields: input.fields, reabstractorId: input.reabstractorId },
    });
    return s.id as string;
  });
  return strip((await loadSample(ds, sampleId))!);
}

const strip = ({ siteIds: _s, createdBy: _c, ...rest }: SampleRecord): SampleSummary => rest;

export async function samplesFor(ds: DataSource, user: SessionUser): Promise<SampleSummary[]> {
  const list = isAnalyst(user) ? await listSamples(ds, { siteIds: caseSiteScope(user) }) : await listSamples(ds, { siteIds: null, assignee: user.id });
  return list.map(strip);
}

async function sampleFor(ds: DataSource, id: string, user: SessionUser): Promise<SampleRecord> {
  const s = await loadSample(ds, id);
  if (!s || !inScope(user, s.siteIds)) throw notFound('the sample');
  return s;
}

function blindField(f: ReabstractionField): BlindField {
  const schema = CASE_FIELDS[f] as z.ZodType;
  const meta = fieldMeta(schema);
  const inner = innerSchema(schema) as unknown as { def: { type: string }; options?: string[] };
  let options: BlindField['options'] = null;
  if (inner.def.type === 'boolean') options = [{ value: 'true', label: 'Yes' }, { value: 'false', label: 'No' }];
  else if (inner.def.type === 'enum' && inner.options) options = inner.options.map((v) => ({ value: v, label: meta?.valueLabels?.[v] ?? v }));
  return { field: f, label: fieldLabel(f), kind: REABSTRACTION_FIELDS[f], unit: REABSTRACTION_FIELDS[f] === 'date' ? null : (fieldUnit(f) ?? null), options, enteredUnits: meta?.enteredUnits ? [...meta.enteredUnits] : null };
}

/** The second abstractor's work list: which cases and fields, never the first values. */
export async function blindWork(ds: DataSource, id: string, user: SessionUser): Promise<BlindWork> {
  const s = await sampleFor(ds, id, user);
  if (s.reabstractorId !== user.id) throw new AppError(403, 'not_the_reabstractor', 'this sample is assigned to another abstractor for blind re-abstraction', { hint: 'open the samples assigned to you' });
  const items = await loadItems(ds, id);
  return {
    sample: { id: s.id, seed: s.seed, createdAt: s.createdAt },
    fields: s.fields.map(blindField),
    items: items.map((i) => ({ id: i.id, ordinal: i.ordinal, caseId: i.caseId, registryNumber: i.registryNumber, siteCode: i.siteCode, enteredAt: i.enteredAt })),
  };
}

/** Validates the second abstraction of one case with the registry's field schemas (all fields, each once). */
function parseEntry(values: Record<string, unknown>, fields: readonly ReabstractionField[]): Record<string, unknown> {
  const problems: ErrorField[] = [];
  const out: Record<string, unknown> = {};
  for (const k of Object.keys(values)) if (!fields.includes(k as ReabstractionField)) problems.push({ path: `values.${k}`, message: 'is not one of the fields of this sample; remove it' });
  for (const f of fields) {
    if (!(f in values)) { problems.push({ path: `values.${f}`, message: 'is missing: enter the value, or null when the source does not document it' }); continue; }
    const v = values[f];
    if (v === null) { out[f] = null; continue; }
    const r = (CASE_FIELDS[f] as z.ZodType).safeParse(v);
    if (!r.success) problems.push({ path: `values.${f}`, message: r.error.issues[0]?.message ?? 'is not valid' });
    else out[f] = storedValue(f, r.data);
  }
  if (problems.length) throw validationError(problems, 're-abstraction');
  return out;
}

export async function submitEntry(ds: DataSource, itemId: string, values: Record<string, unknown>, actor: Actor): Promise<{ id: string; enteredAt: string }> {
  return ds.transaction(async (tx) => {
    const item = await loadItem(tx, itemId, true);
    if (!item) throw notFound('the sampled case');
    const s = await loadSample(tx, item.sampleId);
    if (!s || !inScope(actor.user, [item.siteId])) throw notFound('the sampled case');
    if (s.reabstractorId !== actor.user.id) throw new AppError(403, 'not_the_reabstractor', 'this case is assigned to another abstractor for blind re-abstraction', { hint: 'open the samples assigned to you' });
    if (item.enteredAt) throw new AppError(409, 'already_entered', `case ${item.registryNumber} was already re-abstracted`, { hint: 'each case is re-abstracted once; disagreements are settled by adjudication' });
    const parsed = parseEntry(values, s.fields);
    // UPDATE ... RETURNING answers [rows, count] through TypeORM.
    const [rows] = await tx.query(`UPDATE reabstraction_items SET entered_values = $2, entered_by = $3, entered_at = now() WHERE id = $1 RETURNING entered_at`, [itemId, JSON.stringify(parsed), actor.user.id]);
    await audit(tx, { action: 'reabstraction-entered', actorId: actor.user.id, actorEmail: actor.user.email, ip: actor.ip, entity: 'case', entityId: item.caseId, details: { sampleId: s.id, itemId, fields: s.fields } });
    return { id: itemId, enteredAt: (rows[0].entered_at as Date).toISOString() };
  });
}

export async function agreementReport(ds: DataSource, id: string, user: SessionUser): Promise<AgreementReport> {
  const s = await sampleFor(ds, id, user);
  const items = await loadItems(ds, id);
  const entered = items.filter((i) => i.enteredValues);
  const adj = new Map((await loadAdjudications(ds, id)).map((a) => [`${a.itemId}|${a.field}`, a]));
  const fields = s.fields.map((f) => fieldAgreement(f, entered.map((i) => ({ original: i.originalValues[f], reabstracted: i.enteredValues![f] }))));
  const disagreements: Disagreement[] = [];
  for (const i of entered) {
    for (const f of s.fields) {
      const o = i.originalValues[f];
      const r = i.enteredValues![f];
      if (sameValue(f, o, r)) continue;
      const a = adj.get(`${i.id}|${f}`);
      disagreements.push({
        itemId: i.id, caseId: i.caseId, registryNumber: i.registryNumber, siteCode: i.siteCode, field: f, label: fieldLabel(f),
        original: o ?? null, reabstracted: r ?? null, originalText: valueText(f, o), reabstractedText: valueText(f, r),
        caseVersion: i.caseVersion, caseStatus: i.caseStatus,
        adjudication: a ? { decision: a.decision, reason: a.reason, byEmail: a.byEmail, at: a.at, written: a.written } : null,
      });
    }
  }
  // Blindness check from the audit trail: did the second abstractor open the case before entering?
  const opened: { registry_number: string }[] = await ds.query(
    `SELECT DISTINCT c.registry_number FROM reabstraction_items i JOIN surgical_cases c ON c.id = i.case_id
       JOIN audit_entries ae ON ae.entity = 'case' AND ae.entity_id = i.case_id::text AND ae.action = 'case-read' AND ae.actor_id = $2
      WHERE i.sample_id = $1 AND ae.at >= $3::timestamptz AND ae.at <= COALESCE(i.entered_at, now()) ORDER BY 1`,
    [id, s.reabstractorId, s.createdAt],
  );
  return { sample: strip(s), fields, disagreements, openedBeforeEntry: opened.map((o) => ({ registryNumber: o.registry_number })) };
}

/** Settles one disagreement; taking the re-abstracted value changes the case through updateCase (audited). */
export async function adjudicate(services: Services, itemId: string, input: Adjudication, actor: Actor): Promise<Disagreement> {
  const { ds } = services;
  const item = await loadItem(ds, itemId);
  if (!item) throw notFound('the sampled case');
  const s = await loadSample(ds, item.sampleId);
  if (!s || !inScope(actor.user, s.siteIds)) throw notFound('the sampled case');
  if (!s.fields.includes(input.field)) throw validationError([{ path: 'field', message: 'is not one of the fields of this sample' }], 'adjudication');
  if (!item.enteredValues) throw new AppError(409, 'not_reabstracted', `case ${item.registryNumber} has not been re-abstracted yet`, { hint: 'wait for the second abstractor' });
  const original = item.originalValues[input.field];
  const second = item.enteredValues[input.field];
  if (sameValue(input.field, original, second)) throw new AppError(409, 'no_disagreement', `the two abstractions of ${fieldLabel(input.field)} agree for case ${item.registryNumber}`, { hint: 'only disagreements are adjudicated' });
  const [done] = await ds.query(`SELECT 1 FROM reabstraction_adjudications WHERE item_id = $1 AND field = $2`, [itemId, input.field]);
  if (done) throw new AppError(409, 'already_adjudicated', `${fieldLabel(input.field)} of case ${item.registryNumber} was already adjudicated`, { hint: 'reload the report' });
  if (actor.user.id === s.reabstractorId || (await hasAbstracted(ds, item.caseId, actor.user.id))) {
    throw new AppError(403, 'adjudicator_not_independent', 'a third person adjudicates: you entered, changed or re-abstracted this case', { hint: 'ask an administrator or another abstractor to adjudicate' });
  }

  let written = false;
  if (input.decision === 'reabstracted') {
    const current = await loadCase(ds, item.caseId);
    if (!current) throw notFound('the case');
    const now = storedValue(input.field, (current.fields as Record<string, unknown>)[input.field]);
    if (!sameValue(input.field, now, second)) {
      const apiValue = second === null ? null : input.field === 'preopHaemoglobin' ? { value: second, unit: 'g/dL' } : second;
      const reason = `${ADJUDICATION_REASON_PREFIX}${input.reason}`.slice(0, 300);
      // The registry's own update: version check, contradictions, ARISCAT, audit trail, re-verification.
      await updateCase(services, item.caseId, { version: input.caseVersion, [input.field]: apiValue, amendmentReason: reason } as CaseUpdate, actor);
      written = true;
    }
  }
  await ds.transaction(async (tx) => {
    await tx.query(
      `INSERT INTO reabstraction_adjudications (item_id, field, decision, value, reason, written, decided_by) VALUES ($1, $2, $3, $4, $5, $6, $7)`,
      [itemId, input.field, input.decision, JSON.stringify(input.decision === 'original' ? (original ?? null) : (second ?? null)), input.reason, written, actor.user.id],
    );
    await audit(tx, {
      action: 'reabstraction-adjudicated', actorId: actor.user.id, actorEmail: actor.user.email, ip: actor.ip, entity: 'case', entityId: item.caseId,
      field: input.field, oldValue: valueText(input.field, original), newValue: valueText(input.field, input.decision === 'original' ? original : second), reason: input.reason,
      details: { sampleId: s.id, itemId, decision: input.decision, written },
    });
  });
  const report = await agreementReport(ds, s.id, actor.user);
  return report.disagreements.find((d) => d.itemId === itemId && d.field === input.field)!;
}
