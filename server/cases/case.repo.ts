/**
 * Data access for surgical cases and their current episodes and events: the only code that
 * reads or writes these tables (plain objects in and out).
 */
import type { DataSource, EntityManager } from 'typeorm';
import { CASE_FIELD_NAMES, type CaseFieldName, type CaseFields } from '../../shared/registry/case.js';
import type { TherapyFieldName } from '../../shared/registry/therapy.js';
import { toStoredUnit } from '../../shared/clinical/units.js';
import { CASE_COLUMNS, THERAPY_COLUMNS, fromDb } from '../registry/columns.js';

export type Db = DataSource | EntityManager;
type Row = Record<string, any>;

/** A case as stored: its fields (in stored units) and its workflow columns. */
export interface CaseRecord {
  id: string;
  registryNumber: string;
  siteId: string;
  siteCode: string;
  status: 'draft' | 'complete' | 'verified' | 'locked' | 'withdrawn';
  version: number;
  fields: CaseFields;
  ariscatPoints: number | null;
  ariscatClass: 'low' | 'intermediate' | 'high' | null;
  identifierHash: string | null;
  possibleDuplicate: boolean;
  warnings: { path: string; code: string; message: string }[];
  createdVia: 'form' | 'import';
  createdBy: string | null;
  createdByEmail: string | null;
  createdAt: string;
  updatedAt: string;
  editorsSinceVerification: string[];
  completedAt: string | null;
  verifiedBy: string | null;
  verifiedByEmail: string | null;
  verifiedAt: string | null;
  lockedAt: string | null;
  withdrawnReason: string | null;
}

export interface EpisodeRecord { id: string; caseId: string; fields: Record<TherapyFieldName, unknown>; warnings: { path: string; message: string }[]; createdAt: string; updatedAt: string }
export interface EventRecord {
  id: string;
  caseId: string;
  type: string;
  onsetPostoperativeDay: number;
  clavienDindo: string | null;
  clavienDindoDisability: boolean | null;
  observations: unknown[];
  notes: string | null;
  definition: string;
  definitionVersion: string;
  evaluations: unknown[];
  pneumoniaNhsnMet: boolean;
  createdAt: string;
  updatedAt: string;
}

const iso = (v: unknown) => (v instanceof Date ? v.toISOString() : v == null ? null : String(v));

export function rowToFields(r: Row): CaseFields {
  const out: Record<string, unknown> = {};
  for (const name of CASE_FIELD_NAMES) {
    const { column, kind } = CASE_COLUMNS[name];
    const v = fromDb(kind, r[column]);
    out[name] = name === 'preopHaemoglobin' ? (v == null ? null : { value: v, unit: 'g/dL' }) : v;
  }
  return out as CaseFields;
}

function rowToCase(r: Row): CaseRecord {
  return {
    id: r.id,
    registryNumber: r.registry_number,
    siteId: r.site_id,
    siteCode: r.site_code,
    status: r.status,
    version: r.version,
    fields: rowToFields(r),
    ariscatPoints: r.ariscat_points,
    ariscatClass: r.ariscat_class,
    identifierHash: r.identifier_hash,
    possibleDuplicate: r.possible_duplicate,
    warnings: r.warnings ?? [],
    createdVia: r.created_via,
    createdBy: r.created_by,
    createdByEmail: r.created_by_email ?? null,
    createdAt: iso(r.created_at)!,
    updatedAt: iso(r.updated_at)!,
    editorsSinceVerification: r.editors_since_verification ?? [],
    completedAt: iso(r.completed_at),
    verifiedBy: r.verified_by,
    verifiedByEmail: r.verified_by_email ?? null,
    verifiedAt: iso(r.verified_at),
    lockedAt: iso(r.locked_at),
    withdrawnReason: r.withdrawn_reason,
  };
}

/** One case, or null. `forUpdate` locks its row for the rest of the transaction. */
export async function loadCase(db: Db, id: string, forUpdate = false): Promise<CaseRecord | null> {
  const rows = await db.query(
    `SELECT c.*, s.code AS site_code, cu.email AS created_by_email, vu.email AS verified_by_email
       FROM surgical_cases c JOIN sites s ON s.id = c.site_id
       LEFT JOIN users cu ON cu.id = c.created_by LEFT JOIN users vu ON vu.id = c.verified_by
      WHERE c.id = $1 ${forUpdate ? 'FOR UPDATE OF c' : ''}`,
    [id],
  );
  return rows[0] ? rowToCase(rows[0]) : null;
}

function rowToEpisode(r: Row): EpisodeRecord {
  const fields: Record<string, unknown> = {};
  for (const [name, spec] of Object.entries(THERAPY_COLUMNS)) fields[name] = fromDb(spec.kind, r[spec.column]);
  return { id: r.id, caseId: r.case_id, fields: fields as EpisodeRecord['fields'], warnings: r.warnings ?? [], createdAt: iso(r.created_at)!, updatedAt: iso(r.updated_at)! };
}

function rowToEvent(r: Row): EventRecord {
  return {
    id: r.id, caseId: r.case_id, type: r.type, onsetPostoperativeDay: r.onset_postoperative_day, clavienDindo: r.clavien_dindo,
    clavienDindoDisability: r.clavien_dindo_disability, observations: r.observations ?? [], notes: r.notes, definition: r.definition,
    definitionVersion: r.definition_version, evaluations: r.evaluations ?? [], pneumoniaNhsnMet: r.pneumonia_nhsn_met,
    createdAt: iso(r.created_at)!, updatedAt: iso(r.updated_at)!,
  };
}

export async function loadEpisodes(db: Db, caseId: string): Promise<EpisodeRecord[]> {
  return (await db.query(`SELECT * FROM therapy_episodes WHERE case_id = $1 AND removed_at IS NULL ORDER BY created_at, id`, [caseId])).map(rowToEpisode);
}

export async function loadEpisode(db: Db, caseId: string, id: string): Promise<EpisodeRecord | null> {
  const rows = await db.query(`SELECT * FROM therapy_episodes WHERE case_id = $1 AND id = $2 AND removed_at IS NULL`, [caseId, id]);
  return rows[0] ? rowToEpisode(rows[0]) : null;
}

export async function loadEvents(db: Db, caseId: string): Promise<EventRecord[]> {
  return (await db.query(`SELECT * FROM outcome_events WHERE case_id = $1 AND removed_at IS NULL ORDER BY created_at, id`, [caseId])).map(rowToEvent);
}

export async function loadEvent(db: Db, caseId: string, id: string): Promise<EventRecord | null> {
  const rows = await db.query(`SELECT * FROM outcome_events WHERE case_id = $1 AND id = $2 AND removed_at IS NULL`, [caseId, id]);
  return rows[0] ? rowToEvent(rows[0]) : null;
}

/** Registry numbers of other cases with the same keyed hash at the same site. */
export async function otherCasesOfPatient(db: Db, siteId: string, hash: string, excludeId: string | null): Promise<{ id: string; registryNumber: string; surgeryDate: string }[]> {
  const rows = await db.query(
    `SELECT id, registry_number, surgery_date::text AS surgery_date FROM surgical_cases
      WHERE identifier_hash = $1 AND site_id = $2 AND status <> 'withdrawn' AND ($3::uuid IS NULL OR id <> $3) ORDER BY surgery_date, registry_number`,
    [hash, siteId, excludeId],
  );
  return rows.map((r: Row) => ({ id: r.id, registryNumber: r.registry_number, surgeryDate: r.surgery_date }));
}

/** The value stored for a field (haemoglobin converted to g/dL). */
export function storedValue(name: CaseFieldName, v: unknown): unknown {
  if (v === undefined || v === null) return null;
  if (name === 'preopHaemoglobin') {
    const m = v as { value: number; unit: 'g/dL' | 'g/L' };
    return toStoredUnit('haemoglobin', m.value, m.unit);
  }
  return v;
}

/** The next registry number of a site for a year (serialised per site and year by an advisory lock). */
export async function nextRegistryNumber(tx: EntityManager, siteId: string, siteCode: string, year: number): Promise<{ number: string; seq: number }> {
  await tx.query(`SELECT pg_advisory_xact_lock(hashtext('registry-number:' || $1::text || ':' || $2::text))`, [siteId, year]);
  const [{ seq }] = await tx.query(`SELECT COALESCE(max(registry_seq), 0) + 1 AS seq FROM surgical_cases WHERE site_id = $1 AND registry_year = $2`, [siteId, year]);
  return { number: formatRegistryNumber(siteCode, year, seq), seq };
}

/** Alveolog's registry number: site code, year of registration, sequence within both (HBR-2025-00042). */
export function formatRegistryNumber(siteCode: string, year: number, seq: number): string {
  return `${siteCode}-${year}-${String(seq).padStart(5, '0')}`;
}

/** Writes the given case columns (already in stored form). */
export async function updateCaseColumns(tx: EntityManager, id: string, values: Record<string, unknown>): Promise<void> {
  const cols = Object.keys(values);
  if (!cols.length) return;
  const sets = cols.map((c, i) => `"${c}" = $${i + 2}`);
  await tx.query(`UPDATE surgical_cases SET ${sets.join(', ')} WHERE id = $1`, [id, ...cols.map((c) => values[c])]);
}
