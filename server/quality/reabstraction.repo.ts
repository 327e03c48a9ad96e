/** Data access for re-abstraction samples, items and adjudications (plain objects out). */
import type { DataSource, EntityManager } from 'typeorm';
import type { ReabstractionField, SampleSummary } from '../../shared/quality/reabstraction.js';

type Db = DataSource | EntityManager;
type Row = Record<string, any>;

export interface SampleRecord extends SampleSummary { siteIds: string[]; createdBy: string | null }
export interface ItemRecord {
  id: string; sampleId: string; caseId: string; ordinal: number; registryNumber: string; siteId: string; siteCode: string;
  originalValues: Record<string, unknown>; originalVersion: number; enteredValues: Record<string, unknown> | null; enteredBy: string | null; enteredAt: string | null;
  caseVersion: number; caseStatus: string;
}

const SAMPLE_SQL = `SELECT rs.*, ru.email AS reabstractor_email, cu.email AS created_by_email,
    (SELECT array_agg(s.code ORDER BY s.code) FROM sites s WHERE s.id = ANY(rs.site_ids)) AS site_codes,
    (SELECT count(*)::int FROM reabstraction_items i WHERE i.sample_id = rs.id AND i.entered_at IS NOT NULL) AS entered
  FROM reabstraction_samples rs JOIN users ru ON ru.id = rs.reabstractor_id LEFT JOIN users cu ON cu.id = rs.created_by`;

function toSample(r: Row): SampleRecord {
  return {
    id: r.id, seed: Number(r.seed), size: r.size, poolSize: r.pool_size, siteIds: r.site_ids, siteCodes: r.site_codes ?? [], fields: r.fields as ReabstractionField[],
    reabstractorId: r.reabstractor_id, reabstractorEmail: r.reabstractor_email, createdBy: r.created_by, createdByEmail: r.created_by_email ?? null,
    createdAt: (r.created_at as Date).toISOString(), entered: r.entered, surgeryFrom: r.surgery_from ? String(r.surgery_from).slice(0, 10) : null, surgeryTo: r.surgery_to ? String(r.surgery_to).slice(0, 10) : null,
  };
}

export async function loadSample(db: Db, id: string): Promise<SampleRecord | null> {
  const rows = await db.query(`${SAMPLE_SQL} WHERE rs.id = $1`, [id]);
  return rows[0] ? toSample(rows[0]) : null;
}

/** Samples newest first: all (filtered by sites) or only those assigned to a user. */
export async function listSamples(db: Db, opts: { siteIds: string[] | null; assignee?: string }): Promise<SampleRecord[]> {
  const rows = await db.query(
    `${SAMPLE_SQL} WHERE ($1::uuid[] IS NULL OR rs.site_ids <@ $1) AND ($2::uuid IS NULL OR rs.reabstractor_id = $2) ORDER BY rs.created_at DESC LIMIT 100`,
    [opts.siteIds, opts.assignee ?? null],
  );
  return rows.map(toSample);
}

const ITEM_SQL = `SELECT i.*, c.registry_number, c.site_id, s.code AS site_code, c.version AS case_version, c.status AS case_status
  FROM reabstraction_items i JOIN surgical_cases c ON c.id = i.case_id JOIN sites s ON s.id = c.site_id`;

function toItem(r: Row): ItemRecord {
  return {
    id: r.id, sampleId: r.sample_id, caseId: r.case_id, ordinal: r.ordinal, registryNumber: r.registry_number, siteId: r.site_id, siteCode: r.site_code,
    originalValues: r.original_values, originalVersion: r.original_version, enteredValues: r.entered_values, enteredBy: r.entered_by,
    enteredAt: r.entered_at ? (r.entered_at as Date).toISOString() : null, caseVersion: r.case_version, caseStatus: r.case_status,
  };
}

export async function loadItems(db: Db, sampleId: string): Promise<ItemRecord[]> {
  return (await db.query(`${ITEM_SQL} WHERE i.sample_id = $1 ORDER BY i.ordinal`, [sampleId])).map(toItem);
}

export async function loadItem(db: Db, id: string, forUpdate = false): Promise<ItemRecord | null> {
  const rows = await db.query(`${ITEM_SQL} WHERE i.id = $1 ${forUpdate ? 'FOR UPDATE OF i' : ''}`, [id]);
  return rows[0] ? toItem(rows[0]) : null;
}

export interface AdjudicationRecord { itemId: string; field: string; decision: 'original' | 'reabstracted'; reason: string; byEmail: string | null; at: string; written: boolean }

export async function loadAdjudications(db: Db, sampleId: string): Promise<AdjudicationRecord[]> {
  const rows = await db.query(
    `SELECT a.*, u.email FROM reabstraction_adjudications a JOIN reabstraction_items i ON i.id = a.item_id LEFT JOIN users u ON u.id = a.decided_by WHERE i.sample_id = $1`,
    [sampleId],
  );
  return rows.map((r: Row) => ({ itemId: r.item_id, field: r.field, decision: r.decision, reason: r.reason, byEmail: r.email ?? null, at: (r.decided_at as Date).toISOString(), written: r.written }));
}

/**
 * People who abstracted a case (created it, or entered or changed its values): the second
 * abstractor must be someone else, and so must the adjudicator. A verifier who only checked the
 * case is not excluded (in a small team everyone verifies someone's cases); the blindness check
 * in the report lists cases the second abstractor opened during the blind window.
 */
/** Prefix of the audit reason of a case change written by adjudication. */
export const ADJUDICATION_REASON_PREFIX = 're-abstraction adjudication: ';

export const ABSTRACTED_BY_SQL = (caseExpr: string, userParam: string) => `(
  ${caseExpr}.created_by = ${userParam}
  OR EXISTS (SELECT 1 FROM audit_entries ae WHERE ae.entity = 'case' AND ae.entity_id = ${caseExpr}.id::text AND ae.actor_id = ${userParam}
             AND ae.action IN ('case-created', 'case-changed', 'case-amended')
             -- a change written by adjudication is not abstraction (see reabstraction.service.ts)
             AND COALESCE(ae.reason, '') NOT LIKE '${ADJUDICATION_REASON_PREFIX}%')
)`;

export async function hasAbstracted(db: Db, caseId: string, userId: string): Promise<boolean> {
  const rows = await db.query(`SELECT 1 FROM surgical_cases c WHERE c.id = $1 AND ${ABSTRACTED_BY_SQL('c', '$2')}`, [caseId, userId]);
  return rows.length > 0;
}
